import { describe, expect, it } from "vitest";
import { DeviceHarness } from "../../../test/harness/device-harness";
import { presenceDetectorType, presenceObjects } from "./presence-detector";

const S = 1_000_000;

function detector(parameters: Record<string, unknown> = {}) {
  const h = new DeviceHarness([{ id: "pd", type: presenceDetectorType, parameters }]).start();
  const move = () => h.dispatch("pd", { kind: "input", input: "movement", value: true });
  const sent = () =>
    h.sentFrom("pd", presenceObjects.occupancy).map((t) => [Math.round(t.timeUs / S), t.value]);
  return { h, move, sent };
}

describe("presence detector", () => {
  it("sends occupied on movement and not occupied after the hold time (DPT 1.018)", () => {
    // DPT 1.018 occupancy: 0 not occupied, 1 occupied (recalled from memory of the DPT spec).
    const { h, move, sent } = detector({ holdTimeS: 60 });
    h.advance(10 * S);
    expect(move().transition).toBe("presence.detected");
    h.advance(100 * S);
    expect(sent()).toEqual([
      [10, true],
      [70, false],
    ]);
    expect(h.transitionNames("pd")).toContain("presence.ended");
  });

  it("restarts the hold time on each movement without sending again", () => {
    const { h, move, sent } = detector({ holdTimeS: 60 });
    move();
    h.advance(50 * S);
    expect(move().transition).toBe("presence.retriggered");
    h.advance(50 * S);
    expect(sent()).toEqual([[0, true]]);
    h.advance(20 * S);
    expect(sent()).toEqual([
      [0, true],
      [110, false],
    ]);
  });

  it("is retriggered by another detector through its KNX input when enabled", () => {
    const { h, sent } = detector({ holdTimeS: 30, externalTrigger: true });
    h.write("pd", presenceObjects.trigger, true);
    h.advance(20 * S);
    h.write("pd", presenceObjects.trigger, true);
    h.advance(20 * S);
    expect(sent()).toEqual([[0, true]]);
    expect(
      presenceDetectorType
        .groupObjects(presenceDetectorType.parameters.parse({}))
        .map((o) => o.number),
    ).toEqual([0]);
  });

  it("refuses a hold time under 1 s with a message naming the field", () => {
    expect(
      presenceDetectorType.parameters.safeParse({ holdTimeS: 0 }).error?.issues[0]?.message,
    ).toBe("holdTimeS must be at least 1 s");
  });
});
