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
 *
 * Both are measured side by side on two endpoints: one over a bare simulation
 * paced by its own 1 ms timer (app/_lib/knxnet/real-time-pacer.ts), and one over
 * a server-hosted live session (app/_lib/live/), whose simulation follows the
 * session's own clock: 50 ms ticks for viewers, plus wake-ups timed to the line's
 * next event while a tunnel is open. The knx package's client (3.) runs against
 * the server session, as a console user would publish it.
 */
import dgram from "node:dgram";
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { performance } from "node:perf_hooks";
import { pacedSimulationLine } from "../../app/_lib/knxnet/simulation-line";
import { startKnxNetIpEndpoint } from "../../app/_lib/knxnet/udp-endpoint";
import { HostedLiveSession } from "../../app/_lib/live/hosted-live-session";
import { systemLiveSessionClock } from "../../app/_lib/live/live-session-clock";
import { getDpt, type Simulation, type TraceEvent } from "../../engine";
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

const benchText = readFileSync(
  new URL("../../scenarios/benches/fernhill-training-centre.bench.json", import.meta.url),
  "utf8",
);
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

// ---------------------------------------------------------------- the two endpoints

const pacedSim = createSimulation(JSON.parse(benchText) as never, { seed: 1, traceCapacity: 0 });
const pool = tunnelAddressPool(pacedSim.bench, pacedSim.bench.testToolLine, 2);
if (!pool.ok) throw new Error(pool.error.message);
const paced = pacedSimulationLine(pacedSim);
paced.start();
const pacedEndpoint = await startKnxNetIpEndpoint({
  line: paced.line,
  ...pool.value,
  ports: { first: 0, last: 0 },
});

const hosted = new HostedLiveSession({
  id: "bench",
  workspaceId: "bench",
  benchId: "bench",
  benchName: "Demo bench",
  revision: 1,
  owner: { memberId: "bench", name: "Bench" },
  document: JSON.parse(benchText) as unknown,
  clock: systemLiveSessionClock,
  idleMs: 3_600_000,
  onEnded: () => undefined,
});
await hosted.publish({
  host: "127.0.0.1",
  loopback: true,
  ports: { first: 0, last: 0 },
  tunnels: 2,
});
const hostedPort = hosted.view({ userId: "bench", workspaceId: "bench", role: "admin" }).endpoint!
  .port;

// ---------------------------------------------------------------- a minimal client

type Received = { readonly atMs: number; readonly frame: KnxNetIpFrame };
type Indication = (frame: DataFrame, cemiCode: string, confirmError: boolean, atMs: number) => void;

async function tunnelClient(port: number) {
  const socket = dgram.createSocket("udp4");
  await new Promise<void>((resolve) => socket.bind(0, "127.0.0.1", () => resolve()));
  let waiters: { accept: (r: Received) => boolean; resolve: (r: Received) => void }[] = [];
  let channelId = 0;
  let sequence = 0;
  const client = {
    onIndication: (() => undefined) as Indication,
    send(frame: KnxNetIpFrame): void {
      socket.send(encodeKnxNetIpFrame(frame), port, "127.0.0.1");
    },
    next(accept: (r: Received) => boolean, timeoutMs = 2000): Promise<Received> {
      return new Promise((resolve, reject) => {
        const timer = setTimeout(() => reject(new Error("bench client: no answer")), timeoutMs);
        waiters.push({ accept, resolve: (r) => (clearTimeout(timer), resolve(r)) });
      });
    },
    request(destination: number, payload: Uint8Array): KnxNetIpFrame {
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
    },
    async close(): Promise<void> {
      const disconnected = client.next((r) => r.frame.service === "DISCONNECT_RESPONSE");
      client.send({ service: "DISCONNECT_REQUEST", channelId, controlEndpoint: ROUTE_BACK_HPAI });
      await disconnected;
      socket.close();
    },
  };
  socket.on("message", (message) => {
    const atMs = performance.now();
    const decoded = decodeKnxNetIpFrame(new Uint8Array(message));
    if (!decoded.ok) return;
    const frame = decoded.value;
    if (frame.service === "TUNNELLING_REQUEST") {
      client.send({
        service: "TUNNELLING_ACK",
        channelId,
        sequenceCounter: frame.sequenceCounter,
        status: 0,
      });
      const cemi = decodeCemi(frame.cemi);
      if (cemi.ok)
        client.onIndication(
          cemi.value.frame,
          cemi.value.messageCode,
          cemi.value.confirmError,
          atMs,
        );
    }
    const received = { atMs, frame };
    const keep: typeof waiters = [];
    for (const w of waiters)
      if (w.accept(received)) w.resolve(received);
      else keep.push(w);
    waiters = keep;
  });
  const connected = client.next((r) => r.frame.service === "CONNECT_RESPONSE");
  client.send({
    service: "CONNECT_REQUEST",
    controlEndpoint: ROUTE_BACK_HPAI,
    dataEndpoint: ROUTE_BACK_HPAI,
    cri: tunnelCri(),
  });
  const response = (await connected).frame;
  if (response.service !== "CONNECT_RESPONSE" || response.status !== 0)
    throw new Error("not connected");
  channelId = response.channelId;
  return client;
}

type Client = Awaited<ReturnType<typeof tunnelClient>>;

// ---------------------------------------------------------------- 1. round trip

interface RoundTrip {
  conWall: number[];
  conLine: number[];
  indWall: number[];
  indLine: number[];
}

async function roundTrip(client: Client, sim: Simulation): Promise<RoundTrip> {
  const result: RoundTrip = { conWall: [], conLine: [], indWall: [], indLine: [] };
  const tunnel = pool.ok ? pool.value.tunnelAddresses[0]! : 0;
  let events: TraceEvent[] = [];
  const unsubscribe = sim.subscribe((event) => events.push(event));
  await sleep(300); // the bench's start-up telegrams
  for (let i = 0; i < SAMPLES; i++) {
    const value = i % 2 === 0 ? 21 : 22.5;
    const payload = getDpt("9.001")!.encode(value);
    if (!payload.ok) throw new Error("encode");
    let conAt = 0;
    let indAt = 0;
    const done = new Promise<void>((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error("round trip timed out")), 3000);
      client.onIndication = (frame, code, _error, atMs) => {
        if (code === "L_Data.con" && frame.destination === SETPOINT) conAt = atMs;
        if (code === "L_Data.ind" && frame.destination === SETPOINT_STATUS) indAt = atMs;
        if (conAt > 0 && indAt > 0) {
          clearTimeout(timer);
          resolve();
        }
      };
    });
    events = [];
    const t0 = performance.now();
    client.send(client.request(SETPOINT, payload.value));
    await done;
    const queued = events.find((e) => e.kind === "telegram.queued" && e.source === tunnel);
    const acked = events.find((e) => e.kind === "telegram.acked" && e.source === tunnel);
    const status = events.find(
      (e) => e.kind === "telegram.sent" && e.destination === SETPOINT_STATUS,
    );
    if (queued === undefined || acked === undefined || status?.kind !== "telegram.sent")
      throw new Error("trace is missing the telegrams");
    result.conWall.push(conAt - t0);
    result.conLine.push((acked.timeUs - queued.timeUs) / 1000);
    result.indWall.push(indAt - t0);
    result.indLine.push((status.endUs - queued.timeUs) / 1000);
    await sleep(50);
  }
  unsubscribe();
  return result;
}

// ---------------------------------------------------------------- 2. sustained rate

interface Saturation {
  wallS: number;
  lineTelegramsPerS: number;
  loadPercent: number;
  confirmedPerS: number;
  negative: number;
  indications: number;
  virtualPerWall: number;
}

async function saturate(client: Client, sim: Simulation): Promise<Saturation> {
  let inFlight = 0;
  let confirmedOk = 0;
  let confirmedError = 0;
  let indications = 0;
  let slotWaiter: (() => void) | undefined;
  client.onIndication = (_frame, code, confirmError) => {
    if (code === "L_Data.con") {
      inFlight--;
      if (confirmError) confirmedError++;
      else confirmedOk++;
      slotWaiter?.();
    } else indications++;
  };
  const statsFrom = sim.nowUs;
  const start = performance.now();
  let n = 0;
  while (performance.now() - start < SATURATE_S * 1000) {
    if (inFlight >= WINDOW) {
      await new Promise<void>((resolve) => (slotWaiter = resolve));
      slotWaiter = undefined;
      continue;
    }
    inFlight++;
    const acknowledged = client.next((r) => r.frame.service === "TUNNELLING_ACK");
    client.send(client.request(LIGHTS, Uint8Array.of(n++ % 2)));
    await acknowledged;
  }
  const wallS = (performance.now() - start) / 1000;
  const virtualS = (sim.nowUs - statsFrom) / 1e6;
  // Telegrams whose frame started in the window, and the Basic course's bus load over it.
  const stats = sim.line().stats(sim.nowUs - statsFrom);
  return {
    wallS,
    lineTelegramsPerS: stats.telegrams / virtualS,
    loadPercent: stats.loadPercent,
    confirmedPerS: confirmedOk / wallS,
    negative: confirmedError,
    indications,
    virtualPerWall: virtualS / wallS,
  };
}

const targets = [
  { label: "bare simulation, 1 ms pacer", port: pacedEndpoint.address.port, sim: pacedSim },
  { label: "server live session", port: hostedPort, sim: hosted.simulation! },
];
const results: { label: string; trip: RoundTrip; rate: Saturation }[] = [];
for (const target of targets) {
  const client = await tunnelClient(target.port);
  const trip = await roundTrip(client, target.sim);
  const rate = await saturate(client, target.sim);
  await client.close();
  results.push({ label: target.label, trip, rate });
}

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
    ipPort: hostedPort,
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

await pacedEndpoint.close();
paced.stop();
await hosted.end("stopped");

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const p95 = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length * 0.95)]!;
const diff = (a: number[], b: number[]) => a.map((x, i) => x - b[i]!);
const f = (x: number, d = 2) => x.toFixed(d);

console.log("KNXnet/IP tunnels to the demo bench on 127.0.0.1 at 1x, side by side\n");
console.log(`1. Round trip, ${SAMPLES} setpoint writes (DPT 9.001 to 2/0/2), ms`);
console.log(
  "   endpoint                      to                          wall median   wall p95   line median   added median   added p95   target   added/target",
);
for (const { label: endpointLabel, trip } of results) {
  for (const [label, wall, line] of [
    ["L_Data.con (own write)", trip.conWall, trip.conLine],
    ["L_Data.ind (2/1/2 status)", trip.indWall, trip.indLine],
  ] as const) {
    const added = diff(wall, line);
    console.log(
      `   ${endpointLabel.padEnd(29)} ${label.padEnd(26)} ${f(median(wall)).padStart(11)} ${f(p95(wall)).padStart(10)} ${f(median(line)).padStart(13)} ${f(median(added)).padStart(14)} ${f(p95(added)).padStart(11)} ${f(TARGET_OVERHEAD_MS).padStart(8)} ${f(median(added) / TARGET_OVERHEAD_MS).padStart(13)}x`,
    );
  }
}
console.log(
  "   knx package client on the server live session (its own processing included; no line time to subtract per sample):",
);
console.log(
  `   ${"".padEnd(29)} ${"L_Data.con (own write)".padEnd(26)} ${f(median(knxConWall)).padStart(11)} ${f(p95(knxConWall)).padStart(10)}`,
);
console.log(
  `   ${"".padEnd(29)} ${"L_Data.ind (2/1/2 status)".padEnd(26)} ${f(median(knxIndWall)).padStart(11)} ${f(p95(knxIndWall)).padStart(10)}`,
);
console.log(
  `\n2. Saturating client for ${SATURATE_S} s wall each (window ${WINDOW} frames, writes to 1/0/2)`,
);
console.log(
  "   endpoint                      line telegrams/s   physical limit/s   line/limit   bus load   client confirmed/s   negative con   indications   virtual:wall",
);
for (const { label, rate } of results) {
  console.log(
    `   ${label.padEnd(29)} ${f(rate.lineTelegramsPerS).padStart(16)} ${f(PHYSICAL_RATE).padStart(18)} ${f((rate.lineTelegramsPerS / PHYSICAL_RATE) * 100, 1).padStart(11)}% ${f(rate.loadPercent, 1).padStart(9)}% ${f(rate.confirmedPerS).padStart(20)} ${String(rate.negative).padStart(14)} ${String(rate.indications).padStart(13)} ${f(rate.virtualPerWall, 3).padStart(14)}`,
  );
}
console.log(
  "   The line rate counts every telegram on the line: the client's writes and the actuator's status answers.",
);
console.log(`   Paced endpoint counters: ${JSON.stringify(pacedEndpoint.counters())}`);
