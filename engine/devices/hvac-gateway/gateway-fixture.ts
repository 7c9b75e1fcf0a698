import { DeviceHarness, HARNESS_LINK_DELAY_US } from "../../../test/harness/device-harness";
import { indoorUnitType } from "../indoor-unit/indoor-unit";
import type { IndoorUnitState } from "../indoor-unit/state";
import { wallControllerType } from "../wall-controller/wall-controller";
import { hvacGatewayType } from "./hvac-gateway";
import type { HvacGatewayState } from "./state";

/**
 * Test fixture: a gateway "gw" and an indoor unit "unit" on unit link "link",
 * optionally with a wall controller "wc", started and settled. Used by the
 * gateway's unit tests; it drives pure transitions through DeviceHarness.
 */
export function gatewayFixture(
  options: {
    gateway?: Record<string, unknown>;
    unit?: Record<string, unknown>;
    wallController?: Record<string, unknown>;
  } = {},
) {
  const members = [
    { id: "gw", type: hvacGatewayType, parameters: options.gateway ?? {} },
    { id: "unit", type: indoorUnitType, parameters: options.unit ?? {} },
    ...(options.wallController === undefined
      ? []
      : [{ id: "wc", type: wallControllerType, parameters: options.wallController }]),
  ];
  const harness = new DeviceHarness(members, [
    { id: "link", members: members.map((m) => m.id) },
  ]).start();
  const settle = () => harness.advance(20 * HARNESS_LINK_DELAY_US);
  settle();
  return {
    harness,
    /** A KNX write to a gateway object, then time for the unit's answer. */
    write(object: number, value: unknown) {
      const result = harness.write("gw", object, value);
      settle();
      return result;
    },
    press(button: string) {
      harness.press("wc", button);
      settle();
    },
    settle,
    unit: () => harness.state<IndoorUnitState>("unit"),
    gateway: () => harness.state<HvacGatewayState>("gw"),
    /** Values the gateway sent from `object`, oldest first. */
    sent: (object: number) => harness.sentFrom("gw", object).map((telegram) => telegram.value),
    lastSent: (object: number) => harness.sentFrom("gw", object).at(-1)?.value,
  };
}
