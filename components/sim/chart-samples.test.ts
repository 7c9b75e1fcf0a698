import { describe, expect, it } from "vitest";
import { ChartSamples, ROOM_SAMPLES_KEPT, SECONDS_KEPT } from "./chart-samples";
import { SampleRing } from "./sample-ring";

describe("SampleRing", () => {
  it("keeps the newest items up to its capacity, oldest first", () => {
    const ring = new SampleRing<number>(3);
    ring.push([1, 2]);
    ring.pushOne(3);
    ring.push([4, 5]);
    expect(ring.toArray()).toEqual([3, 4, 5]);
    expect(ring.at(0)).toBe(3);
    expect(ring.total).toBe(5);
  });
});

describe("ChartSamples", () => {
  it("appends batches in place and keeps the last seconds per line and samples per unit", () => {
    const charts = new ChartSamples();
    charts.reset(2);
    for (let second = 0; second < SECONDS_KEPT + 10; second++) {
      charts.add(
        [{ timeUs: second * 1_000_000, unitId: "unit", roomC: 21, setpointC: 22, power: true }],
        ["line-a", "line-b"].map((line, i) => ({
          second,
          line,
          lineAddress: `1.${i + 1}`,
          loadPercent: 1,
          telegrams: 1,
        })),
        [{ second, counts: { "1/0/1": 1 } }],
      );
    }
    const snapshot = charts.snapshot();
    expect(snapshot.busLoad).toHaveLength(SECONDS_KEPT * 2);
    expect(snapshot.busLoad[0]).toMatchObject({ second: 10, line: "line-a" });
    expect(snapshot.rates).toHaveLength(SECONDS_KEPT);
    expect(snapshot.rooms["unit:unit"]).toHaveLength(
      Math.min(SECONDS_KEPT + 10, ROOM_SAMPLES_KEPT),
    );
    expect(charts.add([], [], [])).toBe(false);
  });
});
