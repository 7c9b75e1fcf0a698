/**
 * Scenario replay benchmark: `npm run bench:scenarios`.
 *
 * Replays every shipped scenario (scenarios/demo.suite.json) 100 times over,
 * each replay on a fresh simulation of its bench with the full trace kept (as
 * the runner always does, since verdicts carry trace slices). Benches are loaded
 * once, as the CLI does for a suite. One untimed pass warms the JIT first.
 *
 * Two paths run side by side, alternating pass by pass: "now" (bench-only work
 * reused across runs) and "old" (`reuse: false`, redone every run as before).
 *
 * Targets: >= 500 scenario replays per wall-clock second, 2,500 per CPU second.
 */
import { readFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { performance } from "node:perf_hooks";
import { fileURLToPath } from "node:url";
import { loadBench, type LoadedBench } from "../../engine";
import { parseScenario } from "../../engine";
import { runScenario } from "../../engine";
import type { Scenario } from "../../engine";
import { parseSuite } from "../../engine";

const TARGET_PER_S = 500;
/** The goal: replays per CPU second once a run starts from the prepared bench. */
const TARGET_CPU_PER_S = 2_500;
const PASSES = Number(process.env.BENCH_PASSES ?? 100);

const root = resolve(dirname(fileURLToPath(import.meta.url)), "../..");
const suitePath = resolve(root, "scenarios/demo.suite.json");
const json = (path: string): unknown => JSON.parse(readFileSync(path, "utf8"));

const suite = parseSuite(json(suitePath));
if (!suite.ok) throw new Error(suite.error.message);
const benches = new Map<string, LoadedBench>();
const work: { file: string; scenario: Scenario; bench: LoadedBench }[] = suite.value.scenarios.map(
  (relative) => {
    const file = resolve(dirname(suitePath), relative);
    const parsed = parseScenario(json(file));
    if (!parsed.ok) throw new Error(`${file}: ${parsed.error.message}`);
    const benchPath = resolve(dirname(file), parsed.value.bench.path!);
    let bench = benches.get(benchPath);
    if (bench === undefined) {
      const loaded = loadBench(json(benchPath));
      if (!loaded.ok)
        throw new Error(`${benchPath}: ${loaded.error.map((e) => e.message).join("; ")}`);
      bench = loaded.value;
      benches.set(benchPath, bench);
    }
    return { file: relative, scenario: parsed.value, bench };
  },
);

/** One pass over every scenario; `reuse: false` is the old path (bench-only work redone every run). */
function pass(reuse: boolean): { virtualUs: number; steps: number } {
  let virtualUs = 0;
  let steps = 0;
  for (const { file, scenario, bench } of work) {
    const result = runScenario(scenario, bench, { reuse });
    if (!result.ok) throw new Error(`${file}: ${result.outcome}`);
    virtualUs += result.virtualTimeUs;
    steps += result.steps.length;
  }
  return { virtualUs, steps };
}

pass(true); // warm-up, untimed
pass(false);

interface PathTotals {
  wallMs: number;
  cpuUs: number;
  virtualUs: number;
  steps: number;
  perPassMs: number[];
}
const totals = (): PathTotals => ({ wallMs: 0, cpuUs: 0, virtualUs: 0, steps: 0, perPassMs: [] });
const paths = { old: totals(), now: totals() };
// Passes alternate between the two paths, so load from other processes falls on both alike.
for (let i = 0; i < PASSES; i++) {
  for (const [name, reuse] of [
    ["old", false],
    ["now", true],
  ] as const) {
    const t = performance.now();
    const c = process.cpuUsage();
    const done = pass(reuse);
    const cpu = process.cpuUsage(c);
    const path = paths[name];
    const ms = performance.now() - t;
    path.wallMs += ms;
    path.cpuUs += cpu.user + cpu.system;
    path.perPassMs.push(ms);
    path.virtualUs += done.virtualUs;
    path.steps += done.steps;
  }
}
const replays = PASSES * work.length;
const row = (label: string, value: string) => console.log(`  ${label.padEnd(34)} ${value}`);
console.log(
  `Scenario replays: ${work.length} shipped scenarios x ${PASSES} passes = ${replays} replays per path`,
);
const now = paths.now;
now.perPassMs.sort((a, b) => a - b);
row("steps run (per path)", `${now.steps}`);
row("virtual time simulated (per path)", `${(now.virtualUs / 3_600_000_000).toFixed(1)} h`);
row(
  "one pass now (median / slowest)",
  `${now.perPassMs[Math.floor(PASSES / 2)]!.toFixed(1)} ms / ${now.perPassMs[PASSES - 1]!.toFixed(1)} ms`,
);
console.log("");
console.log(
  `  ${"".padEnd(34)} ${"old path".padStart(10)} ${"now".padStart(10)} ${"speed-up".padStart(9)} ${"target".padStart(8)}`,
);
const compare = (label: string, old: number, current: number, target: number) =>
  console.log(
    `  ${label.padEnd(34)} ${old.toFixed(0).padStart(10)} ${current.toFixed(0).padStart(10)} ${(current / old).toFixed(2).padStart(8)}x ${String(target).padStart(8)}`,
  );
compare(
  "replays per wall-clock second",
  replays / (paths.old.wallMs / 1000),
  replays / (now.wallMs / 1000),
  TARGET_PER_S,
);
const perCpuS = replays / (now.cpuUs / 1e6);
compare("replays per CPU second", replays / (paths.old.cpuUs / 1e6), perCpuS, TARGET_CPU_PER_S);
console.log(
  perCpuS >= TARGET_CPU_PER_S
    ? "\nCPU target met."
    : "\nBelow the CPU target (the old path is measured in the same run, so the speed-up is the figure to compare).",
);
