/**
 * Scenario replay benchmark: `npm run bench:scenarios`.
 *
 * Replays every shipped scenario (scenarios/demo.suite.json) pass after pass,
 * each replay on a fresh simulation of its bench with the full trace kept (as
 * the runner always does, since verdicts carry trace slices). Benches are loaded
 * once, as the CLI does for a suite.
 *
 * Four paths, each in a child process of its own (its own V8 heap and helper
 * threads, as each engine would have when it runs), take turns pass by pass, so
 * load from other processes falls on all alike:
 * - "baseline": the engine at BASELINE_COMMIT (before the replay work of issue
 *   14), extracted with git, on its own copy of that commit's benches and
 *   scenarios (BENCH_BASELINE names another commit; "none" leaves it out);
 * - "no reuse": today's engine with `reuse: false` (bench-only work redone every run);
 * - "now": today's engine on the same work as the baseline;
 * - "today": today's engine on today's shipped scenarios (more of them, and bigger).
 *
 * Why processes and a long warm-up: CPU time counts V8's helper threads (the
 * JIT compiling in the background, the parallel and concurrent collector); in
 * one shared process one engine's garbage is collected, and its code compiled,
 * during another's passes.
 * BENCH_WARMUP untimed passes per path (30 by default) let compilation and the
 * heap's sizing settle; BENCH_PASSES timed passes follow (200 by default).
 * Beside the rates each path reports how much its old generation grows per
 * replay: what outlives a young collection or is allocated there directly,
 * all of which a full collection must then find (engine/core/run-objects.ts).
 *
 * Targets: >= 500 scenario replays per wall-clock second, 2,500 per CPU second.
 */
import { dirname, resolve } from "node:path";
import { performance } from "node:perf_hooks";
import { fileURLToPath } from "node:url";
import { fork } from "node:child_process";
import { getHeapSpaceStatistics } from "node:v8";

/** The engine before replays were made faster (issue 14), as merged to main. */
const BASELINE_COMMIT = "f2e6bd2bfd5f9b73788e9617d73d346e0dba351c";

const TARGET_PER_S = 500;
/** The goal: replays per CPU second once a run starts from the prepared bench. */
const TARGET_CPU_PER_S = 2_500;
const PASSES = Number(process.env.BENCH_PASSES ?? 200);
const WARMUP = Number(process.env.BENCH_WARMUP ?? 30);

type PathName = "baseline" | "old" | "now" | "today";

/** What a path's process reports for the passes it was asked to run. */
interface PassReport {
  readonly replays: number;
  readonly wallMs: number;
  readonly cpuUs: number;
  readonly virtualUs: number;
  readonly steps: number;
  /** Old-generation growth over the passes, bytes (passes with a full collection left out). */
  readonly oldGrowthBytes: number;
  /** Replays in the passes `oldGrowthBytes` covers. */
  readonly oldGrowthReplays: number;
}

/** Set in a path's child process: the JSON of its PathSetup. */
const SETUP_VARIABLE = "BENCH_SCENARIOS_PATH";

interface PathSetup {
  readonly path: PathName;
  readonly root: string;
  readonly baselineCommit: string;
}

const oldSpaceUsed = () =>
  getHeapSpaceStatistics().find((s) => s.space_name === "old_space")!.space_used_size;

/** Child side: loads one path's engine and work, then runs passes on request. */
async function runPath({ path, root, baselineCommit }: PathSetup): Promise<void> {
  const { loadShippedScenarios } = await import("../golden/golden-runs");
  type Work = ReturnType<typeof loadShippedScenarios>[number];
  // The baseline's scenarios settle 1 s; today's devices send their statuses after a start-up
  // delay (2 s plus a stagger by address), which one of those scenarios' silence windows would
  // catch. Both engines settle the same work 5 s, as today's shipped scenarios do.
  const settled = (list: Work[]): Work[] =>
    list.map((w) => ({ ...w, scenario: { ...w.scenario, settle: "5s" } }));
  const today = await import("../../engine");
  let runScenario: typeof today.runScenario = today.runScenario;
  const { importBaselineEngine } = await import("./baseline-engine");
  const baseline =
    path === "today" || baselineCommit === "none"
      ? null
      : await importBaselineEngine(root, baselineCommit);
  let work: Work[];
  if (path === "baseline") {
    if (baseline === null) throw new Error(`git cannot provide the engine at ${baselineCommit}`);
    runScenario = baseline.engine.runScenario;
    work = settled(loadShippedScenarios(baseline.engine, baseline.root));
  } else if (baseline === null) {
    work = loadShippedScenarios(today, root);
  } else {
    // The same work as the baseline: that commit's shipped scenarios, which today's engine still loads.
    work = settled(loadShippedScenarios(today, baseline.root));
  }
  const reuse = path !== "old";
  process.on("message", (count: number) => {
    let report: PassReport = {
      replays: 0,
      wallMs: 0,
      cpuUs: 0,
      virtualUs: 0,
      steps: 0,
      oldGrowthBytes: 0,
      oldGrowthReplays: 0,
    };
    for (let i = 0; i < count; i++) {
      const oldBefore = oldSpaceUsed();
      const t = performance.now();
      const c = process.cpuUsage();
      let virtualUs = 0;
      let steps = 0;
      for (const { relative, scenario, bench } of work) {
        const result = runScenario(scenario, bench, { reuse });
        if (!result.ok) throw new Error(`${path}: ${relative}: ${result.outcome}`);
        virtualUs += result.virtualTimeUs;
        steps += result.steps.length;
      }
      const cpu = process.cpuUsage(c);
      const wallMs = performance.now() - t;
      const growth = oldSpaceUsed() - oldBefore;
      report = {
        replays: report.replays + work.length,
        wallMs: report.wallMs + wallMs,
        cpuUs: report.cpuUs + cpu.user + cpu.system,
        virtualUs: report.virtualUs + virtualUs,
        steps: report.steps + steps,
        oldGrowthBytes: report.oldGrowthBytes + Math.max(0, growth),
        oldGrowthReplays: report.oldGrowthReplays + (growth >= 0 ? work.length : 0),
      };
    }
    process.send!(report);
  });
  process.send!("ready");
}

/** A path's child process, running this file with tsx. */
function startPath(setup: PathSetup): {
  passes(count: number): Promise<PassReport>;
  stop(): void;
} {
  const child = fork(fileURLToPath(import.meta.url), [], {
    execArgv: ["--import", "tsx"],
    env: { ...process.env, [SETUP_VARIABLE]: JSON.stringify(setup) },
  });
  let waiting: { resolve(r: PassReport): void; reject(e: unknown): void } | undefined;
  let ready: () => void;
  const readyNow = new Promise<void>((r) => (ready = r));
  child.on("message", (message: PassReport | "ready") => {
    if (message === "ready") ready();
    else waiting?.resolve(message);
  });
  child.on("exit", (code) => {
    if (code !== 0 && code !== null) {
      const error = new Error(`the ${setup.path} path's process exited with ${code}`);
      if (waiting) waiting.reject(error);
      else throw error;
    }
  });
  return {
    async passes(count) {
      await readyNow;
      return new Promise<PassReport>((resolve, reject) => {
        waiting = { resolve, reject };
        child.send(count);
      });
    },
    stop: () => void child.kill(),
  };
}

async function main(): Promise<void> {
  const root = resolve(dirname(fileURLToPath(import.meta.url)), "../..");
  const baselineCommit = process.env.BENCH_BASELINE ?? BASELINE_COMMIT;
  let hasBaseline = baselineCommit !== "none";
  if (hasBaseline) {
    const { importBaselineEngine } = await import("./baseline-engine");
    hasBaseline = (await importBaselineEngine(root, baselineCommit)) !== null;
  }
  const pathNames: PathName[] = hasBaseline ? ["baseline", "old", "now", "today"] : ["old", "now"];
  // Without a baseline commit, "no reuse" and "now" run today's shipped scenarios.
  const paths = new Map(
    pathNames.map((path) => [
      path,
      startPath({ path, root, baselineCommit: hasBaseline ? baselineCommit : "none" }),
    ]),
  );
  // One pass at a time, so both cores stay free for the path being measured.
  for (let i = 0; i < WARMUP; i++) for (const path of pathNames) await paths.get(path)!.passes(1);

  const totals = new Map<PathName, PassReport[]>(pathNames.map((p) => [p, []]));
  for (let i = 0; i < PASSES; i++)
    for (const path of pathNames) totals.get(path)!.push(await paths.get(path)!.passes(1));
  for (const running of paths.values()) running.stop();

  const summarize = (path: PathName) => {
    const reports = totals.get(path)!;
    const add = (f: (r: PassReport) => number) => reports.reduce((s, r) => s + f(r), 0);
    const passMs = reports.map((r) => r.wallMs).sort((a, b) => a - b);
    return {
      replays: add((r) => r.replays),
      wallMs: add((r) => r.wallMs),
      cpuUs: add((r) => r.cpuUs),
      virtualUs: add((r) => r.virtualUs),
      steps: add((r) => r.steps),
      oldKbPerReplay:
        add((r) => r.oldGrowthBytes) /
        1024 /
        Math.max(
          1,
          add((r) => r.oldGrowthReplays),
        ),
      medianPassMs: passMs[Math.floor(passMs.length / 2)]!,
      slowestPassMs: passMs[passMs.length - 1]!,
    };
  };
  const sums = new Map(pathNames.map((path) => [path, summarize(path)]));
  const sum = (path: PathName) => sums.get(path)!;
  const now = sum("now");
  const row = (label: string, value: string) => console.log(`  ${label.padEnd(34)} ${value}`);
  console.log(
    `Scenario replays: ${now.replays / PASSES} shipped scenarios x ${PASSES} passes = ${now.replays} replays per path` +
      ` (after ${WARMUP} untimed passes per path; each path in its own process)`,
  );
  row("steps run (per path)", `${now.steps}`);
  row("virtual time simulated (per path)", `${(now.virtualUs / 3_600_000_000).toFixed(1)} h`);
  row(
    "one pass now (median / slowest)",
    `${now.medianPassMs.toFixed(1)} ms / ${now.slowestPassMs.toFixed(1)} ms`,
  );
  console.log("");
  const compared: PathName[] = hasBaseline ? ["baseline", "old", "now"] : ["old", "now"];
  const columns = compared.map((p) => (p === "old" ? "no reuse" : p));
  console.log(
    `  ${"".padEnd(34)} ${columns.map((c) => c.padStart(10)).join(" ")} ${"speed-up".padStart(9)} ${"target".padStart(8)}`,
  );
  /** One figure per path; the speed-up is now over the first column (the baseline engine, else no reuse). */
  const compare = (label: string, figure: (path: PathName) => number, target: string) => {
    const shown = compared.map(figure);
    const ratio = figure("now") / shown[0]!;
    console.log(
      `  ${label.padEnd(34)} ${shown.map((v) => v.toFixed(v < 100 ? 1 : 0).padStart(10)).join(" ")} ${ratio.toFixed(2).padStart(8)}x ${target.padStart(8)}`,
    );
  };
  const perWallS = (p: PathName) => sum(p).replays / (sum(p).wallMs / 1000);
  const perCpuS = (p: PathName) => sum(p).replays / (sum(p).cpuUs / 1e6);
  compare("replays per wall-clock second", perWallS, String(TARGET_PER_S));
  compare("replays per CPU second", perCpuS, String(TARGET_CPU_PER_S));
  compare("old generation growth, KB/replay", (p) => sum(p).oldKbPerReplay, "");
  if (hasBaseline) {
    const today = sum("today");
    console.log(
      `\ntoday's shipped scenarios (${today.replays / PASSES}, ${(today.virtualUs / PASSES / 3_600_000_000).toFixed(1)} h virtual per pass) on today's engine: ` +
        `${perWallS("today").toFixed(0)} replays per wall-clock second, ${perCpuS("today").toFixed(0)} per CPU second, ` +
        `old generation growth ${today.oldKbPerReplay.toFixed(1)} KB/replay`,
    );
  }
  console.log(
    hasBaseline
      ? `\nbaseline: the engine at ${baselineCommit.slice(0, 12)}; no reuse: today's engine with reuse off.`
      : "\n(no baseline engine: git could not extract it, or BENCH_BASELINE=none)",
  );
  console.log(
    !hasBaseline
      ? "The CPU target is set for the baseline commit's scenarios, so it is not judged on today's."
      : perCpuS("now") >= TARGET_CPU_PER_S
        ? "CPU target met."
        : "Below the CPU target (every path is measured in the same run, so the speed-up is the figure to compare).",
  );
}

const setup = process.env[SETUP_VARIABLE];
if (setup === undefined) await main();
else await runPath(JSON.parse(setup) as PathSetup);
