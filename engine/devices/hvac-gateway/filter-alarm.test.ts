import { describe, expect, it } from "vitest";
import { gatewayFixture } from "./gateway-fixture";
import { gatewayObjects as O } from "./objects";

const S = 1_000_000;

// Common practice, no published source: units count fan running time and ask for the filter
// to be cleaned; a reset (DPT 1.015, DPT spec §3.1) restarts the count.
describe("filter alarm with reset", () => {
  it("raises the alarm after the fan running time and clears it on reset", () => {
    const f = gatewayFixture({
      gateway: { filterAlarm: true },
      unit: { filterAlarmAfterH: 0.01, initialPower: true, modelStepS: 10 }, // 36 s
    });
    f.harness.advance(30 * S);
    expect(f.sent(O.filterAlarm)).toEqual([]);
    f.harness.advance(20 * S);
    f.settle();
    expect(f.lastSent(O.filterAlarm)).toBe(true);
    f.write(O.filterReset, true);
    expect(f.lastSent(O.filterAlarm)).toBe(false);
  });

  it("counts only while the unit runs", () => {
    const f = gatewayFixture({
      gateway: { filterAlarm: true },
      unit: { filterAlarmAfterH: 0.01, initialPower: false },
    });
    f.harness.advance(600 * S);
    expect(f.sent(O.filterAlarm)).toEqual([]);
  });
});
