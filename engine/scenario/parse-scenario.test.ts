import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parseDuration } from "./duration";
import { parseScenario, parseScenarioText } from "./parse-scenario";
import { stepKinds } from "./scenario-schema";

// Valid parts, generated. Group address ranges: knx-reference.md "Addresses" (3-level 0-31/0-7/0-255).
const groupAddress = fc
  .tuple(
    fc.integer({ min: 0, max: 31 }),
    fc.integer({ min: 0, max: 7 }),
    fc.integer({ min: 0, max: 255 }),
  )
  .filter(([a, b, c]) => a + b + c > 0)
  .map(([a, b, c]) => `${a}/${b}/${c}`);
const duration = fc
  .tuple(fc.integer({ min: 0, max: 1440 }), fc.constantFrom("us", "ms", "s", "m"))
  .map(([n, unit]) => `${n}${unit}`);
const device = fc.constantFrom("gw-1", "pb-door", "sensor-1");
const value = fc.oneof(
  fc.boolean(),
  fc.integer({ min: 0, max: 255 }),
  fc.double({ min: -50, max: 50, noNaN: true }),
);

const validStep = fc.oneof(
  fc.record({ kind: fc.constant("write"), groupAddress, value }),
  fc.record(
    { kind: fc.constant("read"), groupAddress },
    { requiredKeys: ["kind", "groupAddress"] },
  ),
  fc.record({ kind: fc.constant("press"), device, button: fc.constant("rocker-1") }),
  fc.record({ kind: fc.constant("set-input"), device, input: fc.constant("window"), value }),
  fc.record({ kind: fc.constant("wait"), for: duration }),
  fc.record({ kind: fc.constant("set-parameter"), device, parameter: fc.constant("role"), value }),
  fc.record({ kind: fc.constant("inject-fault"), device, fault: fc.constant("link.broken") }),
  fc.record({ kind: fc.constant("expect-value"), groupAddress, value, within: duration }),
  fc.record({ kind: fc.constant("expect-response"), groupAddress, within: duration }),
  fc.record({ kind: fc.constant("expect-state"), device, path: fc.constant("setpointC"), value }),
  fc.record({
    kind: fc.constant("expect-count"),
    groupAddress,
    within: duration,
    count: fc.nat(20),
  }),
  fc.record({
    kind: fc.constant("expect-bus-load"),
    belowPercent: fc.integer({ min: 1, max: 100 }),
    over: duration,
  }),
  fc.record({ kind: fc.constant("expect-silence"), groupAddress, for: duration }),
);
const validScenario = fc.record({
  format: fc.constant(1),
  name: fc.string({ minLength: 1 }),
  bench: fc.constant({ path: "../benches/lab.bench.json" }),
  seed: fc.nat(),
  steps: fc.array(validStep, { minLength: 1, maxLength: 8 }),
});

type Doc = { steps: Record<string, unknown>[] } & Record<string, unknown>;
const clone = <T>(value: T): T => JSON.parse(JSON.stringify(value)) as T;

const durationFields = ["for", "within", "over"] as const;
const notADuration = fc
  .oneof(fc.string(), fc.constantFrom("5 secs", "1d", "ms", "10", "-1s", "0.5us"))
  .filter((text) => !parseDuration(text).ok);

describe("parseScenario", () => {
  it("accepts generated valid scenarios and fills the defaults", () => {
    fc.assert(
      fc.property(validScenario, (doc) => {
        const result = parseScenario(doc);
        expect(result.ok).toBe(true);
        if (result.ok) expect(result.value.expectedToFail).toBe(false);
      }),
    );
  });

  it("points at the step and field of a bad duration", () => {
    fc.assert(
      fc.property(validScenario, fc.nat(), notADuration, (doc, pick, bad) => {
        const withDuration = doc.steps
          .map((step, index) => ({ index, field: durationFields.find((f) => f in step) }))
          .filter((entry) => entry.field !== undefined);
        fc.pre(withDuration.length > 0);
        const target = withDuration[pick % withDuration.length]!;
        const broken = clone(doc) as Doc;
        broken.steps[target.index]![target.field!] = bad;
        const result = parseScenario(broken);
        expect(result.ok).toBe(false);
        if (result.ok) return;
        expect(result.error.issues).toContainEqual({
          path: `steps[${target.index}].${target.field}`,
          message: expect.stringContaining('expected a duration like "500ms"'),
        });
      }),
    );
  });

  it("points at the step and field of a bad group address", () => {
    const badAddress = fc.constantFrom(
      "0/0/0",
      "32/0/1",
      "1/8/1",
      "1/0/256",
      "1.1.1",
      "",
      "a/b/c",
      "1/2048",
    );
    fc.assert(
      fc.property(validScenario, fc.nat(), badAddress, (doc, pick, bad) => {
        const withAddress = doc.steps
          .map((step, index) => ({ step, index }))
          .filter(({ step }) => "groupAddress" in step);
        fc.pre(withAddress.length > 0);
        const target = withAddress[pick % withAddress.length]!;
        const broken = clone(doc) as Doc;
        broken.steps[target.index]!.groupAddress = bad;
        const result = parseScenario(broken);
        expect(result.ok).toBe(false);
        if (result.ok) return;
        expect(result.error.message).toContain(
          `steps[${target.index}].groupAddress: expected a group address like "1/0/1"`,
        );
      }),
    );
  });

  it("names an unknown field, a missing field and an unknown step kind", () => {
    fc.assert(
      fc.property(
        validScenario,
        fc.nat(),
        fc.constantFrom("unknown-field", "missing-field", "bad-kind"),
        (doc, pick, mutation) => {
          const index = pick % doc.steps.length;
          const broken = clone(doc) as Doc;
          const step = broken.steps[index]!;
          let expected: string;
          if (mutation === "unknown-field") {
            step.withn = "1s";
            expected = `steps[${index}].withn: unknown field`;
          } else if (mutation === "missing-field") {
            // expect-silence without an address watches the whole line, so its address is optional.
            const optional = step.kind === "expect-silence" ? ["groupAddress"] : [];
            const required = Object.keys(step).find(
              (key) => key !== "kind" && !optional.includes(key),
            );
            fc.pre(required !== undefined);
            delete step[required!];
            expected = `steps[${index}].${required}: required field is missing`;
          } else {
            step.kind = "wrte";
            expected = `steps[${index}].kind: unknown step kind "wrte"; expected one of ${stepKinds.join(", ")}`;
          }
          const result = parseScenario(broken);
          expect(result.ok).toBe(false);
          if (!result.ok) expect(result.error.message).toContain(expected);
        },
      ),
    );
  });

  it("checks the document level: format, bench reference, steps", () => {
    const result = parseScenario({
      format: 2,
      name: "",
      bench: { path: "a", name: "b" },
      steps: [],
    });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.error.issues).toEqual([
      { path: "format", message: "expected format 1 (the only scenario format so far)" },
      { path: "name", message: "a scenario needs a name" },
      { path: "bench", message: 'give exactly one of "path" or "name"' },
      { path: "steps", message: "a scenario needs at least one step" },
    ]);
  });

  it("checks count, min and max of expect-count together", () => {
    const scenario = (step: object) => ({
      format: 1,
      name: "n",
      bench: { name: "b" },
      steps: [step],
    });
    const base = { kind: "expect-count", groupAddress: "1/0/1", within: "1s" };
    const messages = (step: object) => {
      const result = parseScenario(scenario(step));
      return result.ok ? "" : result.error.message;
    };
    expect(messages(base)).toBe("steps[0].count: give count, or min and/or max");
    expect(messages({ ...base, count: 1, max: 2 })).toBe(
      "steps[0].count: give either count or min/max, not both",
    );
    expect(messages({ ...base, min: 3, max: 2 })).toBe("steps[0].max: max 2 is below min 3");
    expect(messages({ ...base, min: 1, max: 2 })).toBe("");
  });

  it("reports text that is not JSON at the document level", () => {
    const result = parseScenarioText("{ format: 1");
    expect(result.ok).toBe(false);
    if (!result.ok) {
      expect(result.error.kind).toBe("scenario.not-json");
      expect(result.error.message).toMatch(/^\(document\): not valid JSON/);
    }
  });

  it("says what type it wanted", () => {
    const result = parseScenario({
      format: 1,
      name: "n",
      bench: { name: "b" },
      steps: [4, { kind: "wait", for: 5 }],
    });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.error.message).toBe(
      'steps[0]: expected object, got 4\nsteps[1].for: expected a duration like "500ms", "30s", "2m" or "1h"',
    );
  });
});
