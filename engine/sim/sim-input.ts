import { z } from "zod";
import { parseGroupAddress } from "../address";
import { err, ok, type Result } from "../core/result";
import type { SimError } from "./sim-error";

/**
 * The one input language of a simulation: everything a person, a scenario step,
 * the live console or a test can do to a running bench from outside. The
 * console's worker commands, scenario action steps, the recorder and the test
 * harness are all built from this union, and `Simulation.apply` is its one
 * dispatch. Field names are the scenario document's (`device`, `button`,
 * `parameter`, `fault`), so a scenario action step is a `SimInput` plus a label.
 */

const groupAddressMessage =
  'expected a group address like "1/0/1" (main 0-31 / middle 0-7 / sub 0-255), not 0/0/0';

/** A group address as text ("1/0/1", "1/257", "4097"); checked when parsed. */
export const groupAddressTextSchema = z
  .string({ error: groupAddressMessage })
  .refine((text) => parseGroupAddress(text).ok, { message: groupAddressMessage });

/** A group address as text or as a raw 16-bit number (1..65535); the simulation checks it is on the bench. */
export const groupAddressInputSchema = z.union([
  z.string().min(1, "groupAddress is required"),
  z.number(),
]);

/** A device id from the bench. */
export const deviceIdSchema = z.string().min(1, "expected a device id from the bench");
/** Any JSON value; checked against the DPT (or the device's parameter schema) when applied. */
export const inputValueSchema = z.json();
/** Telegram priority (knx-reference.md: system, normal, urgent, low). */
export const prioritySchema = z.enum(["system", "normal", "urgent", "low"]);
/** How a local button is operated. */
export const buttonActionSchema = z.enum(["press", "release", "long-press"]);

/** The fields of each input kind, shared by the input schema and the scenario step schemas. */
export const simInputShapes = {
  write: {
    kind: z.literal("write"),
    groupAddress: groupAddressInputSchema,
    value: inputValueSchema,
    /** Device whose individual address sends; the bench's test tool when absent. */
    from: deviceIdSchema.optional(),
    priority: prioritySchema.optional(),
  },
  read: {
    kind: z.literal("read"),
    groupAddress: groupAddressInputSchema,
    from: deviceIdSchema.optional(),
    priority: prioritySchema.optional(),
  },
  response: {
    kind: z.literal("response"),
    groupAddress: groupAddressInputSchema,
    value: inputValueSchema,
    from: deviceIdSchema.optional(),
    priority: prioritySchema.optional(),
  },
  press: {
    kind: z.literal("press"),
    device: deviceIdSchema,
    button: z.string().min(1, "expected a button id of the device"),
    action: buttonActionSchema.optional(),
  },
  "set-input": {
    kind: z.literal("set-input"),
    device: deviceIdSchema,
    input: z.string().min(1, "expected an input name of the device"),
    value: inputValueSchema,
  },
  "set-parameter": {
    kind: z.literal("set-parameter"),
    device: deviceIdSchema,
    parameter: z.string().min(1, "expected a parameter key of the device"),
    value: inputValueSchema,
  },
  "set-parameters": {
    kind: z.literal("set-parameters"),
    device: deviceIdSchema,
    parameters: z.record(z.string(), z.unknown()),
  },
  "inject-fault": {
    kind: z.literal("inject-fault"),
    /** Device id, or a unit-link id for link faults such as "link.broken". */
    device: deviceIdSchema,
    fault: z.string().min(1, 'expected a fault id like "link.broken"'),
  },
  "clear-fault": {
    kind: z.literal("clear-fault"),
    device: deviceIdSchema,
    fault: z.string().min(1, 'expected a fault id like "link.broken"'),
  },
} as const;

/** The zod schema of `SimInput`, discriminated by `kind`. */
export const simInputSchema = z.discriminatedUnion("kind", [
  z.object(simInputShapes.write).strict(),
  z.object(simInputShapes.read).strict(),
  z.object(simInputShapes.response).strict(),
  z.object(simInputShapes.press).strict(),
  z.object(simInputShapes["set-input"]).strict(),
  z.object(simInputShapes["set-parameter"]).strict(),
  z.object(simInputShapes["set-parameters"]).strict(),
  z.object(simInputShapes["inject-fault"]).strict(),
  z.object(simInputShapes["clear-fault"]).strict(),
]);

/** One thing done to a running bench from outside; see the module comment. */
export type SimInput = z.infer<typeof simInputSchema>;
/** The kinds of `SimInput`. */
export type SimInputKind = SimInput["kind"];

/** What an applied input did: when, and the telegram it queued for write, read and response. */
export interface Receipt {
  /** Virtual time the input was applied, µs. */
  readonly atUs: number;
  /** Id of the queued telegram (write, read, response). */
  readonly telegramId?: number;
}

/** Validates untrusted input (a worker message, a request body) as a `SimInput`; the error names the field. */
export function parseSimInput(raw: unknown): Result<SimInput, SimError> {
  const parsed = simInputSchema.safeParse(raw);
  if (parsed.success) return ok(parsed.data);
  const issue = parsed.error.issues[0];
  return err({
    kind: "sim.input-invalid",
    field: issue?.path.join(".") || "kind",
    message: issue?.message ?? "not a simulation input",
  });
}
