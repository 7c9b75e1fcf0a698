import { err, ok, type Result } from "../core/result";
import type { VirtualTimePrecision } from "../core/virtual-time";

/** What `npm run scenarios -- ...` was asked to do. */
export interface CliOptions {
  /** Scenario files and suite files, in the order given. */
  readonly files: readonly string[];
  /** Overrides every scenario's own seed. */
  readonly seed?: number;
  /** Keeps only scenarios whose name or file path contains this text (case-insensitive). */
  readonly filter?: string;
  /** Runs only this shard: scenario number k (from 0, in run order) goes to shard (k mod count) + 1. */
  readonly shard?: { readonly index: number; readonly count: number };
  /** Writes JUnit XML to this path. */
  readonly junit?: string;
  /** Wall-clock budget per scenario, milliseconds. */
  readonly budgetMs: number;
  /** Prints only the summary and failures, no per-scenario progress. */
  readonly quiet: boolean;
  /** Virtual times in the trace printout: h:mm:ss.mmm, or to the microsecond with --us. */
  readonly timePrecision: VirtualTimePrecision;
  readonly help: boolean;
}

export interface CliArgsError {
  readonly kind: "cli.invalid-argument";
  readonly argument: string;
  readonly message: string;
}

export const DEFAULT_BUDGET_MS = 10_000;

export const CLI_USAGE = `Usage: npm run scenarios -- [options] <file | folder | pattern>...

Runs Benchline scenarios headless and exits non-zero when any scenario fails.
Each argument is a scenario or suite file, a folder (every *.json scenario or
suite directly in it), or a pattern such as "scenarios/**/*.scenario.json"
(* ? ** [abc] {a,b}; expanded here, so quote it to keep the shell out).
Virtual times print as h:mm:ss.mmm since the simulation started.

Options:
  --seed <n>        run every scenario with this seed instead of its own
  --filter <text>   only scenarios whose name or file contains <text>
  --shard <i>/<n>   only shard i of n (1-based), to spread a suite over machines
  --junit <path>    write a JUnit XML report to <path>
  --budget <ms>     wall-clock budget per scenario (default ${DEFAULT_BUDGET_MS})
  --quiet           print only failures and the summary
  --us              print virtual times to the microsecond (h:mm:ss.mmmmmm)
  --help            show this text`;

const fail = (argument: string, message: string) =>
  err<CliArgsError>({ kind: "cli.invalid-argument", argument, message: `${argument}: ${message}` });

/** Parses the CLI arguments (without the node and script paths). Accepts `--seed 5` and `--seed=5`. */
export function parseCliArgs(argv: readonly string[]): Result<CliOptions, CliArgsError> {
  const files: string[] = [];
  let seed: number | undefined;
  let filter: string | undefined;
  let shard: CliOptions["shard"];
  let junit: string | undefined;
  let budgetMs = DEFAULT_BUDGET_MS;
  let quiet = false;
  let timePrecision: VirtualTimePrecision = "ms";
  let help = false;
  let onlyFiles = false;

  for (let i = 0; i < argv.length; i += 1) {
    const argument = argv[i] ?? "";
    if (onlyFiles || !argument.startsWith("--")) {
      files.push(argument);
      continue;
    }
    if (argument === "--") {
      onlyFiles = true;
      continue;
    }
    const equals = argument.indexOf("=");
    const name = equals >= 0 ? argument.slice(0, equals) : argument;
    const takesValue = ["--seed", "--filter", "--shard", "--junit", "--budget"].includes(name);
    let value: string | undefined;
    if (takesValue) {
      if (equals >= 0) value = argument.slice(equals + 1);
      else {
        value = argv[i + 1];
        i += 1;
      }
      if (value === undefined || value.length === 0) return fail(name, "needs a value");
    } else if (equals >= 0) {
      return fail(name, "takes no value");
    }
    switch (name) {
      case "--seed": {
        if (!/^\d+$/.test(value!) || !Number.isSafeInteger(Number(value))) {
          return fail(name, `expected a non-negative integer, got ${JSON.stringify(value)}`);
        }
        seed = Number(value);
        break;
      }
      case "--filter":
        filter = value!;
        break;
      case "--shard": {
        const match = /^(\d+)\/(\d+)$/.exec(value!);
        const index = Number(match?.[1]);
        const count = Number(match?.[2]);
        if (!match || count < 1 || index < 1 || index > count) {
          return fail(
            name,
            `expected i/n with 1 <= i <= n, like "2/4", got ${JSON.stringify(value)}`,
          );
        }
        shard = { index, count };
        break;
      }
      case "--junit":
        junit = value!;
        break;
      case "--budget": {
        const ms = Number(value);
        if (!/^\d+$/.test(value!) || ms < 1)
          return fail(
            name,
            `expected a positive number of milliseconds, got ${JSON.stringify(value)}`,
          );
        budgetMs = ms;
        break;
      }
      case "--quiet":
        quiet = true;
        break;
      case "--us":
        timePrecision = "us";
        break;
      case "--help":
        help = true;
        break;
      default:
        return fail(name, "unknown option (see --help)");
    }
  }
  if (files.length === 0 && !help) return fail("files", "give at least one scenario or suite file");
  return ok({ files, seed, filter, shard, junit, budgetMs, quiet, timePrecision, help });
}

/** Whether the scenario at position `position` (from 0, in run order) belongs to the shard. */
export function inShard(position: number, shard: CliOptions["shard"]): boolean {
  if (!shard) return true;
  return position % shard.count === shard.index - 1;
}
