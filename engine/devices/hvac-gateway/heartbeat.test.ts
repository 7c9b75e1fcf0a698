import { describe, expect, it } from "vitest";
import { gatewayFixture } from "./gateway-fixture";
import { gatewayObjects as O } from "./objects";
import { hvacGatewayParametersSchema } from "./parameters";

const S = 1_000_000;

// Common practice, no published source: gateways repeat their status objects on a heartbeat
// period so a visualisation or supervising controller sees them alive.
describe("cyclic status heartbeat and outdoor temperature", () => {
  it("sends every status object once per period, with the outdoor temperature from the unit", () => {
    const f = gatewayFixture({
      gateway: { statusCycleS: 60, outdoorTemperature: true },
      unit: { outdoorC: 8 },
    });
    expect(f.sent(O.powerStatus)).toEqual([]);
    f.harness.advance(61 * S);
    expect(f.sent(O.powerStatus)).toEqual([false]);
    expect(f.sent(O.setpointStatus)).toEqual([21]);
    expect(f.sent(O.outdoorTemperature)).toEqual([8]);
    f.harness.advance(60 * S);
    expect(f.sent(O.powerStatus)).toEqual([false, false]);
  });

  it("sends nothing unchanged without a period (the default)", () => {
    const f = gatewayFixture({ gateway: { outdoorTemperature: true } });
    f.harness.advance(600 * S);
    expect(f.sent(O.powerStatus)).toEqual([]);
    // The outdoor temperature is stored for reads all the same.
    expect(f.harness.objectValue("gw", O.outdoorTemperature)).toBe(10);
  });

  it("refuses a period under 60 s, naming the field", () => {
    const parsed = hvacGatewayParametersSchema.safeParse({ statusCycleS: 10 });
    expect(parsed.success ? [] : parsed.error.issues[0]!.path).toEqual(["statusCycleS"]);
  });
});
