/**
 * KNXnet/IP benchmark: `npm run bench:knxnet`.
 *
 * A tunnelling client on 127.0.0.1 (a minimal one built on Benchline's own frame
 * code, so the timestamps are exact; the `knx` package's client is exercised in
 * app/_lib/knxnet/udp-endpoint.test.ts) connects to an endpoint serving the demo
 * bench, paced at real time (1x).
 *
 * 1. Round trip: from sending a TUNNELLING_REQUEST (L_Data.req, a setpoint to the
 *    gateway, DPT 9.001) to receiving its L_Data.con, and to receiving the
 *    gateway's status telegram as L_Data.ind. Beside each wall-clock figure is the
 *    time the simulated TP1 line itself took for it (virtual µs from the frame's
 *    queueing to its acknowledgement, or to the end of the status frame); the
 *    difference is what the tunnel adds. Target: under 2 ms on loopback.
 * 2. Sustained rate: the client keeps the line saturated (up to 8 frames waiting,
 *    one tunnelling request outstanding at a time as the spec requires) for a few
 *    seconds. The line's rate is compared with the TP1 physical limit:
 *    9600 bit/s / 193 bit times per short telegram with its acknowledgement
 *    (knx-reference.md, TP1 timing; Basic course) = 49.7 telegrams/s.
 *    Target: the line reaches its physical rate.
 */
import dgram from "node:dgram";
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { performance } from "node:perf_hooks";
import { pacedSimulationLine } from "../../app/_lib/knxnet/simulation-line";
import { startKnxNetIpEndpoint } from "../../app/_lib/knxnet/udp-endpoint";
import { getDpt } from "../../engine";
import { encodeCemi, decodeCemi, type DataFrame } from "../../engine";
import {
  decodeKnxNetIpFrame,
  encodeKnxNetIpFrame,
  ROUTE_BACK_HPAI,
  tunnelAddressPool,
  tunnelCri,
  type KnxNetIpFrame,
} from "../../engine";
import { createSimulation } from "../../engine";

const PHYSICAL_RATE = 9600 / 193;
const TARGET_OVERHEAD_MS = 2;
const SAMPLES = 40;
const SATURATE_S = 5;
const WINDOW = 8;

const SETPOINT = 0x1002; // 2/0/2
const SETPOINT_STATUS = 0x1102; // 2/1/2
const LIGHTS = 0x0802; // 1/0/2

const bench = JSON.parse(
  readFileSync(
    new URL("../../scenarios/benches/fernhill-training-centre.bench.json", import.meta.url),
    "utf8",
  ),
) as never;
const sim = createSimulation(bench, { seed: 1, traceCapacity: 50_000 });
const pool = tunnelAddressPool(sim.bench, sim.bench.testToolLine, 2);
if (!pool.ok) throw new Error(pool.error.message);
const TUNNEL_IA = pool.value.tunnelAddresses[0]!;
const paced = pacedSimulationLine(sim);
paced.start();
const endpoint = await startKnxNetIpEndpoint({
  line: paced.line,
  ...pool.value,
  ports: { first: 0, last: 0 },
});

// ---------------------------------------------------------------- a minimal client

type Received = { readonly atMs: number; readonly frame: KnxNetIpFrame };
const socket = dgram.createSocket("udp4");
await new Promise<void>((resolve) => socket.bind(0, "127.0.0.1", () => resolve()));
let waiters: { accept: (r: Received) => boolean; resolve: (r: Received) => void }[] = [];
let channelId = 0;
let onIndication: (
  frame: DataFrame,
  cemiCode: string,
  confirmError: boolean,
  atMs: number,
) => void = () => undefined;

socket.on("message", (message) => {
  const atMs = performance.now();
  const decoded = decodeKnxNetIpFrame(new Uint8Array(message));
  if (!decoded.ok) return;
  const frame = decoded.value;
  if (frame.service === "TUNNELLING_REQUEST") {
    send({
      service: "TUNNELLING_ACK",
      channelId,
      sequenceCounter: frame.sequenceCounter,
      status: 0,
    });
    const cemi = decodeCemi(frame.cemi);
    if (cemi.ok)
      onIndication(cemi.value.frame, cemi.value.messageCode, cemi.value.confirmError, atMs);
  }
  const received = { atMs, frame };
  const keep: typeof waiters = [];
  for (const w of waiters)
    if (w.accept(received)) w.resolve(received);
    else keep.push(w);
  waiters = keep;
});

function send(frame: KnxNetIpFrame): void {
  socket.send(encodeKnxNetIpFrame(frame), endpoint.address.port, "127.0.0.1");
}
function next(accept: (r: Received) => boolean, timeoutMs = 2000): Promise<Received> {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("bench client: no answer")), timeoutMs);
    waiters.push({ accept, resolve: (r) => (clearTimeout(timer), resolve(r)) });
  });
}

const connected = next((r) => r.frame.service === "CONNECT_RESPONSE");
send({
  service: "CONNECT_REQUEST",
  controlEndpoint: ROUTE_BACK_HPAI,
  dataEndpoint: ROUTE_BACK_HPAI,
  cri: tunnelCri(),
});
const response = (await connected).frame;
if (response.service !== "CONNECT_RESPONSE" || response.status !== 0)
  throw new Error("not connected");
channelId = response.channelId;
let sequence = 0;

function request(destination: number, payload: Uint8Array): KnxNetIpFrame {
  const frame: DataFrame = {
    priority: "low",
    repeated: false,
    source: 0,
    destination,
    addressType: "group",
    hopCount: 6,
    service: "GroupValue_Write",
    payload,
    shortPayload: payload.length === 1 && destination === LIGHTS,
  };
  const cemi = encodeCemi({ messageCode: "L_Data.req", frame, ackRequest: true });
  return { service: "TUNNELLING_REQUEST", channelId, sequenceCounter: sequence++ & 0xff, cemi };
}

// ---------------------------------------------------------------- 1. round trip

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const conWall: number[] = [];
const conLine: number[] = [];
const indWall: number[] = [];
const indLine: number[] = [];
await sleep(300); // the bench's start-up telegrams

for (let i = 0; i < SAMPLES; i++) {
  const value = i % 2 === 0 ? 21 : 22.5;
  const payload = getDpt("9.001")!.encode(value);
  if (!payload.ok) throw new Error("encode");
  let conAt = 0;
  let indAt = 0;
  const done = new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("round trip timed out")), 3000);
    onIndication = (frame, code, _error, atMs) => {
      if (code === "L_Data.con" && frame.destination === SETPOINT) conAt = atMs;
      if (code === "L_Data.ind" && frame.destination === SETPOINT_STATUS) indAt = atMs;
      if (conAt > 0 && indAt > 0) {
        clearTimeout(timer);
        resolve();
      }
    };
  });
  const traceFrom = sim.trace.length;
  const t0 = performance.now();
  send(request(SETPOINT, payload.value));
  await done;
  const events = sim.trace.slice(traceFrom);
  const queued = events.find((e) => e.kind === "telegram.queued" && e.source === TUNNEL_IA);
  const acked = events.find((e) => e.kind === "telegram.acked" && e.source === TUNNEL_IA);
  const status = events.find(
    (e) => e.kind === "telegram.sent" && e.destination === SETPOINT_STATUS,
  );
  if (queued === undefined || acked === undefined || status?.kind !== "telegram.sent")
    throw new Error("trace is missing the telegrams");
  conWall.push(conAt - t0);
  conLine.push((acked.timeUs - queued.timeUs) / 1000);
  indWall.push(indAt - t0);
  indLine.push((status.endUs - queued.timeUs) / 1000);
  await sleep(50);
}

// ---------------------------------------------------------------- 2. sustained rate

let inFlight = 0;
let confirmedOk = 0;
let confirmedError = 0;
let indications = 0;
let slotWaiter: (() => void) | undefined;
onIndication = (frame, code, confirmError) => {
  if (code === "L_Data.con") {
    inFlight--;
    if (confirmError) confirmedError++;
    else confirmedOk++;
    slotWaiter?.();
  } else indications++;
};
const statsFrom = sim.nowUs;
const rateStart = performance.now();
let n = 0;
while (performance.now() - rateStart < SATURATE_S * 1000) {
  if (inFlight >= WINDOW) {
    await new Promise<void>((resolve) => (slotWaiter = resolve));
    slotWaiter = undefined;
    continue;
  }
  inFlight++;
  const acknowledged = next((r) => r.frame.service === "TUNNELLING_ACK");
  send(request(LIGHTS, Uint8Array.of(n++ % 2)));
  await acknowledged;
}
const rateWallS = (performance.now() - rateStart) / 1000;
const lineVirtualS = (sim.nowUs - statsFrom) / 1e6;
// Telegrams whose frame started in the window, and the Basic course's bus load over it.
const lineStats = sim.line().stats(sim.nowUs - statsFrom);
const lineTelegrams = lineStats.telegrams;

// ---------------------------------------------------------------- 3. the knx package's client

interface KnxClient {
  on(event: string, listener: (...args: never[]) => void): void;
  off(event: string, listener: (...args: never[]) => void): void;
  write(ga: string, value: unknown, dpt: string): void;
  Disconnect(callback: () => void): void;
  transition(state: string): void;
  idletimer?: ReturnType<typeof setTimeout> | null;
}
const require = createRequire(import.meta.url);
const logger = createRequire(require.resolve("knx/package.json"))("log-driver").logger as Record<
  string,
  unknown
>;
for (const level of ["error", "warn", "info", "debug", "trace"]) logger[level] = () => undefined;
const knx = require("knx") as { Connection(options: Record<string, unknown>): KnxClient };
const knxClient = await new Promise<KnxClient>((resolve, reject) => {
  const timer = setTimeout(() => reject(new Error("knx client did not connect")), 4000);
  const c = knx.Connection({
    ipAddr: "127.0.0.1",
    ipPort: endpoint.address.port,
    loglevel: "error",
  });
  c.on("connected", () => (clearTimeout(timer), resolve(c)));
});
const knxConWall: number[] = [];
const knxIndWall: number[] = [];
for (let i = 0; i < SAMPLES / 2; i++) {
  let conAt = 0;
  let indAt = 0;
  const done = new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("knx round trip timed out")), 3000);
    const check = () => {
      if (conAt === 0 || indAt === 0) return;
      clearTimeout(timer);
      knxClient.off("confirmed", onConfirmed);
      knxClient.off("event", onEvent);
      resolve();
    };
    const onConfirmed = () => ((conAt = performance.now()), check());
    const onEvent = (service: string, _src: string, dest: string) => {
      if (service === "GroupValue_Write" && dest === "2/1/2") indAt = performance.now();
      check();
    };
    knxClient.on("confirmed", onConfirmed);
    knxClient.on("event", onEvent);
  });
  const t0 = performance.now();
  knxClient.write("2/0/2", i % 2 === 0 ? 21.5 : 23, "DPT9.001");
  await done;
  knxConWall.push(conAt - t0);
  knxIndWall.push(indAt - t0);
  await sleep(50);
}
await new Promise<void>((resolve) => {
  const timer = setTimeout(resolve, 2000);
  knxClient.Disconnect(() => (clearTimeout(timer), resolve()));
});
if (knxClient.idletimer) clearTimeout(knxClient.idletimer);
knxClient.transition("uninitialized");

// ---------------------------------------------------------------- report

const disconnected = next((r) => r.frame.service === "DISCONNECT_RESPONSE");
send({ service: "DISCONNECT_REQUEST", channelId, controlEndpoint: ROUTE_BACK_HPAI });
await disconnected;
socket.close();
await endpoint.close();
paced.stop();

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const p95 = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length * 0.95)]!;
const diff = (a: number[], b: number[]) => a.map((x, i) => x - b[i]!);
const f = (x: number, d = 2) => x.toFixed(d);

console.log(
  `KNXnet/IP tunnel to the demo bench on 127.0.0.1:${endpoint.address.port}, paced at 1x\n`,
);
console.log(`1. Round trip, ${SAMPLES} setpoint writes (DPT 9.001 to 2/0/2), ms`);
console.log(
  "   to                         wall median   wall p95   line median   added median   added p95   target   added/target",
);
for (const [label, wall, line] of [
  ["L_Data.con (own write)", conWall, conLine],
  ["L_Data.ind (2/1/2 status)", indWall, indLine],
] as const) {
  const added = diff(wall, line);
  console.log(
    `   ${label.padEnd(26)} ${f(median(wall)).padStart(11)} ${f(p95(wall)).padStart(10)} ${f(median(line)).padStart(13)} ${f(median(added)).padStart(14)} ${f(p95(added)).padStart(11)} ${f(TARGET_OVERHEAD_MS).padStart(8)} ${f(median(added) / TARGET_OVERHEAD_MS).padStart(13)}x`,
  );
}
console.log(
  "   knx package client (its own processing included; no line time to subtract per sample):",
);
console.log(
  `   ${"L_Data.con (own write)".padEnd(26)} ${f(median(knxConWall)).padStart(11)} ${f(p95(knxConWall)).padStart(10)}`,
);
console.log(
  `   ${"L_Data.ind (2/1/2 status)".padEnd(26)} ${f(median(knxIndWall)).padStart(11)} ${f(p95(knxIndWall)).padStart(10)}`,
);
console.log(
  `\n2. Saturating client for ${f(rateWallS, 1)} s wall (window ${WINDOW} frames, writes to 1/0/2)`,
);
console.log(
  "   line telegrams/s   physical limit/s   line/limit   bus load   client confirmed/s   negative con   indications   virtual:wall",
);
console.log(
  `   ${f(lineTelegrams / lineVirtualS).padStart(16)} ${f(PHYSICAL_RATE).padStart(18)} ${f((lineTelegrams / lineVirtualS / PHYSICAL_RATE) * 100, 1).padStart(11)}% ${f(lineStats.loadPercent, 1).padStart(9)}% ${f(confirmedOk / rateWallS).padStart(20)} ${String(confirmedError).padStart(14)} ${String(indications).padStart(13)} ${f(lineVirtualS / rateWallS, 3).padStart(14)}`,
);
console.log(
  "   The line rate counts every telegram on the line: the client's writes and the actuator's status answers.",
);
console.log(`   Endpoint counters: ${JSON.stringify(endpoint.counters())}`);
