/**
 * The engine as it stood at an earlier commit, for benchmarks that print the
 * old figure beside the new one from the same run. `git archive` extracts that
 * commit's engine/ and scenarios/ under node_modules/.cache (so it resolves
 * the same dependencies) and the engine is imported like the current one. The
 * shipped benches and scenarios come from the same commit, since today's may
 * use devices, objects or DPTs the older engine does not know.
 */
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, writeFileSync } from "node:fs";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";

/** An earlier engine and the folder holding its commit's scenarios/. */
export interface BaselineEngine {
  readonly engine: typeof import("../../engine");
  /** The extracted commit's root: its scenarios/ sits here. */
  readonly root: string;
}

/** Extracts `engine/` and `scenarios/` at `commit` (once per commit) and imports the engine; null when git cannot provide it. */
export async function importBaselineEngine(
  root: string,
  commit: string,
): Promise<BaselineEngine | null> {
  const dir = resolve(root, "node_modules/.cache/benchline-baseline", commit);
  const index = resolve(dir, "engine/index.ts");
  if (!existsSync(index) || !existsSync(resolve(dir, "scenarios"))) {
    try {
      mkdirSync(dir, { recursive: true });
      const archive = execFileSync(
        "git",
        ["archive", "--format=tar", commit, "engine", "scenarios"],
        {
          cwd: root,
          maxBuffer: 256 * 1024 * 1024,
        },
      );
      execFileSync("tar", ["-x", "-C", dir], { input: archive });
    } catch {
      return null;
    }
  }
  // Inside node_modules no package.json says "module"; without one the copy would load as CommonJS, slower than the real engine.
  // Written once: several benchmark processes import the same copy, and a rewrite could meet another's read.
  const packageJson = resolve(dir, "package.json");
  if (!existsSync(packageJson)) writeFileSync(packageJson, '{ "type": "module" }\n');
  const engine = (await import(pathToFileURL(index).href)) as typeof import("../../engine");
  return { engine, root: dir };
}
