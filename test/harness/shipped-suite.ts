import { readFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { fileURLToPath } from "node:url";

const root = resolve(dirname(fileURLToPath(import.meta.url)), "../..");

/**
 * The scenario files the shipped demo suite lists, relative to scenarios/
 * ("fernhill/lights-toggle.scenario.json"), for tests whose counts follow the
 * suite as scenarios are added.
 */
export function shippedSuiteScenarioFiles(): string[] {
  const suite = JSON.parse(readFileSync(resolve(root, "scenarios/demo.suite.json"), "utf8")) as {
    scenarios: string[];
  };
  return suite.scenarios;
}
