/**
 * Headless scenario runner: `npm run scenarios -- <scenario.json | suite.json>...`.
 * The only engine code that touches Node: it reads files, resolves benches,
 * passes the wall clock (performance.now) to the runner, prints progress and a
 * summary, writes JUnit XML and sets the exit code (0 all ok, 1 a scenario
 * failed or errored, 2 the command line or a file could not be used).
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import { performance } from "node:perf_hooks";
import { pathToFileURL } from "node:url";
import { loadBench, type LoadedBench } from "../bench";
import { describeTraceEvent } from "../scenario/describe-trace-event";
import { junitXml } from "../scenario/junit-xml";
import { parseScenarioText } from "../scenario/parse-scenario";
import { runSuite, type SuiteEntry } from "../scenario/run-suite";
import type { ScenarioResult, SuiteResult } from "../scenario/scenario-result";
import type { BenchReference } from "../scenario/scenario-schema";
import { parseSuite } from "../scenario/suite-schema";
import { formatVirtualTime, type VirtualTimeFormat } from "../core/virtual-time";
import { CLI_USAGE, inShard, parseCliArgs } from "./cli-args";
import { expandInputs } from "./expand-inputs";

export interface CliIo {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
  readonly cwd: string;
  /** Wall clock in ms; performance.now by default. */
  readonly now?: () => number;
}

const defaultIo: CliIo = {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  cwd: process.cwd(),
};

/** A scenario file to run, or why it cannot be. */
type Planned = { readonly suite: string; readonly entry: SuiteEntry; readonly name: string };

class FileProblem extends Error {}

function readJson(path: string): unknown {
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch {
    throw new FileProblem(`${path}: cannot read the file`);
  }
  try {
    return JSON.parse(text);
  } catch (cause) {
    throw new FileProblem(`${path}: not valid JSON (${(cause as Error).message})`);
  }
}

/** Resolves bench references and caches loaded benches, so a suite loads each bench once. */
class BenchResolver {
  private readonly loaded = new Map<string, LoadedBench | string>();
  private byName: Map<string, string> | undefined;

  constructor(private readonly roots: readonly string[]) {}

  resolve(reference: BenchReference, scenarioPath: string): LoadedBench | string {
    let path: string;
    if (reference.path !== undefined) {
      path = resolve(dirname(scenarioPath), reference.path);
    } else {
      const found = this.names().get(reference.name!);
      if (found === undefined)
        return `no bench named "${reference.name}" in ${this.roots.join(", ")} (looked at *.bench.json there and in benches/)`;
      path = found;
    }
    const cached = this.loaded.get(path);
    if (cached !== undefined) return cached;
    let result: LoadedBench | string;
    try {
      const loaded = loadBench(readJson(path));
      result = loaded.ok
        ? loaded.value
        : `${path}: the bench does not load: ${loaded.error.map((e) => e.message).join("; ")}`;
    } catch (cause) {
      if (!(cause instanceof FileProblem)) throw cause;
      result = cause.message;
    }
    this.loaded.set(path, result);
    return result;
  }

  /** Bench files by their `name`, from the scenario folders, their parents and benches/ below them. */
  private names(): Map<string, string> {
    if (this.byName) return this.byName;
    this.byName = new Map();
    const folders = new Set<string>();
    for (const root of this.roots) {
      for (const folder of [root, dirname(root)]) {
        folders.add(folder);
        folders.add(join(folder, "benches"));
      }
    }
    for (const folder of folders) {
      if (!existsSync(folder)) continue;
      for (const file of readdirSync(folder)) {
        if (!file.endsWith(".bench.json")) continue;
        const path = join(folder, file);
        try {
          const doc = readJson(path) as { name?: unknown };
          if (typeof doc.name === "string" && !this.byName.has(doc.name))
            this.byName.set(doc.name, path);
        } catch {
          // An unreadable bench file is reported when a scenario names it by path.
        }
      }
    }
    return this.byName;
  }
}

function planScenario(path: string, suite: string, benches: BenchResolver, cwd: string): Planned {
  const source = relative(cwd, path) || path;
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch {
    return { suite, name: source, entry: { source, error: `${source}: cannot read the file` } };
  }
  const parsed = parseScenarioText(text);
  if (!parsed.ok) {
    return {
      suite,
      name: source,
      entry: {
        source,
        error: `${source}: ${parsed.error.issues.map((i) => `${i.path}: ${i.message}`).join("; ")}`,
      },
    };
  }
  const bench = benches.resolve(parsed.value.bench, path);
  if (typeof bench === "string")
    return {
      suite,
      name: parsed.value.name,
      entry: { source, name: parsed.value.name, error: bench },
    };
  return { suite, name: parsed.value.name, entry: { source, scenario: parsed.value, bench } };
}

const STATUS_WORD: Readonly<Record<ScenarioResult["outcome"], string>> = {
  passed: "PASS ",
  "expected-failure": "XFAIL",
  failed: "FAIL ",
  "unexpected-pass": "XPASS",
  error: "ERROR",
};

function describeResult(
  result: ScenarioResult,
  position: number,
  total: number,
  time: VirtualTimeFormat,
): string {
  const width = String(total).length;
  const lines = [
    `[${String(position).padStart(width)}/${total}] ${STATUS_WORD[result.outcome]} ${result.name}  (${result.source ?? ""}, ${result.wallMs.toFixed(0)} ms)`,
  ];
  if (result.outcome === "expected-failure")
    lines.push("        failed as expected (marked expectedToFail)");
  if (result.outcome === "unexpected-pass")
    lines.push("        marked expectedToFail, but every step passed");
  if (result.message) lines.push(`        ${result.message}`);
  if (result.outcome !== "passed" && result.outcome !== "expected-failure") {
    for (const step of result.steps) {
      if (step.status !== "fail" && step.status !== "error") continue;
      lines.push(
        `        #${step.index} ${step.label} at ${formatVirtualTime(step.startUs, time)}: ${step.status}`,
      );
      if (step.status === "fail")
        lines.push(`            expected ${step.expected}`, `            got      ${step.actual}`);
      if (step.message) lines.push(`            ${step.message}`);
      for (const event of step.trace.slice(-8))
        lines.push(`            | ${describeTraceEvent(event, time)}`);
    }
  }
  return `${lines.join("\n")}\n`;
}

function summary(suites: readonly SuiteResult[], wallMs: number): string {
  const all = suites.flatMap((s) => s.scenarios);
  const count = (outcome: ScenarioResult["outcome"]) =>
    all.filter((r) => r.outcome === outcome).length;
  const parts = [
    `${count("passed")} passed`,
    `${count("expected-failure")} failed as expected`,
    `${count("failed")} failed`,
    `${count("unexpected-pass")} passed unexpectedly`,
    `${count("error")} errors`,
  ];
  const ok = all.every((r) => r.ok);
  return `\n${all.length} scenario(s): ${parts.join(", ")} in ${(wallMs / 1000).toFixed(2)} s — ${ok ? "OK" : "FAILED"}\n`;
}

/** Runs the CLI and returns the exit code; tests call this directly. */
export function main(argv: readonly string[], io: CliIo = defaultIo): number {
  const now = io.now ?? (() => performance.now());
  const started = now();
  const args = parseCliArgs(argv);
  if (!args.ok) {
    io.stderr(`${args.error.message}\n\n${CLI_USAGE}\n`);
    return 2;
  }
  const options = args.value;
  if (options.help) {
    io.stdout(`${CLI_USAGE}\n`);
    return 0;
  }

  const expanded = expandInputs(options.files, io.cwd);
  if (!expanded.ok) {
    io.stderr(`${expanded.error}\n`);
    return 2;
  }
  const files = expanded.value;
  const benches = new BenchResolver(files.map((file) => dirname(file)));
  const planned: Planned[] = [];
  const looseSuite = "scenarios";
  for (const file of files) {
    let document: unknown;
    try {
      document = readJson(file);
    } catch (cause) {
      if (!(cause instanceof FileProblem)) throw cause;
      io.stderr(`${cause.message}\n`);
      return 2;
    }
    const isSuite =
      typeof document === "object" &&
      document !== null &&
      "scenarios" in document &&
      !("steps" in document);
    if (!isSuite) {
      planned.push(planScenario(file, looseSuite, benches, io.cwd));
      continue;
    }
    const suite = parseSuite(document);
    if (!suite.ok) {
      io.stderr(
        `${relative(io.cwd, file)}: ${suite.error.issues.map((i) => `${i.path}: ${i.message}`).join("; ")}\n`,
      );
      return 2;
    }
    for (const path of suite.value.scenarios)
      planned.push(planScenario(resolve(dirname(file), path), suite.value.name, benches, io.cwd));
  }

  const filter = options.filter?.toLowerCase();
  const chosen = planned
    .filter(
      (p) =>
        filter === undefined ||
        p.name.toLowerCase().includes(filter) ||
        p.entry.source.toLowerCase().includes(filter),
    )
    .filter((_, position) => inShard(position, options.shard));
  const shardText = options.shard ? `, shard ${options.shard.index}/${options.shard.count}` : "";
  io.stdout(
    `Running ${chosen.length} of ${planned.length} scenario(s)${filter ? ` matching "${options.filter}"` : ""}${shardText}${options.seed === undefined ? "" : `, seed ${options.seed}`}\n`,
  );

  const suiteNames = [...new Set(chosen.map((p) => p.suite))];
  let position = 0;
  const results = suiteNames.map((name) =>
    runSuite(
      name,
      chosen.filter((p) => p.suite === name).map((p) => p.entry),
      {
        seed: options.seed,
        now,
        budgetMs: options.budgetMs,
        onResult: (result) => {
          position += 1;
          if (!options.quiet || !result.ok)
            io.stdout(
              describeResult(result, position, chosen.length, { precision: options.timePrecision }),
            );
        },
      },
    ),
  );

  io.stdout(summary(results, now() - started));
  if (options.junit !== undefined) {
    const path = resolve(io.cwd, options.junit);
    mkdirSync(dirname(path), { recursive: true });
    writeFileSync(path, junitXml(results));
    io.stdout(`JUnit report: ${relative(io.cwd, path) || path}\n`);
  }
  return results.every((suite) => suite.ok) ? 0 : 1;
}

if (
  process.argv[1] !== undefined &&
  import.meta.url === pathToFileURL(resolve(process.argv[1])).href
) {
  process.exitCode = main(process.argv.slice(2));
}
