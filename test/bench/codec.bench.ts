/*
 * Encode+decode throughput of Benchline's DPT codecs against the `knx` package's codec
 * for the same values, in one run, with the ratio. Run: npm run bench:codec
 *
 * One "pair" is encode(value) followed by decode(payload). Each figure is the median
 * of several timed rounds after a warm-up. Rounds are timed in CPU time of this
 * process (process.cpuUsage), because the machine is shared and wall-clock figures
 * swing with other people's load; the wall-clock rate of the same rounds is printed
 * too, for comparison.
 */
import { createRequire } from "node:module";
import { loadavg } from "node:os";
import { performance } from "node:perf_hooks";
import { getDpt, type DptCodec } from "../../engine";

interface KnxDptLib {
  resolve(id: string): unknown;
  populateAPDU(value: unknown, apdu: { data?: Buffer }, id: string): void;
  fromBuffer(buf: Buffer, dpt: unknown): unknown;
}

const require = createRequire(import.meta.url);
const logger = createRequire(require.resolve("knx/package.json"))("log-driver").logger as Record<
  string,
  unknown
>;
for (const level of ["error", "warn", "info", "debug", "trace"]) logger[level] = () => undefined;
const knx = require("knx/src/dptlib") as KnxDptLib;

// Deterministic inputs (a tiny LCG), so every run measures the same values.
let seed = 0x2545f491;
const next = () => (seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0) / 2 ** 32;
const VALUES = 4096;
const inputs: Record<string, unknown[]> = {
  // Room and outdoor temperatures with 0.01 resolution, plus some wide values that need large exponents.
  "9.001": Array.from({ length: VALUES }, (_, i) =>
    i % 8 === 0
      ? Math.round((next() * 600000 - 200) * 100) / 100
      : Math.round((next() * 90 - 30) * 100) / 100,
  ),
  "5.001": Array.from({ length: VALUES }, () => Math.round(next() * 1000) / 10),
  "1.001": Array.from({ length: VALUES }, () => next() < 0.5),
};

let sink = 0; // consumed after each round so the work cannot be optimised away

interface Timing {
  readonly cpuMs: number;
  readonly wallMs: number;
}

function startTimer(): () => Timing {
  const cpu = process.cpuUsage();
  const wall = performance.now();
  return () => {
    const used = process.cpuUsage(cpu);
    return { cpuMs: (used.user + used.system) / 1000, wallMs: performance.now() - wall };
  };
}

function ourRound(codec: DptCodec<unknown>, values: unknown[], repeats: number): Timing {
  const stop = startTimer();
  for (let r = 0; r < repeats; r++) {
    for (let i = 0; i < values.length; i++) {
      const encoded = codec.encode(values[i]);
      if (!encoded.ok) throw new Error(encoded.error.message);
      const decoded = codec.decode(encoded.value);
      if (!decoded.ok) throw new Error(decoded.error.message);
      if (decoded.value === true || (typeof decoded.value === "number" && decoded.value > 50))
        sink++;
    }
  }
  return stop();
}

function knxRound(id: string, values: unknown[], repeats: number): Timing {
  const dptId = `DPT${id}`;
  const dpt = knx.resolve(dptId);
  const apdu: { data?: Buffer } = {};
  const stop = startTimer();
  for (let r = 0; r < repeats; r++) {
    for (let i = 0; i < values.length; i++) {
      knx.populateAPDU(values[i], apdu, dptId);
      const decoded = knx.fromBuffer(apdu.data as Buffer, dpt);
      if (decoded === true || (typeof decoded === "number" && decoded > 50)) sink++;
    }
  }
  return stop();
}

/** Median pairs per CPU second (and per wall second) over `rounds` rounds of about `targetMs` each. */
function measure(
  round: (repeats: number) => Timing,
  targetMs: number,
  rounds = 7,
): { cpu: number; wall: number } {
  let repeats = 1;
  // Warm up and size a round so it lasts about targetMs of CPU time.
  for (let t = round(repeats).cpuMs; t < targetMs / 4; t = round(repeats).cpuMs) repeats *= 2;
  const probe = round(repeats).cpuMs;
  repeats = Math.max(1, Math.round((repeats * targetMs) / Math.max(probe, 0.001)));
  const cpu: number[] = [];
  const wall: number[] = [];
  for (let i = 0; i < rounds; i++) {
    const t = round(repeats);
    cpu.push((repeats * VALUES) / (t.cpuMs / 1000));
    wall.push((repeats * VALUES) / (t.wallMs / 1000));
  }
  const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)] as number;
  return { cpu: median(cpu), wall: median(wall) };
}

const fmt = (n: number) =>
  n >= 1e6 ? `${(n / 1e6).toFixed(2)} M/s` : `${(n / 1e3).toFixed(1)} k/s`;

console.log(
  `DPT codec encode+decode pairs per second, median of 7 rounds, ${VALUES} values per pass, node ${process.version}`,
);
console.log(
  `per CPU second (wall-clock rate of the same rounds in brackets); 1-minute load average ${loadavg()[0]?.toFixed(1)}`,
);
console.log("DPT      Benchline                   knx package               ratio (CPU)");
for (const id of ["9.001", "5.001", "1.001"]) {
  const codec = getDpt(id);
  if (codec === undefined) throw new Error(`unknown DPT ${id}`);
  const values = inputs[id] as unknown[];
  const ours = measure((n) => ourRound(codec, values, n), 300);
  const theirs = measure((n) => knxRound(id, values, n), 300);
  const cell = (m: { cpu: number; wall: number }) => `${fmt(m.cpu)} (${fmt(m.wall)})`.padEnd(27);
  console.log(
    `${id.padEnd(8)} ${cell(ours)} ${cell(theirs)} ${(ours.cpu / theirs.cpu).toFixed(0)}x`,
  );
}
if (sink < 0) console.log(sink);
