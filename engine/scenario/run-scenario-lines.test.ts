import { beforeAll, describe, expect, it } from "vitest";
import { registerTestDevices, twoFloorsFixture } from "@/test/harness";
import type { TraceEvent } from "../core/trace";
import { createSimulation } from "../sim";
import { describeTraceEvent } from "./describe-trace-event";
import { parseScenario } from "./parse-scenario";
import { runScenario } from "./run-scenario";
import type { ScenarioDocument } from "./scenario-schema";

beforeAll(registerTestDevices);

/** Test tool on 1.1; 1/0/1 has listeners on 1.1 and 1.2, 1/0/9 only on 1.1. */
const bench = () =>
  twoFloorsFixture()
    .named("Two floors")
    .groupAddress("1/0/9", "7.001")
    .device("t", "test-recorder", "1.1.2")
    .link("t", 0, "1/0/9")
    .build();

function run(steps: ScenarioDocument["steps"]) {
  const parsed = parseScenario({ format: 1, name: "lines", bench: { name: "Two floors" }, steps });
  if (!parsed.ok) throw new Error(parsed.error.message);
  return runScenario(parsed.value, bench());
}

describe("scenario expectations per line", () => {
  it("expect-count counts a line's telegrams with `line`, and senders' telegrams once without", () => {
    const result = run([
      { kind: "set-input", device: "s", input: "send", value: 5 },
      { kind: "expect-count", groupAddress: "1/0/1", count: 1, within: "1s" },
      { kind: "expect-count", groupAddress: "1/0/1", line: "1.2", count: 1, within: "1s" },
      { kind: "expect-count", groupAddress: "1/0/1", line: "1.0", count: 1, within: "1s" },
      { kind: "expect-value", groupAddress: "1/0/1", line: "1.2", value: 5, within: "1s" },
    ]);
    expect(result.steps.map((s) => s.status)).toEqual(["pass", "pass", "pass", "pass", "pass"]);
  });

  it("a telegram the couplers keep on its line is not on the others", () => {
    const result = run([
      { kind: "set-input", device: "t", input: "send", value: 3 },
      { kind: "expect-count", groupAddress: "1/0/9", line: "1.2", count: 1, within: "1s" },
      { kind: "expect-silence", line: "1.0", for: "1s" },
    ]);
    expect(result.steps.map((s) => s.status)).toEqual(["pass", "fail", "pass"]);
    expect(result.steps[1]!.expected).toContain("on line 1.2");
  });

  it("expect-bus-load on one line, and a line not on the bench is a step error naming the field", () => {
    const result = run([
      { kind: "set-input", device: "s", input: "send", value: 1 },
      { kind: "expect-bus-load", line: "1.2", belowPercent: 10, over: "1s" },
      { kind: "expect-bus-load", line: "3.3", belowPercent: 10, over: "1s" },
    ]);
    expect(result.steps[1]!.status).toBe("pass");
    expect(result.steps[2]).toMatchObject({ status: "error" });
    expect(result.steps[2]!.message).toContain("line: no line 3.3");
  });

  it("coupler events read as one line each", () => {
    const sim = createSimulation(bench(), { seed: 1 });
    sim.setInput("s", "send", 2);
    sim.runFor(1_000_000);
    const forward = sim.trace.find(
      (e): e is Extract<TraceEvent, { kind: "coupler.forward" }> => e.kind === "coupler.forward",
    )!;
    expect(describeTraceEvent(forward)).toMatch(
      /coupler\.forward c11: 1\/0\/1 from line l11 to line m1 as telegram \d+ \(routing counter 5\)/,
    );
  });
});
