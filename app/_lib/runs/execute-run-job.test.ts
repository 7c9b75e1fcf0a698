import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parseScenarioText } from "@/engine";
import type { Scenario } from "@/engine";
import { executeRunJob } from "./execute-run-job";
import type { RunJob } from "./run-job";
import { worstCaseVirtualTimeUs } from "./worst-case-virtual-time";

function shipped(path: string): Scenario {
  const parsed = parseScenarioText(readFileSync(path, "utf8"));
  if (!parsed.ok) throw new Error(parsed.error.message);
  return parsed.value;
}

const bench: unknown = JSON.parse(
  readFileSync("scenarios/benches/fernhill-training-centre.bench.json", "utf8"),
);
// The presence scenario waits out the detector's 300 s hold: minutes of virtual time.
const presence = shipped("scenarios/fernhill/presence-bench-lights.scenario.json");
const lights = shipped("scenarios/fernhill/lights-toggle.scenario.json");
const roomy = { wallTimeMs: 20_000, virtualTimeUs: 6 * 3_600_000_000 };

function job(scenario: Scenario, caps = roomy): RunJob {
  return { runId: "run-1", scenario, bench, seed: scenario.seed, caps };
}

describe("worstCaseVirtualTimeUs", () => {
  it("follows the anchor rule: waits move the anchor, expectation windows from one anchor overlap", () => {
    const scenario = {
      ...lights,
      settle: "1s",
      steps: [
        { kind: "wait", for: "10s" },
        { kind: "expect-silence", for: "5s" },
        { kind: "expect-silence", for: "3s" },
        { kind: "read", groupAddress: "1/1/1" },
        { kind: "expect-count", groupAddress: "1/1/1", min: 1, within: "2s" },
        { kind: "wait", for: "1s" },
      ],
    } as unknown as Scenario;
    // settle 1 s; wait to 11 s; windows from 11 s reach 16 s; the read anchors at 16 s,
    // its window reaches 18 s; the wait counts from 16 s, so 17 s < 18 s.
    expect(worstCaseVirtualTimeUs(scenario)).toBe(18_000_000);
  });
});

describe("server caps on one scenario run", () => {
  it("a scenario under both caps runs to its own verdict", () => {
    const outcome = executeRunJob(job(lights));
    expect(outcome.kind).toBe("result");
  });

  it("refuses a scenario whose virtual time can pass the cap, with a message naming the cap", () => {
    const outcome = executeRunJob(job(presence, { ...roomy, virtualTimeUs: 60_000_000 }));
    expect(outcome).toMatchObject({ kind: "capped", cap: "virtual-time" });
    if (outcome.kind !== "capped") return;
    expect(outcome.message).toMatch(/virtual-time cap/);
    expect(outcome.message).toMatch(/can reach 8.8 min of virtual time.*at most 1 min/);
    expect(outcome.message).toMatch(/RUN_VIRTUAL_TIME_CAP_MINUTES/);
  });

  it("stops a scenario at the wall-time cap and says so (a fake clock, one second per reading)", () => {
    let clockMs = 0;
    const outcome = executeRunJob(job(presence, { ...roomy, wallTimeMs: 5_000 }), () => {
      clockMs += 1_000;
      return clockMs;
    });
    expect(outcome).toMatchObject({ kind: "capped", cap: "wall-time" });
    if (outcome.kind !== "capped") return;
    expect(outcome.message).toMatch(/wall-time cap/);
    expect(outcome.message).toMatch(/at most 5 s/);
    // The partial result is kept, so the report shows how far the scenario got.
    expect(outcome.result?.steps.length).toBe(presence.steps.length);
    expect(outcome.result?.message).toBe(outcome.message);
  });
});
