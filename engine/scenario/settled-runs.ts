import type { LoadedBench } from "../bench";
import type { Simulation } from "../sim";

/**
 * Runs of a bench that have settled, kept as templates: every scenario of a
 * suite starts the same way (same bench, seed and settle time, no inputs yet),
 * so after the first has settled the others start from a fork of it instead of
 * starting every device and settling again. A fork continues exactly as the
 * run would have (Simulation.fork), so verdicts and traces are unchanged.
 *
 * Loaded benches key a weak map: a template lives as long as its bench.
 */
const settledByBench = new WeakMap<LoadedBench, Map<string, Simulation>>();

/** Templates kept per bench; the oldest goes first. A suite usually needs one. */
const MAX_TEMPLATES_PER_BENCH = 8;

const key = (seed: number, settleUs: number) => `${seed}@${settleUs}`;

/** A fresh run of `bench` already settled for `settleUs` with `seed`, if one was kept. */
export function forkSettledRun(
  bench: LoadedBench,
  seed: number,
  settleUs: number,
): Simulation | undefined {
  return settledByBench.get(bench)?.get(key(seed, settleUs))?.fork();
}

/** Keeps a copy of `sim`, which has just settled (no input applied yet), as the template for its bench. */
export function keepSettledRun(
  bench: LoadedBench,
  seed: number,
  settleUs: number,
  sim: Simulation,
): void {
  let kept = settledByBench.get(bench);
  if (kept === undefined) {
    kept = new Map();
    settledByBench.set(bench, kept);
  }
  // A long-lived bench run with ever new seeds would otherwise collect a template per seed.
  if (kept.size >= MAX_TEMPLATES_PER_BENCH) kept.delete(kept.keys().next().value!);
  kept.set(key(seed, settleUs), sim.fork());
}
