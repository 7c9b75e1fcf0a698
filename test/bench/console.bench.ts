/*
 * How many telegrams per second the live console's page side absorbs with the
 * log open: worker batches are cloned (as postMessage does), validated with the
 * protocol schema, folded into the zustand store (log ring, device snapshots,
 * chart samples) and run through an open log filter. Printed beside the rate
 * the simulation host produces them at full speed, with the ratio, so it is
 * plain which side would limit a flooded bus. Run: npm run bench:console
 *
 * Figures are medians of several rounds in CPU time of this process (the
 * machine is shared); wall-clock rates are printed too. Then the live console
 * in Chromium (console-browser.ts): long tasks and press-to-screen times at
 * 10x and Max. BENCH_CONSOLE_BROWSER=0 skips the browser part.
 */
import { loadavg } from "node:os";
import { performance } from "node:perf_hooks";
import { LiveSession as SimHost } from "../../engine";
import { checkSimMessage, type SimMessage } from "../../engine";
import { createSimStore } from "../../components/sim/sim-store";
import { trainingRoomBench } from "../harness/training-room-bench";
import { emptyLogFilter, FilteredLog } from "../../components/console/log-filter";
import { measureConsoleInBrowser } from "./console-browser";

const TELEGRAMS = 20_000;
const ROUNDS = 5;

interface Timing {
  readonly cpuMs: number;
  readonly wallMs: number;
}

function timed(run: () => void): Timing {
  const cpu = process.cpuUsage();
  const wall = performance.now();
  run();
  const used = process.cpuUsage(cpu);
  return { cpuMs: (used.user + used.system) / 1000, wallMs: performance.now() - wall };
}

const median = (values: number[]) =>
  [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)]!;

/** Runs a flood of TELEGRAMS writes at full speed and returns the batches the host posted. */
function produce(): { batches: SimMessage[]; timing: Timing; telegrams: number } {
  const batches: SimMessage[] = [];
  const host = new SimHost({ post: (m) => batches.push(m), now: () => performance.now() });
  host.handle({ type: "load", bench: trainingRoomBench });
  host.handle({ type: "flood", groupAddress: "1/0/1", count: TELEGRAMS, value: true });
  host.handle({ type: "play", speed: "max" });
  let telegrams = 0;
  const timing = timed(() => {
    for (let tick = 0; tick < 10_000 && telegrams < TELEGRAMS; tick++) {
      const before = batches.length;
      host.tick();
      for (let i = before; i < batches.length; i++) {
        const message = batches[i]!;
        if (message.type === "batch")
          telegrams += message.rows.filter((r) => r.source === "1.1.250").length;
      }
    }
  });
  return { batches, timing, telegrams };
}

/** Feeds the batches to a fresh store through clone + validation, with a filtered log view open. */
function absorb(batches: readonly SimMessage[]): { timing: Timing; rows: number; shown: number } {
  const store = createSimStore();
  const view = new FilteredLog({ ...emptyLogFilter, address: "1/0" });
  let shown = 0;
  const timing = timed(() => {
    for (const message of batches) {
      store.getState().apply(checkSimMessage(structuredClone(message)));
      shown = view.update(store.getState().log);
    }
  });
  return { timing, rows: store.getState().telegramRows, shown };
}

const produced: Timing[] = [];
const absorbed: Timing[] = [];
let rows = 0;
let telegrams = 0;
let batchCount = 0;
for (let round = 0; round < ROUNDS + 1; round++) {
  const run = produce();
  const page = absorb(run.batches);
  if (round === 0) continue; // warm-up
  produced.push(run.timing);
  absorbed.push(page.timing);
  rows = page.rows;
  telegrams = run.telegrams;
  batchCount = run.batches.filter((m) => m.type === "batch").length;
}

const rate = (count: number, ms: number) => Math.round((count / ms) * 1000);
const produceCpu = rate(rows, median(produced.map((t) => t.cpuMs)));
const absorbCpu = rate(rows, median(absorbed.map((t) => t.cpuMs)));
const produceWall = rate(rows, median(produced.map((t) => t.wallMs)));
const absorbWall = rate(rows, median(absorbed.map((t) => t.wallMs)));

console.log(
  `live console throughput: ${telegrams} flooded telegrams (${rows} telegram rows in all), ${batchCount} batches, median of ${ROUNDS} rounds`,
);
console.log(
  `load average ${loadavg()
    .map((l) => l.toFixed(2))
    .join(" ")} (the machine is shared)`,
);
console.log("");
console.log("                                          telegrams/s (CPU)   telegrams/s (wall)");
console.log(
  `worker side: simulate + describe + batch   ${String(produceCpu).padStart(17)}   ${String(produceWall).padStart(18)}`,
);
console.log(
  `page side: clone + check + store + log     ${String(absorbCpu).padStart(17)}   ${String(absorbWall).padStart(18)}`,
);
console.log("");
console.log(
  `page side / worker side: ${(absorbCpu / produceCpu).toFixed(2)}x (CPU), ${(absorbWall / produceWall).toFixed(2)}x (wall)`,
);
console.log(
  `a saturated TP1 line carries about 50 short telegrams/s (knx-reference.md, TP1 timing): the page absorbs ${Math.round(absorbCpu / 50)}x that`,
);

// The same page side in the real browser: long tasks and press-to-screen times (test/bench/console-browser.ts).
if (process.env.BENCH_CONSOLE_BROWSER !== "0") await measureConsoleInBrowser();
