/*
 * What the bench editor computes before its first render, for the 4-room demo
 * project and a generated 300-device / 1,000-address bench, side by side with
 * the ratio. Run: npm run bench:canvas
 *
 * Stages: parse the stored document, run the bench checks, build the canvas
 * graph (cards, bus-bars, links, auto layout) and the address table rows. Each
 * figure is the median of several rounds after a warm-up, on this machine's
 * wall clock. The browser's own first render of the large bench is measured by
 * test/e2e/bench-editor.test.ts, which prints it. A benchmark, not a threshold.
 */
import { readFileSync } from "node:fs";
import { performance } from "node:perf_hooks";
import { fileURLToPath } from "node:url";
import { benchSchema, type Bench } from "../../engine";
import { checkBench } from "../../engine";
import { addressRows } from "../../components/bench-editor/address-table";
import { benchGraph } from "../../components/canvas/bench-graph";
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

function stages(document: unknown) {
  let bench: Bench = benchSchema.parse(document);
  const parse = time(() => (bench = benchSchema.parse(document)));
  let findings = checkBench(bench);
  const checks = time(() => (findings = checkBench(bench)));
  const graph = time(() => benchGraph(bench, { findings }));
  const table = time(() => addressRows(bench, findings));
  const { nodes, edges } = benchGraph(bench, { findings });
  return {
    bench,
    parse,
    checks,
    graph,
    table,
    total: parse + checks + graph + table,
    nodes: nodes.length,
    edges: edges.length,
  };
}

const demoPath = fileURLToPath(
  new URL("../../scenarios/benches/quayside-dental-level-2.bench.json", import.meta.url),
);
const demo = stages(JSON.parse(readFileSync(demoPath, "utf8")));
const large = stages(largeBench(100));

const fmt = (ms: number) => `${ms.toFixed(2).padStart(9)} ms`;
const ratio = (a: number, b: number) => `${(b / a).toFixed(1).padStart(7)}x`;
console.log(`bench:canvas — editor work before first render (median of ${ROUNDS})`);
console.log(
  `${"".padEnd(22)}${"4-room demo".padStart(14)}${"300 dev / 1000 GA".padStart(20)}${"ratio".padStart(9)}`,
);
console.log(
  `${"size".padEnd(22)}${`${demo.bench.devices.length} dev ${demo.bench.groupAddresses.length} GA`.padStart(14)}${`${large.bench.devices.length} dev ${large.bench.groupAddresses.length} GA`.padStart(20)}`,
);
console.log(
  `${"nodes / edges".padEnd(22)}${`${demo.nodes} / ${demo.edges}`.padStart(14)}${`${large.nodes} / ${large.edges}`.padStart(20)}`,
);
for (const key of ["parse", "checks", "graph", "table", "total"] as const) {
  console.log(
    `${key.padEnd(22)}${fmt(demo[key]).padStart(14)}${fmt(large[key]).padStart(20)}${ratio(demo[key], large[key])}`,
  );
}
