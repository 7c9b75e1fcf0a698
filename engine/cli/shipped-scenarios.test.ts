import { readdirSync, readFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { benchSchema, loadBench } from "../bench";
import { checkBench } from "../checks/check-bench";
import { parseScenario } from "../scenario/parse-scenario";
import { runSuite, type SuiteEntry } from "../scenario/run-suite";
import { parseSuite } from "../scenario/suite-schema";

const scenariosDir = resolve(dirname(fileURLToPath(import.meta.url)), "../../scenarios");
const json = (path: string): unknown => JSON.parse(readFileSync(path, "utf8"));
const filesIn = (folder: string, suffix: string) =>
  readdirSync(join(scenariosDir, folder))
    .filter((f) => f.endsWith(suffix))
    .map((f) => join(scenariosDir, folder, f));

const benchFiles = filesIn("benches", ".bench.json");
const scenarioFiles = ["fernhill", "quayside", "wrenhallow"].flatMap((folder) =>
  filesIn(folder, ".scenario.json"),
);

describe("shipped demo content", () => {
  it("ships the three demo benches and at least 12 scenarios", () => {
    expect(benchFiles.map((f) => (json(f) as { name: string }).name).sort()).toEqual([
      "Fernhill Training Centre",
      "Quayside Dental, level 2",
      "Wrenhallow Hotel",
    ]);
    expect(scenarioFiles.length).toBeGreaterThanOrEqual(12);
  });

  it.each(benchFiles)("%s loads and has no check errors", (file) => {
    const doc = json(file);
    const loaded = loadBench(doc);
    expect(loaded.ok ? [] : loaded.error).toEqual([]);
    expect(checkBench(benchSchema.parse(doc)).filter((f) => f.severity === "error")).toEqual([]);
  });

  it.each(scenarioFiles)("%s is accepted by the scenario schema", (file) => {
    const parsed = parseScenario(json(file));
    expect(parsed.ok ? "" : parsed.error.message).toBe("");
  });

  it("the suite lists every shipped scenario, and every one passes except the exercise, which fails as expected", () => {
    const suiteFile = join(scenariosDir, "demo.suite.json");
    const suite = parseSuite(json(suiteFile));
    if (!suite.ok) throw new Error(suite.error.message);
    const listed = suite.value.scenarios.map((path) => resolve(scenariosDir, path));
    expect([...listed].sort()).toEqual([...scenarioFiles].sort());

    const entries: SuiteEntry[] = listed.map((file) => {
      const parsed = parseScenario(json(file));
      if (!parsed.ok) throw new Error(parsed.error.message);
      return {
        source: file,
        scenario: parsed.value,
        bench: json(resolve(dirname(file), parsed.value.bench.path!)) as never,
      };
    });
    const result = runSuite(suite.value.name, entries);
    const outcomes = Object.fromEntries(
      result.scenarios.map((s) => [s.source!.slice(scenariosDir.length + 1), s.outcome]),
    );
    const expected = Object.fromEntries(
      Object.keys(outcomes).map((file) => [
        file,
        file.includes("exercise-") ? "expected-failure" : "passed",
      ]),
    );
    expect(outcomes).toEqual(expected);
    expect(result.ok).toBe(true);
    expect(result.totals.expectedFailures).toBe(1);
  });
});
