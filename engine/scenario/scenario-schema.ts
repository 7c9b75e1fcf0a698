import { z } from "zod";
import { parseDuration } from "./duration";
import {
  deviceIdSchema,
  groupAddressTextSchema,
  inputValueSchema,
  simInputShapes,
  type SimInput,
} from "../sim/sim-input";

export { groupAddressTextSchema };

/**
 * Benchline's scenario document, `format: 1`.
 *
 * A scenario names a bench and lists steps in virtual time. The bench first runs
 * for `settle` so devices finish starting up; that instant is the first anchor.
 * Action steps (write, read, press, set-input, set-parameter, inject-fault,
 * clear-fault) happen at the current virtual time and move the anchor there.
 * Expect steps never move the anchor: every window an expectation names
 * ("within", "for", "over") starts at the anchor, so several expectations after
 * one command all measure from that command. `wait` also counts from the anchor
 * and moves it: "wait 30s" means 30 s after the last action (or the last wait).
 *
 * The document keeps durations as the text a person wrote ("500ms"); the runner
 * converts them with `parseDuration`, which this schema has already checked.
 */

/** A readable duration, e.g. "500ms", "30s", "2m", "1h". */
export const durationTextSchema = z
  .string({ error: 'expected a duration like "500ms", "30s", "2m" or "1h"' })
  .superRefine((text, ctx) => {
    const parsed = parseDuration(text);
    if (!parsed.ok) ctx.addIssue({ code: "custom", message: parsed.error.message });
  });

const toleranceSchema = z.number().nonnegative("tolerance must be zero or more");
/** Any JSON value; checked against the group address's DPT when the scenario runs. */
const jsonValueSchema = inputValueSchema;
const labelSchema = z.string().optional();
const serviceFilterSchema = z.enum(["write", "response", "any"]);
/**
 * The line an expectation looks at, by address ("1.2"); absent: telegrams as
 * their senders sent them (copies a coupler passes to other lines are not
 * counted again) and, for bus load, the busiest line.
 */
const lineSchema = z
  .string()
  .regex(/^\d{1,2}\.\d{1,2}$/, 'expected a line address "area.line", like "1.2"')
  .optional();

// Action steps are simulation inputs (engine/sim/sim-input.ts) plus a label; in a
// document the group address is always text.
const { write, read, press } = simInputShapes;
const address = { groupAddress: groupAddressTextSchema };

export const writeStepSchema = z.object({ ...write, label: labelSchema, ...address }).strict();

export const readStepSchema = z
  .object({ kind: read.kind, label: labelSchema, ...address, from: read.from })
  .strict();

export const pressStepSchema = z.object({ ...press, label: labelSchema }).strict();

export const setInputStepSchema = z
  .object({ ...simInputShapes["set-input"], label: labelSchema })
  .strict();

export const waitStepSchema = z
  .object({ kind: z.literal("wait"), label: labelSchema, for: durationTextSchema })
  .strict();

export const setParameterStepSchema = z
  .object({ ...simInputShapes["set-parameter"], label: labelSchema })
  .strict();

export const injectFaultStepSchema = z
  .object({ ...simInputShapes["inject-fault"], label: labelSchema })
  .strict();
export const clearFaultStepSchema = z
  .object({ ...simInputShapes["clear-fault"], label: labelSchema })
  .strict();

/** A write or response carrying `value` reaches the address within the window. */
export const expectValueStepSchema = z
  .object({
    kind: z.literal("expect-value"),
    label: labelSchema,
    line: lineSchema,
    groupAddress: groupAddressTextSchema,
    value: jsonValueSchema,
    tolerance: toleranceSchema.optional(),
    within: durationTextSchema,
    service: serviceFilterSchema.optional(),
  })
  .strict();

/** A GroupValue_Response reaches the address within the window (with `value`, when given). */
export const expectResponseStepSchema = z
  .object({
    kind: z.literal("expect-response"),
    label: labelSchema,
    line: lineSchema,
    groupAddress: groupAddressTextSchema,
    value: jsonValueSchema.optional(),
    tolerance: toleranceSchema.optional(),
    within: durationTextSchema,
  })
  .strict();

/** A value inside a device's state, reached by a dotted path ("unit.setpointC", "scenes.0.fan"). */
export const expectStateStepSchema = z
  .object({
    kind: z.literal("expect-state"),
    label: labelSchema,
    device: deviceIdSchema,
    path: z.string().min(1, 'expected a dotted path into the device state, like "setpointC"'),
    value: jsonValueSchema,
    tolerance: toleranceSchema.optional(),
    /** Poll until the state matches, up to this long; checked once at the current time when absent. */
    within: durationTextSchema.optional(),
  })
  .strict();

/** Number of telegrams to an address inside the window: exactly `count`, or between `min` and `max`. */
export const expectCountStepSchema = z
  .object({
    kind: z.literal("expect-count"),
    label: labelSchema,
    line: lineSchema,
    groupAddress: groupAddressTextSchema,
    within: durationTextSchema,
    count: z.number().int().nonnegative().optional(),
    min: z.number().int().nonnegative().optional(),
    max: z.number().int().nonnegative().optional(),
    service: serviceFilterSchema.optional(),
  })
  .strict()
  .superRefine((step, ctx) => {
    if (step.count === undefined && step.min === undefined && step.max === undefined) {
      ctx.addIssue({ code: "custom", path: ["count"], message: "give count, or min and/or max" });
    }
    if (step.count !== undefined && (step.min !== undefined || step.max !== undefined)) {
      ctx.addIssue({
        code: "custom",
        path: ["count"],
        message: "give either count or min/max, not both",
      });
    }
    if (step.min !== undefined && step.max !== undefined && step.min > step.max) {
      ctx.addIssue({
        code: "custom",
        path: ["max"],
        message: `max ${step.max} is below min ${step.min}`,
      });
    }
  });

/** Bus load over the window stays below a percentage of line capacity. */
export const expectBusLoadStepSchema = z
  .object({
    kind: z.literal("expect-bus-load"),
    label: labelSchema,
    line: lineSchema,
    belowPercent: z
      .number()
      .gt(0, "belowPercent must be above 0")
      .lte(100, "belowPercent must be at most 100"),
    over: durationTextSchema,
  })
  .strict();

/** Nothing is sent to the address (or, without an address, to any address) for the window. */
export const expectSilenceStepSchema = z
  .object({
    kind: z.literal("expect-silence"),
    label: labelSchema,
    line: lineSchema,
    groupAddress: groupAddressTextSchema.optional(),
    for: durationTextSchema,
  })
  .strict();

export const stepSchema = z.discriminatedUnion("kind", [
  writeStepSchema,
  readStepSchema,
  pressStepSchema,
  setInputStepSchema,
  waitStepSchema,
  setParameterStepSchema,
  injectFaultStepSchema,
  clearFaultStepSchema,
  expectValueStepSchema,
  expectResponseStepSchema,
  expectStateStepSchema,
  expectCountStepSchema,
  expectBusLoadStepSchema,
  expectSilenceStepSchema,
]);
export type Step = z.infer<typeof stepSchema>;
export type StepKind = Step["kind"];
export type ExpectStep = Extract<Step, { kind: `expect-${string}` }>;
export type ActionStep = Exclude<Step, ExpectStep>;

/** Every step kind, in the order the documentation lists them. */
export const stepKinds: readonly StepKind[] = stepSchema.options.map(
  (option) => option.shape.kind.value,
);

/** The simulation input of an action step: the step without its label. */
export function stepInput(step: Exclude<ActionStep, { kind: "wait" }>): SimInput {
  const { label, ...input } = step;
  void label;
  return input;
}

export function isExpectStep(step: Step): step is ExpectStep {
  return step.kind.startsWith("expect-");
}

/** Which bench a scenario runs on: a file path (relative to the scenario file) or a bench name. */
export const benchReferenceSchema = z
  .object({
    path: z.string().min(1).optional(),
    name: z.string().min(1).optional(),
  })
  .strict()
  .superRefine((reference, ctx) => {
    if ((reference.path === undefined) === (reference.name === undefined)) {
      ctx.addIssue({ code: "custom", message: 'give exactly one of "path" or "name"' });
    }
  });
export type BenchReference = z.infer<typeof benchReferenceSchema>;

export const scenarioSchema = z
  .object({
    format: z.literal(1, { error: "expected format 1 (the only scenario format so far)" }),
    name: z.string().min(1, "a scenario needs a name"),
    description: z.string().optional(),
    bench: benchReferenceSchema,
    /** Seed of the run's random generator; the same seed gives the same trace. */
    seed: z.number().int().nonnegative().default(1),
    /** Virtual time the bench runs before the first step (start-up announcements, read-on-init). */
    settle: durationTextSchema.default("1s"),
    /**
     * A fault-finding exercise: the scenario is written to fail on the bench as
     * shipped, and counts as passing when it fails (and failing when it passes).
     */
    expectedToFail: z.boolean().default(false),
    steps: z.array(stepSchema).min(1, "a scenario needs at least one step"),
  })
  .strict();
/** A scenario after parsing (defaults filled). */
export type Scenario = z.infer<typeof scenarioSchema>;
/** A scenario as written in a file (defaults may be absent). */
export type ScenarioDocument = z.input<typeof scenarioSchema>;
