/**
 * Scenario replay benchmark: `npm run bench:scenarios`.
 *
 * Replays every shipped scenario (scenarios/demo.suite.json) 100 times over,
 * each replay on a fresh simulation of its bench with the full trace kept (as
 * the runner always does, since verdicts carry trace slices). Benches are loaded
 * once, as the CLI does for a suite. One untimed pass warms the JIT first.
 *
 * Three paths run side by side, alternating pass by pass: "now" (bench-only
 * work reused across runs), "no reuse" (`reuse: false`, redone every run) and
 * "baseline": the engine at BASELINE_COMMIT (before the replay work of issue
 * 14), extracted with git and given its own copy of the benches and scenarios.
 * BENCH_BASELINE names another commit; "none" leaves the baseline out.
 *
 * Targets: >= 500 scenario replays per wall-clock second, 2,500 per CPU second.
 */
import { dirname, resolve } from "node:path";
import { performance } from "node:perf_hooks";
import { fileURLToPath } from "node:url";
import { loadBench } from "../../engine";
import { parseScenario } from "../../engine";
import { runScenario } from "../../engine";
import { parseSuite } from "../../engine";
import { loadShippedScenarios } from "../golden/golden-runs";
import { importBaselineEngine } from "./baseline-engine";

/** The engine before replays were made faster (issue 14), as merged to main. */
const BASELINE_COMMIT = "f2e6bd2bfd5f9b73788e9617d73d346e0dba351c";

const TARGET_PER_S = 500;
/** The goal: replays per CPU second once a run starts from the prepared bench. */
const TARGET_CPU_PER_S = 2_500;
const PASSES = Number(process.env.BENCH_PASSES ?? 100);

const root = resolve(dirname(fileURLToPath(import.meta.url)), "../..");

type Engine = typeof import("../../engine");
type Work = ReturnType<typeof loadShippedScenarios>[number];

const engine: Engine = { parseSuite, parseScenario, loadBench, runScenario } as Engine;
const work = loadShippedScenarios(engine, root);
const baselineCommit = process.env.BENCH_BASELINE ?? BASELINE_COMMIT;
const baseline =
  baselineCommit === "none" ? null : await importBaselineEngine(root, baselineCommit);
const baselineEngine = baseline?.engine ?? null;
// The baseline's scenarios settle 1 s; today's devices send their statuses after a start-up
// delay (2 s plus a stagger by address), which one of those scenarios' silence windows would
// catch. Both engines settle the same work 5 s, as today's shipped scenarios do.
const settled = (list: Work[]): Work[] =>
  list.map((w) => ({ ...w, scenario: { ...w.scenario, settle: "5s" } }));
const baselineWork =
  baseline === null ? null : settled(loadShippedScenarios(baseline.engine, baseline.root));
// The speed-up compares engines on the same work: the baseline commit's shipped
// scenarios, which today's engine still loads. Today's own scenarios (more of
// them, and HVAC models that do more per virtual second) get a line of their own.
const sameWork = baseline === null ? work : settled(loadShippedScenarios(engine, baseline.root));

type PathName = "baseline" | "old" | "now" | "today";

const workOf = (path: PathName): Work[] =>
  path === "baseline" ? baselineWork! : path === "today" ? work : sameWork;

/** One pass over every scenario on one path. */
function pass(path: PathName): { virtualUs: number; steps: number } {
  let virtualUs = 0;
  let steps = 0;
  const run = path === "baseline" ? baselineEngine!.runScenario : runScenario;
  for (const { relative, scenario, bench } of workOf(path)) {
    const result = run(scenario, bench, { reuse: path !== "old" });
    if (!result.ok) throw new Error(`${relative}: ${result.outcome}`);
    virtualUs += result.virtualTimeUs;
    steps += result.steps.length;
  }
  return { virtualUs, steps };
}

const pathNames: PathName[] =
  baselineEngine === null ? ["old", "now"] : ["baseline", "old", "now", "today"];
for (const name of pathNames) pass(name); // warm-up, untimed

interface PathTotals {
  wallMs: number;
  cpuUs: number;
  virtualUs: number;
  steps: number;
  perPassMs: number[];
}
const totals = (): PathTotals => ({ wallMs: 0, cpuUs: 0, virtualUs: 0, steps: 0, perPassMs: [] });
const paths = { baseline: totals(), old: totals(), now: totals(), today: totals() };
// Passes alternate between the paths, so load from other processes falls on all alike.
for (let i = 0; i < PASSES; i++) {
  for (const name of pathNames) {
    const t = performance.now();
    const c = process.cpuUsage();
    const done = pass(name);
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
const replays = PASSES * sameWork.length;
const row = (label: string, value: string) => console.log(`  ${label.padEnd(34)} ${value}`);
console.log(
  `Scenario replays: ${sameWork.length} shipped scenarios x ${PASSES} passes = ${replays} replays per path`,
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
const hasBaseline = baselineEngine !== null;
const columns = [...(hasBaseline ? ["baseline"] : []), "no reuse", "now"];
console.log(
  `  ${"".padEnd(34)} ${columns.map((c) => c.padStart(10)).join(" ")} ${"speed-up".padStart(9)} ${"target".padStart(8)}`,
);
/** One figure per path; the speed-up is now over the baseline engine (else over the no-reuse path). */
const compare = (label: string, figure: (path: PathTotals) => number, target: number) => {
  const shown = [...(hasBaseline ? [paths.baseline] : []), paths.old, paths.now].map(figure);
  const reference = shown[0]!;
  const current = figure(paths.now);
  console.log(
    `  ${label.padEnd(34)} ${shown.map((v) => v.toFixed(0).padStart(10)).join(" ")} ${(current / reference).toFixed(2).padStart(8)}x ${String(target).padStart(8)}`,
  );
};
compare("replays per wall-clock second", (p) => replays / (p.wallMs / 1000), TARGET_PER_S);
compare("replays per CPU second", (p) => replays / (p.cpuUs / 1e6), TARGET_CPU_PER_S);
const perCpuS = replays / (now.cpuUs / 1e6);
if (hasBaseline) {
  const today = paths.today;
  const todayReplays = PASSES * work.length;
  console.log(
    `\ntoday's shipped scenarios (${work.length}, ${(today.virtualUs / PASSES / 3_600_000_000).toFixed(1)} h virtual per pass) on today's engine: ` +
      `${(todayReplays / (today.wallMs / 1000)).toFixed(0)} replays per wall-clock second, ${(todayReplays / (today.cpuUs / 1e6)).toFixed(0)} per CPU second`,
  );
}
console.log(
  hasBaseline
    ? `\nbaseline: the engine at ${baselineCommit.slice(0, 12)}; no reuse: today's engine with reuse off.`
    : "\n(no baseline engine: git could not extract it, or BENCH_BASELINE=none)",
);
console.log(
  perCpuS >= TARGET_CPU_PER_S
    ? "CPU target met."
    : "Below the CPU target (every path is measured in the same run, so the speed-up is the figure to compare).",
);
