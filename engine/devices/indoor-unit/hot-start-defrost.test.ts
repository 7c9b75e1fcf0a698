import { describe, expect, it } from "vitest";
import { gatewayFixture } from "../hvac-gateway/gateway-fixture";
import { gatewayObjects as O } from "../hvac-gateway/objects";

const S = 1_000_000;

// Common practice, no published source: a heat pump holds its indoor fan off while the coil
// warms (hot start) and while it defrosts the outdoor coil in the cold, and says so.
describe("hot start and defrost", () => {
  it("hot start: heating begins with the fan held off, then the room warms", () => {
    const f = gatewayFixture({
      gateway: { fanHeldStatus: true },
      unit: { hotStartS: 120, initialRoomC: 18, initialSetpointC: 22, initialMode: "heat" },
    });
    f.write(O.power, true);
    f.harness.advance(20 * S);
    f.settle();
    expect(f.unit().fanHeld).toBe("hot-start");
    expect(f.lastSent(O.fanHeld)).toBe(true);
    const heldRoom = f.unit().roomC;
    f.harness.advance(80 * S);
    // Held: no heat reaches the room (it drifts toward outdoor), within the 10 s model step.
    expect(f.unit().fanHeld).toBe("hot-start");
    expect(f.unit().roomC).toBeLessThanOrEqual(heldRoom);
    f.harness.advance(70 * S);
    f.settle();
    expect(f.unit().fanHeld).toBeNull();
    expect(f.lastSent(O.fanHeld)).toBe(false);
    f.harness.advance(300 * S);
    expect(f.unit().roomC).toBeGreaterThan(heldRoom);
  });

  it("defrost: in the cold, heating pauses for the defrost every period", () => {
    const f = gatewayFixture({
      gateway: { fanHeldStatus: true },
      unit: {
        outdoorC: -5,
        defrostEveryMin: 30,
        defrostS: 300,
        initialMode: "heat",
        initialSetpointC: 22,
      },
    });
    f.write(O.power, true);
    f.harness.advance(31 * 60 * S);
    f.settle();
    expect(f.unit().fanHeld).toBe("defrost");
    f.harness.advance(310 * S);
    f.settle();
    expect(f.unit().fanHeld).toBeNull();
    expect(f.sent(O.fanHeld)).toEqual([true, false]);
  });

  it("no defrost while the outdoor air is mild", () => {
    const f = gatewayFixture({
      unit: { outdoorC: 10, defrostEveryMin: 30, initialMode: "heat" },
    });
    f.write(O.power, true);
    f.harness.advance(120 * 60 * S);
    expect(f.harness.transitionNames("unit")).not.toContain("fan.defrost-begin");
  });
});
