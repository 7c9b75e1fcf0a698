import { describe, expect, it } from "vitest";
import { lightsFixture } from "@/test/harness/fixture-benches";
import { parseScenario } from "./parse-scenario";
import { runScenario } from "./run-scenario";
import type { ScenarioDocument } from "./scenario-schema";

// A push-button toggling a switch actuator whose status feeds back to the button.
const lightsBench = lightsFixture().named("Runner fixture").build();

function scenario(steps: ScenarioDocument["steps"], extra: Partial<ScenarioDocument> = {}) {
  const parsed = parseScenario({
    format: 1,
    name: "fixture",
    bench: { name: "Runner fixture" },
    steps,
    ...extra,
  });
  if (!parsed.ok) throw new Error(parsed.error.message);
  return parsed.value;
}

describe("runScenario", () => {
  it("filters expectations by the sender's individual address, a tunnel's as any station's", () => {
    // The test tool (1.1.250) is a station on the line like a KNXnet/IP tunnel (1.1.241 say):
    // both send with their own individual address and no device id.
    const result = runScenario(
      scenario([
        { kind: "press", device: "pb-1", button: "channel-1" },
        { kind: "expect-count", groupAddress: "1/0/1", count: 1, source: "1.1.1", within: "1s" },
        { kind: "write", groupAddress: "1/0/1", value: false },
        { kind: "expect-count", groupAddress: "1/0/1", count: 1, source: "1.1.250", within: "1s" },
        { kind: "expect-count", groupAddress: "1/0/1", count: 0, source: "1.1.1", within: "1s" },
        {
          kind: "expect-value",
          groupAddress: "1/0/1",
          value: false,
          source: "1.1.250",
          within: "500ms",
        },
        // No bench device has 1.1.241: the filter takes it anyway (a tunnel is not on the bench).
        {
          kind: "expect-value",
          groupAddress: "1/0/1",
          value: false,
          source: "1.1.241",
          within: "500ms",
        },
      ]),
      lightsBench,
    );
    expect(result.steps.map((s) => [s.label, s.status])).toEqual([
      ["press pb-1 channel-1", "pass"],
      ["expect-count 1/0/1 1 from 1.1.1 within 1s", "pass"],
      ["write 1/0/1 = false", "pass"],
      ["expect-count 1/0/1 1 from 1.1.250 within 1s", "pass"],
      ["expect-count 1/0/1 0 from 1.1.1 within 1s", "pass"],
      ["expect-value 1/0/1 = false from 1.1.250 within 500ms", "pass"],
      ["expect-value 1/0/1 = false from 1.1.241 within 500ms", "fail"],
    ]);
    expect(result.steps[6]).toMatchObject({
      expected: expect.stringContaining("a write or response from 1.1.241 to 1/0/1"),
      actual: expect.stringContaining("no write or response from 1.1.241 to 1/0/1"),
    });
    const bad = parseScenario({
      format: 1,
      name: "bad source",
      bench: { name: "Runner fixture" },
      steps: [
        { kind: "expect-count", groupAddress: "1/0/1", count: 1, source: "1/0/1", within: "1s" },
      ],
    });
    expect(bad.ok).toBe(false);
    expect(!bad.ok && bad.error.message).toMatch(/steps\[0\]\.source|source/);
  });

  it("passes when the actuator's status follows a button press", () => {
    const result = runScenario(
      scenario([
        { kind: "press", device: "pb-1", button: "channel-1" },
        { kind: "expect-value", groupAddress: "1/0/1", value: true, within: "200ms" },
        { kind: "expect-value", groupAddress: "1/1/1", value: true, within: "500ms" },
        { kind: "expect-state", device: "act-1", path: "on.0", value: true },
        { kind: "expect-count", groupAddress: "1/0/1", count: 1, within: "1s" },
        { kind: "wait", for: "1s" },
        { kind: "expect-silence", groupAddress: "1/0/1", for: "5s" },
        { kind: "read", groupAddress: "1/1/1" },
        { kind: "expect-response", groupAddress: "1/1/1", value: true, within: "500ms" },
        { kind: "expect-bus-load", belowPercent: 5, over: "10s" },
      ]),
      lightsBench,
    );
    expect(result.steps.map((s) => [s.label, s.status, s.message ?? s.actual ?? ""])).toEqual([
      ["press pb-1 channel-1", "pass", ""],
      ["expect-value 1/0/1 = true within 200ms", "pass", ""],
      ["expect-value 1/1/1 = true within 500ms", "pass", ""],
      ["expect-state act-1 on.0 = true", "pass", ""],
      ["expect-count 1/0/1 1 within 1s", "pass", ""],
      ["wait 1s", "pass", ""],
      ["expect-silence 1/0/1 for 5s", "pass", ""],
      ["read 1/1/1", "pass", ""],
      ["expect-response 1/1/1 = true within 500ms", "pass", ""],
      ["expect-bus-load below 5 % over 10s", "pass", ""],
    ]);
    expect(result).toMatchObject({
      outcome: "passed",
      ok: true,
      totals: { pass: 10, fail: 0, error: 0, skipped: 0 },
    });
    // The verdict for the status carries the telegrams that explain it.
    const status = result.steps[2]!;
    expect(
      status.trace.some(
        (e) => e.kind === "telegram.sent" && e.destination === 0x0901 && e.deviceId === "act-1",
      ),
    ).toBe(true);
  });

  it("fails with expected and actual when the status does not follow, and carries on", () => {
    const result = runScenario(
      scenario([
        { kind: "write", groupAddress: "1/0/1", value: false },
        { kind: "expect-value", groupAddress: "1/1/1", value: true, within: "500ms" },
        { kind: "write", groupAddress: "1/0/1", value: true },
        { kind: "expect-value", groupAddress: "1/1/1", value: false, within: "500ms" },
        { kind: "expect-count", groupAddress: "1/1/1", min: 2, within: "1s" },
      ]),
      lightsBench,
    );
    const [, nothing, , wrong, count] = result.steps;
    expect(nothing).toMatchObject({
      status: "fail",
      expected: 'a write or response to 1/1/1 "Lights status" carrying On (true) within 500ms',
    });
    // The actuator was already off, so it sent no status; the verdict says what the address last carried.
    expect(nothing!.actual).toBe("no write or response to 1/1/1 in the window");
    expect(wrong).toMatchObject({ status: "fail" });
    expect(wrong!.actual).toMatch(/^1\/1\/1 carried On \(true\) \(write at /);
    expect(count).toMatchObject({ status: "fail", actual: "1 telegram(s)" });
    expect(result).toMatchObject({ outcome: "failed", ok: false, totals: { pass: 2, fail: 3 } });
  });

  it("counts a failure as ok when the scenario is expected to fail, and a pass as not ok", () => {
    const failing = scenario(
      [{ kind: "expect-value", groupAddress: "1/1/1", value: true, within: "100ms" }],
      { expectedToFail: true },
    );
    expect(runScenario(failing, lightsBench)).toMatchObject({
      outcome: "expected-failure",
      ok: true,
    });
    const passing = scenario([{ kind: "wait", for: "1s" }], { expectedToFail: true });
    expect(runScenario(passing, lightsBench)).toMatchObject({
      outcome: "unexpected-pass",
      ok: false,
    });
  });

  it("reports a step that cannot run as an error at its index and field, and skips the rest", () => {
    const result = runScenario(
      scenario([
        { kind: "write", groupAddress: "1/0/1", value: true },
        { kind: "press", device: "pb-9", button: "channel-1" },
        { kind: "write", groupAddress: "5/0/1", value: true },
      ]),
      lightsBench,
    );
    expect(result.steps.map((s) => s.status)).toEqual(["pass", "error", "skipped"]);
    expect(result.steps[1]!.message).toMatch(/^steps\[1\]\.device: .*pb-9/);
    expect(result.outcome).toBe("error");
  });

  it("names a value that does not fit the address's DPT", () => {
    const result = runScenario(
      scenario([{ kind: "expect-value", groupAddress: "1/1/1", value: 21.5, within: "1s" }]),
      lightsBench,
    );
    expect(result.steps[0]!.message).toMatch(/^steps\[0\]\.value: 21\.5 is not a 1\.001 value/);
  });

  it("stops a runaway scenario when the injected wall clock passes the budget", () => {
    // A fake clock that moves 1 ms per reading: settling (a couple of readings) fits, the hour-long wait (one per slice) does not.
    let clockMs = 0;
    const now = () => (clockMs += 1);
    const result = runScenario(
      scenario([
        { kind: "wait", for: "1h" },
        { kind: "expect-silence", for: "1h" },
      ]),
      lightsBench,
      { now, budgetMs: 5 },
    );
    expect(result.steps.map((s) => s.status)).toEqual(["error", "skipped"]);
    expect(result.steps[0]!.message).toMatch(
      /^wall-clock budget of 5 ms ran out at virtual time .*; the scenario was stopped$/,
    );
    expect(result.outcome).toBe("error");
    expect(result.virtualTimeUs).toBeLessThan(3_600_000_000 + 1_000_000);
  });

  it("gives the same result for the same seed", () => {
    const doc = scenario([
      { kind: "press", device: "pb-1", button: "channel-1" },
      { kind: "wait", for: "2s" },
      { kind: "press", device: "pb-1", button: "channel-1" },
      { kind: "expect-value", groupAddress: "1/1/1", value: false, within: "1s" },
    ]);
    const a = runScenario(doc, lightsBench, { seed: 7 });
    const b = runScenario(doc, lightsBench, { seed: 7 });
    expect(JSON.stringify(b)).toBe(JSON.stringify(a));
  });
});
