/**
 * Scenario replay benchmark: `npm run bench:scenarios`.
 *
 * Replays every shipped scenario (scenarios/demo.suite.json) 100 times over,
 * each replay on a fresh simulation of its bench with the full trace kept (as
 * the runner always does, since verdicts carry trace slices). Benches are loaded
 * once, as the CLI does for a suite. One untimed pass warms the JIT first.
 *
 * Target: >= 500 scenario replays per second on one core.
 */
import { readFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { performance } from "node:perf_hooks";
import { fileURLToPath } from "node:url";
import { loadBench, type LoadedBench } from "../../engine/bench";
import { parseScenario } from "../../engine/scenario/parse-scenario";
import { runScenario } from "../../engine/scenario/run-scenario";
import type { Scenario } from "../../engine/scenario/scenario-schema";
import { parseSuite } from "../../engine/scenario/suite-schema";

const TARGET_PER_S = 500;
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

function pass(): { virtualUs: number; steps: number } {
  let virtualUs = 0;
  let steps = 0;
  for (const { file, scenario, bench } of work) {
    const result = runScenario(scenario, bench);
    if (!result.ok) throw new Error(`${file}: ${result.outcome}`);
    virtualUs += result.virtualTimeUs;
    steps += result.steps.length;
  }
  return { virtualUs, steps };
}

pass(); // warm-up, untimed

const wall0 = performance.now();
const cpu0 = process.cpuUsage();
let virtualUs = 0;
let steps = 0;
const perPassMs: number[] = [];
for (let i = 0; i < PASSES; i++) {
  const t = performance.now();
  const done = pass();
  perPassMs.push(performance.now() - t);
  virtualUs += done.virtualUs;
  steps += done.steps;
}
const wallS = (performance.now() - wall0) / 1000;
const cpu = process.cpuUsage(cpu0);
const cpuS = (cpu.user + cpu.system) / 1e6;
const replays = PASSES * work.length;
const perWallS = replays / wallS;
const perCpuS = replays / cpuS;
perPassMs.sort((a, b) => a - b);

const row = (label: string, value: string) => console.log(`  ${label.padEnd(34)} ${value}`);
console.log(
  `Scenario replays: ${work.length} shipped scenarios x ${PASSES} passes = ${replays} replays`,
);
row("wall time", `${wallS.toFixed(2)} s`);
row("CPU time (this process)", `${cpuS.toFixed(2)} s`);
row("steps run", `${steps}`);
row("virtual time simulated", `${(virtualUs / 3_600_000_000).toFixed(1)} h`);
row(
  "one pass (median / slowest)",
  `${perPassMs[Math.floor(PASSES / 2)]!.toFixed(1)} ms / ${perPassMs[PASSES - 1]!.toFixed(1)} ms`,
);
console.log("");
console.log(
  `  ${"".padEnd(34)} ${"measured".padStart(10)} ${"target".padStart(10)} ${"ratio".padStart(8)}`,
);
const compare = (label: string, measured: number) =>
  console.log(
    `  ${label.padEnd(34)} ${measured.toFixed(0).padStart(10)} ${String(TARGET_PER_S).padStart(10)} ${(measured / TARGET_PER_S).toFixed(2).padStart(7)}x`,
  );
compare("replays per wall-clock second", perWallS);
compare("replays per CPU second", perCpuS);
console.log(
  perWallS >= TARGET_PER_S
    ? "\nTarget met."
    : "\nBelow target (wall clock; compare the CPU figure on a shared machine).",
);
