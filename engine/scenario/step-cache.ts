import type { LoadedBench } from "../bench";
import type { DptCodec } from "../dpt";
import { parseDuration } from "./duration";

/**
 * Work a scenario step needs that depends only on the step and its bench, kept
 * between replays: a suite replays the same parsed scenario on the same loaded
 * bench many times, and parsing durations, resolving addresses and checking
 * expected values again each time cost more than some short runs themselves.
 *
 * Everything kept is derived deterministically from immutable inputs (parsed
 * steps, loaded benches, duration text), so reuse cannot change a verdict.
 * Steps and benches key weak maps, so nothing outlives them.
 */

const durations = new Map<string, number>();
// Duration texts come from scenario files; a cap keeps a long-lived process from collecting every one ever seen.
const MAX_DURATIONS = 4096;

/** A duration the scenario schema has already checked, in µs. */
export function durationUs(text: string): number {
  const kept = durations.get(text);
  if (kept !== undefined) return kept;
  const parsed = parseDuration(text);
  // The schema has checked every duration; a bad one here is a bug.
  if (!parsed.ok) throw new Error(`unchecked duration ${text}`);
  if (durations.size >= MAX_DURATIONS) durations.clear();
  durations.set(text, parsed.value);
  return parsed.value;
}

const addressesByBench = new WeakMap<LoadedBench, Map<string, unknown>>();

/** Address lookups of one bench, by the text a step wrote ("1/1/2"). */
export function addressTable<A>(bench: LoadedBench): Map<string, A> {
  let table = addressesByBench.get(bench);
  if (table === undefined) {
    table = new Map();
    addressesByBench.set(bench, table);
  }
  return table as Map<string, A>;
}

const labels = new WeakMap<object, string>();

/** A step's label, computed once per parsed step. */
export function keptLabel<S extends object>(step: S, label: (step: S) => string): string {
  let text = labels.get(step);
  if (text === undefined) {
    text = label(step);
    labels.set(step, text);
  }
  return text;
}

const checkedValues = new WeakMap<object, { codec: DptCodec<unknown>; value: unknown }>();

/**
 * A step's value after the DPT checked it (the codec is part of the key, in case
 * a step runs against a bench where its address has another DPT). `check`
 * throws for a value the DPT refuses, and a refused value is not kept.
 */
export function checkedStepValue(
  step: object,
  codec: DptCodec<unknown>,
  check: () => unknown,
): unknown {
  const kept = checkedValues.get(step);
  if (kept !== undefined && kept.codec === codec) return kept.value;
  const value = check();
  checkedValues.set(step, { codec, value });
  return value;
}
