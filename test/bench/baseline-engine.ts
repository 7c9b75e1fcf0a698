/**
 * The engine as it stood at an earlier commit, for benchmarks that print the
 * old figure beside the new one from the same run. `git archive` extracts that
 * commit's engine/ under node_modules/.cache (so it resolves the same
 * dependencies) and it is imported like the current one.
 */
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, writeFileSync } from "node:fs";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";

/** Extracts `engine/` at `commit` (once per commit) and imports its index; null when git cannot provide it. */
export async function importBaselineEngine(
  root: string,
  commit: string,
): Promise<typeof import("../../engine") | null> {
  const dir = resolve(root, "node_modules/.cache/benchline-baseline", commit);
  const index = resolve(dir, "engine/index.ts");
  if (!existsSync(index)) {
    try {
      mkdirSync(dir, { recursive: true });
      const archive = execFileSync("git", ["archive", "--format=tar", commit, "engine"], {
        cwd: root,
        maxBuffer: 256 * 1024 * 1024,
      });
      execFileSync("tar", ["-x", "-C", dir], { input: archive });
    } catch {
      return null;
    }
  }
  // Inside node_modules no package.json says "module"; without one the copy would load as CommonJS, slower than the real engine.
  writeFileSync(resolve(dir, "package.json"), '{ "type": "module" }\n');
  return (await import(pathToFileURL(index).href)) as typeof import("../../engine");
}
