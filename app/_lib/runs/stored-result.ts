import { z } from "zod";
import type { TraceEvent } from "@/engine";
import type { ScenarioResult, StepResult } from "@/engine";
import type { RunVerdict } from "@/db/schema";

/**
 * The per-step results of a run as stored in runs.results (JSON text): the
 * engine's ScenarioResult, keeping the trace slice only for steps that failed
 * or could not run. Passing steps' slices are what a report never shows and
 * would multiply the row size for nothing.
 */
export function resultForStorage(result: ScenarioResult): ScenarioResult {
  return {
    ...result,
    steps: result.steps.map((step) =>
      step.status === "fail" || step.status === "error" ? step : { ...step, trace: [] },
    ),
  };
}

/** A run's verdict from its outcome: expected failures count as passing, as in the CLI. */
export function verdictOf(result: ScenarioResult): RunVerdict {
  if (result.outcome === "error") return "error";
  return result.ok ? "pass" : "fail";
}

const traceEventSchema = z.looseObject({ kind: z.string(), timeUs: z.number() });

const stepResultSchema = z.object({
  index: z.number().int(),
  kind: z.string(),
  label: z.string(),
  status: z.enum(["pass", "fail", "error", "skipped"]),
  startUs: z.number(),
  endUs: z.number(),
  expected: z.string().optional(),
  actual: z.string().optional(),
  message: z.string().optional(),
  trace: z.array(traceEventSchema),
});

/** Checks the stored JSON on read: it came from our own runner, but the column is only text. */
export const storedScenarioResultSchema = z.object({
  name: z.string(),
  source: z.string().optional(),
  seed: z.number().int(),
  expectedToFail: z.boolean(),
  outcome: z.enum(["passed", "failed", "expected-failure", "unexpected-pass", "error"]),
  ok: z.boolean(),
  steps: z.array(stepResultSchema),
  totals: z.object({
    pass: z.number().int(),
    fail: z.number().int(),
    error: z.number().int(),
    skipped: z.number().int(),
  }),
  virtualTimeUs: z.number(),
  wallMs: z.number(),
  message: z.string().optional(),
});

/** The stored result of a run, or null when there is none yet or it does not parse. */
export function parseStoredResult(text: string | null): ScenarioResult | null {
  if (!text) return null;
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch {
    return null;
  }
  const parsed = storedScenarioResultSchema.safeParse(data);
  if (!parsed.success) return null;
  // Trace events were written by the engine; the schema checked their common fields.
  return parsed.data as unknown as ScenarioResult & {
    steps: (StepResult & { trace: TraceEvent[] })[];
  };
}
