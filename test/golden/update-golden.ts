/**
 * Rewrites the golden files under test/golden/ on purpose: `npm run golden:update`.
 * Run it only when a change of behaviour is meant, and review the diff.
 */
import { readdirSync, rmSync, writeFileSync } from "node:fs";
import { resolve } from "node:path";
import { GOLDEN_DIR, allGoldens } from "./golden-runs";

const goldens = allGoldens();
const keep = new Set(goldens.map((g) => g.file));
for (const file of readdirSync(GOLDEN_DIR))
  if (file.endsWith(".jsonl") && !keep.has(file)) rmSync(resolve(GOLDEN_DIR, file));
for (const { file, text } of goldens) writeFileSync(resolve(GOLDEN_DIR, file), text);
console.log(`wrote ${goldens.length} golden files to ${GOLDEN_DIR}`);
