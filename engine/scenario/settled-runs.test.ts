import { describe, expect, it } from "vitest";
import fernhill from "../../scenarios/benches/fernhill-training-centre.bench.json";
import twoPrimaries from "../../scenarios/fernhill/two-primaries.scenario.json";
import windowContact from "../../scenarios/fernhill/window-contact.scenario.json";
import { loadBench } from "../bench";
import type { TraceEvent } from "../core/trace";
import { parseScenario } from "./parse-scenario";
import { runScenario } from "./run-scenario";
import type { Scenario } from "./scenario-schema";

function scenarioOf(document: unknown): Scenario {
  const parsed = parseScenario(document);
  if (!parsed.ok) throw new Error(parsed.error.message);
  return parsed.value;
}

/** A run's verdicts and whole trace as text (wall time left out). */
function replay(scenario: Scenario, bench: unknown, options: { seed?: number; reuse?: boolean }) {
  let trace: readonly TraceEvent[] = [];
  const result = runScenario(scenario, bench as Parameters<typeof runScenario>[1], {
    ...options,
    onTrace: (events) => (trace = events),
  });
  return JSON.stringify({ ...result, wallMs: 0, trace });
}

describe("replays from a settled template", () => {
  it("give the same verdicts and trace as a run started from scratch, for every scenario and seed", () => {
    const loaded = loadBench(fernhill);
    if (!loaded.ok) throw new Error("bench does not load");
    for (const document of [windowContact, twoPrimaries]) {
      const scenario = scenarioOf(document);
      for (const seed of [1, 2]) {
        const fromScratch = replay(scenario, loaded.value, { seed, reuse: false });
        const first = replay(scenario, loaded.value, { seed }); // settles and keeps the template
        const forked = replay(scenario, loaded.value, { seed }); // starts from the template
        expect(first).toBe(fromScratch);
        expect(forked).toBe(fromScratch);
      }
    }
  });

  it("keep a bounded number of templates per bench, and still replay right after one was dropped", () => {
    const loaded = loadBench(fernhill);
    if (!loaded.ok) throw new Error("bench does not load");
    const scenario = scenarioOf(windowContact);
    const expected = replay(scenario, loaded.value, { seed: 1, reuse: false });
    for (let seed = 1; seed <= 12; seed++) replay(scenario, loaded.value, { seed });
    expect(replay(scenario, loaded.value, { seed: 1 })).toBe(expected);
  });
});
