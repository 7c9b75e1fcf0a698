/*
 * What the bench editor computes before its first render, for the 4-room demo
 * project, a generated 300-device / 1,000-address bench and the generated
 * 1,000-device building (12 lines in 3 areas with couplers: line regions,
 * coupler badges and the topology panel's figures), side by side with the
 * ratio to the demo. Target for the building: under 1 s. Run: npm run bench:canvas
 *
 * Stages: parse the stored document, run the bench checks, work out the
 * topology (loadBench + benchTopology, for the panel and the regions' loads), lay the bench out
 * with elkjs (layered, bars nested by main/middle group; async, the bundled
 * build the browser runs), build the canvas graph (cards, bus-bars, links) and
 * the address table rows. Each figure is the median of several rounds after a
 * warm-up, on this machine's wall clock; the layout's first (cold) run is
 * printed too, since that is what a visitor waits for. The browser's own first render of the large bench is measured by
 * test/e2e/bench-editor.test.ts, which prints it. A benchmark, not a threshold.
 */
import { readFileSync } from "node:fs";
import { performance } from "node:perf_hooks";
import { fileURLToPath } from "node:url";
import { benchSchema, benchTopology, loadBench, type Bench } from "../../engine";
import { checkBench } from "../../engine";
import { addressRows } from "../../components/bench-editor/address-table";
import ELK from "elkjs/lib/elk.bundled.js";
import { benchGraph } from "../../components/canvas/bench-graph";
import {
  DIRECT_LAYOUT_NODES,
  layoutBench,
  type BenchLayout,
} from "../../components/canvas/bench-layout";
import { generateBuilding } from "./building-generator";
import { largeBench } from "./large-bench";

const ROUNDS = 7;

function median(values: number[]): number {
  const sorted = values.slice().sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)]!;
}

function time(run: () => unknown): number {
  run(); // warm-up
  const samples: number[] = [];
  for (let i = 0; i < ROUNDS; i++) {
    const start = performance.now();
    run();
    samples.push(performance.now() - start);
  }
  return median(samples);
}

const elk = new ELK();

async function timeAsync(run: () => Promise<unknown>): Promise<{ cold: number; median: number }> {
  let start = performance.now();
  await run();
  const cold = performance.now() - start;
  const samples: number[] = [];
  for (let i = 0; i < ROUNDS; i++) {
    start = performance.now();
    await run();
    samples.push(performance.now() - start);
  }
  return { cold, median: median(samples) };
}

async function stages(document: unknown) {
  let bench: Bench = benchSchema.parse(document);
  const parse = time(() => (bench = benchSchema.parse(document)));
  let findings = checkBench(bench);
  const checks = time(() => (findings = checkBench(bench)));
  const topology = time(() => {
    const loaded = loadBench(bench);
    if (!loaded.ok) throw new Error(`${bench.name} does not load`);
    return benchTopology(loaded.value);
  });
  let layout: BenchLayout = await layoutBench(bench, elk);
  const elkTimes = await timeAsync(async () => (layout = await layoutBench(bench, elk)));
  const graph = time(() => benchGraph(bench, { findings, layout }));
  const table = time(() => addressRows(bench, findings));
  const { nodes, edges } = benchGraph(bench, { findings, layout });
  return {
    bench,
    parse,
    checks,
    topology,
    layout: elkTimes.median,
    "layout, cold": elkTimes.cold,
    graph,
    table,
    total: parse + checks + topology + elkTimes.median + graph + table,
    "total, cold layout": parse + checks + topology + elkTimes.cold + graph + table,
    nodes: nodes.length,
    edges: edges.length,
  };
}

const demoPath = fileURLToPath(
  new URL("../../scenarios/benches/quayside-dental-level-2.bench.json", import.meta.url),
);
// The first layout ever pays for elkjs's start-up (its GWT-compiled code warming up), so the
// cold figure comes from a fresh instance on the small training bench, before anything else.
const trainingPath = fileURLToPath(
  new URL("../../scenarios/benches/fernhill-training-centre.bench.json", import.meta.url),
);
const training = benchSchema.parse(JSON.parse(readFileSync(trainingPath, "utf8")));
let coldStart = performance.now();
await layoutBench(training, new ELK());
const firstLayout = performance.now() - coldStart;
coldStart = performance.now();
await layoutBench(benchSchema.parse(largeBench(100)), new ELK());
const largeFirst = performance.now() - coldStart;

const demo = await stages(JSON.parse(readFileSync(demoPath, "utf8")));
const large = await stages(largeBench(100));
const building = await stages(generateBuilding({ devices: 1000 }));

const fmt = (ms: number) => `${ms.toFixed(2).padStart(9)} ms`;
const ratio = (a: number, b: number) => `${(b / a).toFixed(1).padStart(7)}x`;
console.log(`bench:canvas — editor work before first render (median of ${ROUNDS})`);
console.log(
  `${"".padEnd(22)}${"4-room demo".padStart(14)}${"300 dev / 1000 GA".padStart(20)}${"ratio".padStart(9)}${"1000-dev building".padStart(20)}${"ratio".padStart(9)}`,
);
const size = (s: typeof demo) =>
  `${s.bench.devices.length} dev ${s.bench.groupAddresses.length} GA`;
console.log(
  `${"size".padEnd(22)}${size(demo).padStart(14)}${size(large).padStart(20)}${"".padStart(9)}${size(building).padStart(20)}`,
);
console.log(
  `${"lines".padEnd(22)}${String(demo.bench.lines.length).padStart(14)}${String(large.bench.lines.length).padStart(20)}${"".padStart(9)}${String(building.bench.lines.length).padStart(20)}`,
);
console.log(
  `${"nodes / edges".padEnd(22)}${`${demo.nodes} / ${demo.edges}`.padStart(14)}${`${large.nodes} / ${large.edges}`.padStart(20)}${"".padStart(9)}${`${building.nodes} / ${building.edges}`.padStart(20)}`,
);
for (const key of [
  "parse",
  "checks",
  "topology",
  "layout",
  "layout, cold",
  "graph",
  "table",
  "total",
  "total, cold layout",
] as const) {
  console.log(
    `${key.padEnd(22)}${fmt(demo[key]).padStart(14)}${fmt(large[key]).padStart(20)}${ratio(demo[key], large[key])}${fmt(building[key]).padStart(20)}${ratio(demo[key], building[key])}`,
  );
}
console.log(
  `layout: elkjs for a bench of one line (the demo); benches with several lines (the 300-device bench, the building) are drawn as a tree of line regions without elkjs, as is any bench over ${DIRECT_LAYOUT_NODES} cards and bars (bench-layout.ts directLayout)`,
);
console.log(
  `1000-device building, editor work before first render: ${building.total.toFixed(0)} ms warm, ${building["total, cold layout"].toFixed(0)} ms with its first layout (target under 1000 ms)`,
);
console.log(
  `elk layout, first run in a fresh process: 13-device training bench ${fmt(firstLayout)}; then 300 dev / 1000 GA (direct layout) ${fmt(largeFirst)}`,
);
