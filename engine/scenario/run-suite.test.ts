import { describe, expect, it } from "vitest";
import type { BenchInput } from "../bench";
import { parseScenario } from "./parse-scenario";
import { runSuite } from "./run-suite";

const bench: BenchInput = {
  format: 1,
  name: "Suite fixture",
  lines: [{ id: "line-1", address: "1.1", name: "Line 1" }],
  testToolAddress: "1.1.250",
  groupAddresses: [{ address: "1/0/1", name: "Lights switch", dpt: "1.001" }],
  devices: [
    {
      id: "act-1",
      type: "switch-actuator",
      name: "Lights actuator",
      individualAddress: "1.1.2",
      parameters: { statusObjects: false },
    },
  ],
  links: [{ device: "act-1", object: 0, groupAddress: "1/0/1" }],
};

const scenario = (name: string, value: boolean, expectedToFail = false) => {
  const parsed = parseScenario({
    format: 1,
    name,
    bench: { name: "Suite fixture" },
    expectedToFail,
    steps: [
      { kind: "write", groupAddress: "1/0/1", value: true },
      { kind: "wait", for: "500ms" },
      { kind: "expect-state", device: "act-1", path: "on.0", value },
    ],
  });
  if (!parsed.ok) throw new Error(parsed.error.message);
  return parsed.value;
};

describe("runSuite", () => {
  it("aggregates scenario results, reporting progress as it goes", () => {
    const progress: string[] = [];
    const suite = runSuite(
      "Fixture suite",
      [
        { source: "a.scenario.json", scenario: scenario("switches on", true), bench },
        {
          source: "b.scenario.json",
          scenario: scenario("exercise: stays off", false, true),
          bench,
        },
        { source: "c.scenario.json", scenario: scenario("wrongly expects off", false), bench },
        { source: "d.scenario.json", error: "d.scenario.json: not valid JSON" },
      ],
      {
        onResult: (result, position, total) =>
          progress.push(`${position}/${total} ${result.outcome}`),
      },
    );
    expect(progress).toEqual(["1/4 passed", "2/4 expected-failure", "3/4 failed", "4/4 error"]);
    expect(suite.totals).toEqual({
      scenarios: 4,
      ok: 2,
      failed: 1,
      errors: 1,
      expectedFailures: 1,
      unexpectedPasses: 0,
    });
    expect(suite.ok).toBe(false);
    expect(suite.scenarios[3]).toMatchObject({
      name: "d.scenario.json",
      message: "d.scenario.json: not valid JSON",
    });
  });
});
