import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import {
  benchSchema,
  checkBench,
  generateFilterTableTexts,
  loadBench,
  parseScenario,
  runSuite,
} from "@/engine";
import {
  HOTEL_FLOORS,
  HOTEL_ROOMS_PER_FLOOR,
  hotelBench,
  hotelLateAddressBench,
} from "./hotel-bench";

const json = (path: string): unknown => JSON.parse(readFileSync(path, "utf8"));

function outcome(scenarioFile: string, bench: unknown): string {
  const parsed = parseScenario(json(scenarioFile));
  if (!parsed.ok) throw new Error(parsed.error.message);
  const result = runSuite("hotel", [
    { source: scenarioFile, scenario: parsed.value, bench: bench as never },
  ]);
  return result.scenarios[0]!.outcome;
}

describe("the demo hotel bench", () => {
  it("is about 150 devices: a main line and three floors joined by line couplers", () => {
    const bench = benchSchema.parse(json("scenarios/benches/wrenhallow-hotel.bench.json"));
    expect(bench.devices.length).toBeGreaterThanOrEqual(140);
    expect(bench.devices.length).toBeLessThanOrEqual(160);
    expect(bench.lines.map((l) => l.address)).toEqual(["1.0", "1.1", "1.2", "1.3"]);
    // knx-reference.md, Topology: a line coupler a.l.0 on each floor line.
    expect(
      bench.devices.filter((d) => d.type === "coupler").map((d) => d.individualAddress),
    ).toEqual(["1.1.0", "1.2.0", "1.3.0"]);
    expect(bench.devices.filter((d) => d.type === "hvac-gateway")).toHaveLength(
      HOTEL_FLOORS * HOTEL_ROOMS_PER_FLOOR,
    );
    // The committed file is the generator's bench (devices and links; other fields may gain data).
    const generated = benchSchema.parse(hotelBench());
    expect(bench.devices.map((d) => d.id)).toEqual(generated.devices.map((d) => d.id));
    expect(bench.links).toEqual(generated.links);
    expect(checkBench(bench).filter((f) => f.severity === "error")).toEqual([]);
  });

  it("the late-address exercise fails only for floor 2's stale table, and passes once it is regenerated", () => {
    const file = "scenarios/exercises/late-address.scenario.json";
    const exercise = json("scenarios/exercises/late-address.bench.json") as ReturnType<
      typeof hotelLateAddressBench
    > & { devices: { id: string; parameters: Record<string, unknown> }[] };
    expect(
      checkBench(benchSchema.parse(exercise))
        .filter((f) => f.severity === "error")
        .map((f) => f.rule),
    ).toEqual(["topology.filter-blocks"]);
    expect(outcome(file, exercise)).toBe("expected-failure");

    const loaded = loadBench(exercise);
    if (!loaded.ok) throw new Error("the exercise bench does not load");
    const fixed = structuredClone(exercise);
    fixed.devices.find((d) => d.id === "lc-floor-2")!.parameters.filterTable =
      generateFilterTableTexts(loaded.value, "lc-floor-2");
    expect(outcome(file, fixed)).toBe("unexpected-pass");
  });
});
