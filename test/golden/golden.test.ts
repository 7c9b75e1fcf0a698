import { existsSync, readFileSync, readdirSync } from "node:fs";
import { resolve } from "node:path";
import { describe, expect, it } from "vitest";
import { GOLDEN_DIR, liveSessionGolden, scenarioGoldens, type GoldenText } from "./golden-runs";

/**
 * Golden traces: the engine must keep producing, event for event, the traces
 * recorded in test/golden/. A difference is a change of behaviour; when it is
 * meant, `npm run golden:update` rewrites the files and the diff is reviewed.
 */
function compare({ file, text }: GoldenText): void {
  const path = resolve(GOLDEN_DIR, file);
  expect(existsSync(path), `${file} is missing: run npm run golden:update`).toBe(true);
  const golden = readFileSync(path, "utf8").split("\n");
  const actual = text.split("\n");
  // Line by line, so a failure names the first event that differs instead of printing megabytes.
  const first = golden.findIndex((line, i) => line !== actual[i]);
  if (first >= 0 || golden.length !== actual.length) {
    const at = first >= 0 ? first : Math.min(golden.length, actual.length);
    expect(
      { line: at + 1, actual: actual[at] },
      `${file} differs from its golden trace at line ${at + 1}`,
    ).toEqual({ line: at + 1, actual: golden[at] });
  }
}

describe("golden traces", () => {
  const scenarios = scenarioGoldens();

  it("covers every shipped scenario and nothing else", () => {
    const files = readdirSync(GOLDEN_DIR).filter((f) => f.startsWith("scenario-"));
    expect(files.sort()).toEqual(scenarios.map((g) => g.file).sort());
  });

  for (const golden of scenarios) it(golden.file, () => compare(golden));

  it("live-session.jsonl", () => compare(liveSessionGolden()));
});
