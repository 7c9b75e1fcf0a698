/*
 * The KNXnet/IP endpoint against a real client: the `knx` npm package (test-only
 * devDependency, "Libraries" in knx-reference.md) tunnelling over 127.0.0.1 to an
 * endpoint serving the demo bench, paced at real time. Every wait is bounded and
 * every socket is closed. Values: DPT 9.001 per DPT spec §3.10; the gateway's
 * 30 °C upper limit is the demo bench's own parameter (scenarios/fernhill).
 */
import dgram from "node:dgram";
import { readFileSync } from "node:fs";
import { afterEach, describe, expect, it } from "vitest";
import { parseIndividualAddress } from "@/engine";
import {
  decodeKnxNetIpFrame,
  encodeKnxNetIpFrame,
  ROUTE_BACK_HPAI,
  STATUS,
  type TunnellingServerEffect,
} from "@/engine";
import { createSimulation } from "@/engine";
import {
  dpt9,
  heartbeat,
  KNX_WAIT_MS,
  knxClients,
  readResponse,
  waitFor,
} from "@/test/harness/knx-client";
import { pacedSimulationLine } from "./simulation-line";
import { startKnxNetIpEndpoint, type KnxNetIpEndpoint } from "./udp-endpoint";

const bench = JSON.parse(
  readFileSync(
    new URL("../../../scenarios/benches/fernhill-training-centre.bench.json", import.meta.url),
    "utf8",
  ),
) as unknown;
const ia = (text: string) => {
  const parsed = parseIndividualAddress(text);
  if (!parsed.ok) throw new Error(text);
  return parsed.value;
};
const WAIT_MS = KNX_WAIT_MS;

const clients = knxClients();
const connect = (port: number) => clients.connect(port);
const cleanups: (() => Promise<void> | void)[] = [];
afterEach(async () => {
  await clients.closeAll();
  while (cleanups.length > 0) await cleanups.pop()!();
});

async function world(server: { connectionAliveTimeoutUs?: number } = {}, port = 0) {
  const sim = createSimulation(bench as never, { seed: 1, traceCapacity: 5000 });
  const paced = pacedSimulationLine(sim);
  paced.start();
  const events: TunnellingServerEffect[] = [];
  const start = (p: number) =>
    startKnxNetIpEndpoint({
      line: paced.line,
      tunnelAddresses: [ia("1.1.241"), ia("1.1.242"), ia("1.1.243")],
      individualAddress: ia("1.1.240"),
      ports: { first: p, last: p },
      server,
      onEvent: (e) => events.push(e),
    });
  const state = { endpoint: (await start(port)) as KnxNetIpEndpoint };
  const port0 = state.endpoint.address.port;
  cleanups.push(async () => {
    await state.endpoint.close();
    paced.stop();
  });
  return {
    sim,
    events,
    get endpoint() {
      return state.endpoint;
    },
    async stop() {
      await state.endpoint.close();
    },
    async startAgain() {
      state.endpoint = await start(port0);
    },
  };
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

describe("KNXnet/IP endpoint with the knx package as a real tunnelling client", () => {
  it("writes a setpoint as DPT 9.001 and receives the gateway's status telegram and the confirmation", async () => {
    const w = await world();
    const client = await connect(w.endpoint.address.port);
    expect(w.endpoint.connections().map((c) => c.individualAddress)).toEqual([ia("1.1.241")]);
    const status = waitFor(
      client,
      "event",
      (service: string, _src: string, dest: string) =>
        service === "GroupValue_Write" && dest === "2/1/2",
    );
    const confirmed = waitFor(client, "confirmed");
    client.write("2/0/2", 23.5, "DPT9.001");
    // The package emits "confirmed" with its own request when an L_Data.con for that
    // destination arrives (the confirm bit itself is checked in tunnelling-server.test.ts).
    const [confirmation] = (await confirmed) as [{ cemi: { dest_addr: string } }];
    expect(confirmation.cemi.dest_addr).toBe("2/0/2");
    const [, src, , value] = await status;
    expect(src).toBe("1.1.20"); // gw-front on the demo bench
    expect(dpt9(value)).toBe(23.5);
    // The tunnel's telegram went on the simulated line from the tunnel's own address.
    expect(
      w.sim.trace.some(
        (e) =>
          e.kind === "telegram.acked" && e.source === ia("1.1.241") && e.destination === 0x1002,
      ),
    ).toBe(true);
  });

  it("reads a status address and receives the response with the value the unit took", async () => {
    const w = await world();
    const client = await connect(w.endpoint.address.port);
    const clamped = waitFor(
      client,
      "event",
      (service: string, _s: string, dest: string) =>
        service === "GroupValue_Write" && dest === "2/1/2",
    );
    client.write("2/0/2", 35, "DPT9.001"); // above the gateway's 30 °C limit
    await clamped;
    const [src, value] = await readResponse(client, "2/1/2", WAIT_MS);
    expect(src).toBe("1.1.20");
    expect(dpt9(value)).toBe(30);
  });

  it("keeps the tunnel across heartbeats and ends it when they stop (short timeout for the test)", async () => {
    const w = await world({ connectionAliveTimeoutUs: 1_000_000 });
    const client = await connect(w.endpoint.address.port);
    const [channel] = w.endpoint.connections().map((c) => c.channelId);
    // The client's own heartbeat period is a fixed 60 s, so the test drives its heartbeat state.
    for (let i = 0; i < 6; i++) {
      await sleep(200);
      await heartbeat(client);
    }
    expect(w.endpoint.connections().map((c) => c.channelId)).toEqual([channel]);
    expect(w.events.some((e) => e.kind === "tunnel.closed")).toBe(false);
    await waitFor(client, "disconnected");
    expect(w.events).toContainEqual(
      expect.objectContaining({ kind: "tunnel.closed", reason: "heartbeat" }),
    );
  });

  it("lets two clients see each other's telegrams", async () => {
    const w = await world();
    const a = await connect(w.endpoint.address.port);
    const b = await connect(w.endpoint.address.port);
    const [iaA, iaB] = w.endpoint.connections().map((c) => c.individualAddress);
    const seenByB = waitFor(
      b,
      "event",
      (service: string, src: string, dest: string) =>
        service === "GroupValue_Write" && dest === "1/0/1" && src === "1.1.241",
    );
    a.write("1/0/1", 1, "DPT1.001");
    await seenByB;
    const seenByA = waitFor(
      a,
      "event",
      (service: string, src: string, dest: string) =>
        service === "GroupValue_Write" && dest === "1/0/2" && src === "1.1.242",
    );
    b.write("1/0/2", 1, "DPT1.001");
    await seenByA;
    expect([iaA, iaB]).toEqual([ia("1.1.241"), ia("1.1.242")]);
    expect(w.endpoint.connections().every((c) => c.telegramsIn === 1 && c.telegramsOut >= 1)).toBe(
      true,
    );
  });

  it("closes the tunnel when the client disconnects", async () => {
    const w = await world();
    const client = await connect(w.endpoint.address.port);
    await new Promise<void>((resolve) => client.Disconnect(() => resolve()));
    expect(w.endpoint.connections()).toEqual([]);
    expect(w.events).toContainEqual(
      expect.objectContaining({ kind: "tunnel.closed", reason: "client" }),
    );
  });

  it("a restart ends the tunnels with DISCONNECT_REQUEST; the old channel is unknown afterwards and the client reconnects", async () => {
    const w = await world();
    const client = await connect(w.endpoint.address.port);
    const [channel] = w.endpoint.connections().map((c) => c.channelId);
    const disconnected = waitFor(client, "disconnected");
    await w.stop();
    await disconnected;
    // Restarted on the same port before the client's next connect attempt (it retries every 3 s):
    // a heartbeat on the old channel gets E_CONNECTION_ID (knx-reference.md 0x21).
    await w.startAgain();
    const reconnected = waitFor(client, "connected", () => true, 8000);
    const reply = await rawExchange(
      w.endpoint.address.port,
      encodeKnxNetIpFrame({
        service: "CONNECTIONSTATE_REQUEST",
        channelId: channel!,
        controlEndpoint: ROUTE_BACK_HPAI,
      }),
    );
    expect(reply).toEqual({
      service: "CONNECTIONSTATE_RESPONSE",
      channelId: channel,
      status: STATUS.E_CONNECTION_ID,
    });
    await reconnected;
    expect(w.endpoint.connections()).toHaveLength(1);
  }, 15_000);

  it("answers a description request and counts a malformed datagram without disturbing the session", async () => {
    const w = await world();
    const description = await rawExchange(
      w.endpoint.address.port,
      encodeKnxNetIpFrame({
        service: "DESCRIPTION_REQUEST",
        controlEndpoint: ROUTE_BACK_HPAI,
      }),
    );
    expect(description).toMatchObject({
      service: "DESCRIPTION_RESPONSE",
      dibs: [
        { kind: "device-info", individualAddress: ia("1.1.240") },
        { kind: "service-families" },
      ],
    });
    await rawExchange(
      w.endpoint.address.port,
      Uint8Array.of(0x06, 0x10, 0x04, 0x20, 0x00, 0x63),
      false,
    );
    expect(w.endpoint.counters().malformed).toBe(1);
    const client = await connect(w.endpoint.address.port);
    const status = waitFor(
      client,
      "event",
      (_s: string, _src: string, dest: string) => dest === "2/1/2",
    );
    client.write("2/0/2", 22, "DPT9.001");
    expect(dpt9((await status)[3])).toBe(22);
  });
});

describe("KNXnet/IP endpoint binding", () => {
  it("binds 127.0.0.1 by default and takes the next free port of its range", async () => {
    const w = await world();
    const { port } = w.endpoint.address;
    expect(w.endpoint.address.address).toBe("127.0.0.1");
    const sim = createSimulation(bench as never, { seed: 1, traceCapacity: 10 });
    const paced = pacedSimulationLine(sim);
    const second = await startKnxNetIpEndpoint({
      line: paced.line,
      tunnelAddresses: [ia("1.1.241")],
      individualAddress: ia("1.1.240"),
      ports: { first: port, last: port + 5 },
    });
    cleanups.push(async () => {
      await second.close();
      paced.stop();
    });
    expect(second.address.address).toBe("127.0.0.1");
    expect(second.address.port).toBeGreaterThan(port);
    expect(second.address.port).toBeLessThanOrEqual(port + 5);
  });
});

/** Sends one datagram from a fresh loopback socket and decodes the answer (or waits briefly for none). */
async function rawExchange(port: number, bytes: Uint8Array, expectAnswer = true) {
  const socket = dgram.createSocket("udp4");
  try {
    await new Promise<void>((resolve) => socket.bind(0, "127.0.0.1", () => resolve()));
    const answer = new Promise<Uint8Array | undefined>((resolve) => {
      const timeout = setTimeout(() => resolve(undefined), expectAnswer ? WAIT_MS : 200);
      socket.once("message", (message) => {
        clearTimeout(timeout);
        resolve(new Uint8Array(message));
      });
    });
    socket.send(bytes, port, "127.0.0.1");
    const received = await answer;
    if (received === undefined) return undefined;
    const decoded = decodeKnxNetIpFrame(received);
    return decoded.ok ? decoded.value : decoded.error;
  } finally {
    socket.close();
  }
}
