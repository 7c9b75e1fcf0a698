/**
 * Golden runs: the full trace of every shipped scenario and the messages of a
 * scripted live-console session, as stable text (one JSON object per line,
 * keys sorted, so the text depends only on what happened, not on the order in
 * which code happens to build an object).
 *
 * The engine may be reshaped freely as long as these texts stay the same;
 * `npm run golden:update` rewrites them when a change of behaviour is meant.
 */
import { readFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { loadBench, type LoadedBench } from "../../engine";
import type { TraceEvent } from "../../engine";
import { parseScenario } from "../../engine";
import { runScenario } from "../../engine";
import { parseSuite } from "../../engine";
import { LiveSession as SimHost } from "../../engine";
import type { SimCommand, SimMessage } from "../../engine";
import { trainingRoomBench } from "../harness/training-room-bench";

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "../..");
export const GOLDEN_DIR = resolve(ROOT, "test/golden");

/** One golden file: its name under test/golden/ and the text it must hold. */
export interface GoldenText {
  readonly file: string;
  readonly text: string;
}

/** JSON with object keys sorted at every level; undefined fields are left out, as JSON.stringify does. */
export function stableJson(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) => {
    if (v === null || typeof v !== "object" || Array.isArray(v)) return v;
    const sorted: Record<string, unknown> = {};
    for (const key of Object.keys(v).sort()) sorted[key] = (v as Record<string, unknown>)[key];
    return sorted;
  });
}

const lines = (values: readonly unknown[]): string => values.map(stableJson).join("\n") + "\n";

const json = (path: string): unknown => JSON.parse(readFileSync(path, "utf8"));

/** The loaders a shipped-scenario list needs: today's engine, or an earlier one a benchmark compares with. */
export type ScenarioLoaders = Pick<
  typeof import("../../engine"),
  "parseSuite" | "parseScenario" | "loadBench"
>;

/**
 * Every scenario of the shipped demo suite under `contentRoot` with its bench
 * loaded once, in suite order, by the given engine's loaders.
 */
export function loadShippedScenarios(
  engine: ScenarioLoaders = { parseSuite, parseScenario, loadBench },
  contentRoot: string = ROOT,
) {
  const suitePath = resolve(contentRoot, "scenarios/demo.suite.json");
  const suite = engine.parseSuite(json(suitePath));
  if (!suite.ok) throw new Error(suite.error.message);
  const benches = new Map<string, LoadedBench>();
  return suite.value.scenarios.map((relative) => {
    const file = resolve(dirname(suitePath), relative);
    const parsed = engine.parseScenario(json(file));
    if (!parsed.ok) throw new Error(`${relative}: ${parsed.error.message}`);
    const benchPath = resolve(dirname(file), parsed.value.bench.path!);
    let bench = benches.get(benchPath);
    if (bench === undefined) {
      const loaded = engine.loadBench(json(benchPath));
      if (!loaded.ok) throw new Error(`${benchPath}: ${loaded.error.map((e) => e.message)}`);
      bench = loaded.value;
      benches.set(benchPath, bench);
    }
    return { relative, scenario: parsed.value, bench };
  });
}

/** Every scenario of the shipped demo suite with its loaded bench, in suite order. */
export const shippedScenarios = () => loadShippedScenarios();

/** The golden text of one scenario: its verdicts (wall time left out) on the first line, then every trace event. */
function scenarioGolden(
  relative: string,
  run: () => ReturnType<typeof runScenario>,
  traceOf: () => readonly TraceEvent[],
): GoldenText {
  const result = run();
  // Wall time is the one field that changes from run to run.
  const { steps, ...rest } = result;
  delete (rest as { wallMs?: number }).wallMs;
  const verdict = {
    ...rest,
    steps: steps.map(({ trace, ...step }) => ({ ...step, traceEvents: trace.length })),
  };
  const file = `scenario-${relative.replace(/\.scenario\.json$/, "").replaceAll("/", "-")}.jsonl`;
  return { file, text: lines([verdict, ...traceOf()]) };
}

/** Golden texts of every shipped scenario. */
export function scenarioGoldens(): GoldenText[] {
  return shippedScenarios().map(({ relative, scenario, bench }) => {
    let trace: readonly TraceEvent[] = [];
    return scenarioGolden(
      relative,
      () => runScenario(scenario, bench, { onTrace: (events) => (trace = events) }),
      () => trace,
    );
  });
}

/**
 * A scripted console session on the console's test room: every kind of
 * command, good and bad, at 1x, 10x and full speed, with a recording and a
 * scene dry-run. The wall clock moves only between ticks, so the run does not
 * depend on how often the session reads it.
 */
export function liveSessionGolden(): GoldenText {
  let wallMs = 0;
  const messages: SimMessage[] = [];
  const host = new SimHost({
    post: (message) => messages.push(structuredClone(message)),
    now: () => wallMs,
    maxRowsPerBatch: 100,
    backlogCapacity: 250,
  });
  const send = (command: SimCommand | Record<string, unknown>) => host.handle(command);
  const tick = (times = 1, ms = 50) => {
    for (let i = 0; i < times; i++) {
      wallMs += ms;
      host.tick();
    }
  };

  send({ type: "play", speed: 1 }); // refused: nothing loaded yet
  send({ type: "load", bench: trainingRoomBench, seed: 7 });
  tick(2);
  send({ type: "play", speed: 10 });
  tick(20);
  send({ type: "write", groupAddress: "1/0/1", value: true });
  tick(4);
  send({ type: "press", deviceId: "rocker", buttonId: "channel-1" });
  tick(4);
  send({ type: "record", on: true });
  send({ type: "write", groupAddress: "2/0/0", value: true });
  tick(4);
  send({ type: "write", groupAddress: "2/0/2", value: 23.5 });
  tick(10);
  send({ type: "set-input", deviceId: "window", input: "contact", value: true });
  tick(10);
  send({ type: "set-input", deviceId: "window", input: "contact", value: false });
  tick(10);
  send({ type: "read", groupAddress: "2/0/3" });
  tick(4);
  send({ type: "record", on: false });
  send({ type: "set-parameter", deviceId: "gateway", key: "setpointMaxC", value: 26 });
  tick(20);
  send({ type: "set-parameter", deviceId: "gateway", key: "setpointMaxC", value: "hot" }); // refused
  send({ type: "inject-fault", target: "light", faultId: "bus.busy" });
  send({ type: "write", groupAddress: "1/0/1", value: false });
  tick(10);
  send({ type: "clear-fault", target: "light", faultId: "bus.busy" });
  send({ type: "inject-fault", target: "unit-link", faultId: "link.broken" });
  tick(40);
  send({ type: "clear-fault", target: "unit-link", faultId: "link.broken" });
  send({ type: "inject-fault", target: "unit-link", faultId: "bus.busy" }); // refused
  send({ type: "write", groupAddress: "7/7/7", value: true }); // refused: not on the bench
  send({ type: "write", groupAddress: "2/0/2", value: "warm" }); // refused by the DPT
  send({ type: "press", deviceId: "rocker", buttonId: "nope" }); // refused
  send({ type: "teleport" }); // refused: not a command
  tick(4);
  send({ type: "scene-dry-run", groupAddress: "2/0/8", scene: 3, settleUs: 5_000_000 });
  tick(2);
  send({ type: "pause" });
  send({ type: "step" });
  send({ type: "step" });
  tick(2);
  send({ type: "flood", groupAddress: "1/0/1", count: 300, value: true });
  send({ type: "jump", durationUs: 60_000_000 }); // more rows than the backlog keeps: some are dropped
  tick(2);
  send({ type: "flood", groupAddress: "1/0/1", count: 300, value: true });
  send({ type: "play", speed: "max" });
  tick(3);
  send({ type: "play", speed: 100 });
  tick(4);
  send({ type: "reset" });
  tick(3);
  return { file: "live-session.jsonl", text: lines(messages) };
}

/** Every golden text, scenarios first. */
export function allGoldens(): GoldenText[] {
  return [...scenarioGoldens(), liveSessionGolden()];
}
