/*
 * A published server session of the demo bench against a real KNXnet/IP client:
 * the `knx` npm package ("Libraries" in knx-reference.md) tunnelling over
 * 127.0.0.1 to an endpoint on any free port, the session running at real time on
 * the wall clock. Values: DPT 9.001 per DPT spec §3.10; the gateway's 30 °C upper
 * limit is the demo bench's own parameter (scenarios/benches). Disconnects follow
 * the KNXnet/IP spec (KNX Standard 03_08_02 Core, also ISO 22510): the server
 * ends a tunnel with a DISCONNECT_REQUEST to the client's control endpoint.
 * Every wait is bounded; every socket is closed.
 */
import { readFileSync } from "node:fs";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { systemLiveSessionClock } from "@/app/_lib/live/live-session-clock";
import { installLiveSessions, LiveSessionRegistry } from "@/app/_lib/live/live-session-registry";
import { liveSessionViewSchema, type LiveSessionView } from "@/app/_lib/live/live-session-view";
import { createBench } from "@/db/queries/benches";
import { dpt9, heartbeat, knxClients, readResponse, waitFor } from "@/test/harness/knx-client";
import { sseReader } from "./support/live-sessions";
import { call, cookieFor, createWorld, destroyWorld, type World } from "./support/world";

const demoBench = readFileSync(
  new URL("../../scenarios/benches/fernhill-training-centre.bench.json", import.meta.url),
  "utf8",
);

let world: World;
let benchId: string;
let registry: LiveSessionRegistry;
let cookie: string;
const clients = knxClients();

beforeAll(async () => {
  world = createWorld();
  benchId = createBench({
    values: {
      workspaceId: world.a.workspaceId,
      name: "Demo bench",
      createdBy: world.users.engineer.userId,
    },
    document: demoBench,
  }).bench.id;
  registry = new LiveSessionRegistry({
    clock: systemLiveSessionClock,
    limits: () => ({ perMember: 2, perWorkspace: 4, idleMs: 60_000 }),
    knxNetIp: () => ({
      host: "127.0.0.1",
      loopback: true,
      ports: { first: 0, last: 0 },
      tunnels: 3,
    }),
    // Short enough for a test to see a silent client dropped (the standard's 120 s otherwise).
    tunnellingServer: { connectionAliveTimeoutUs: 1_000_000 },
  });
  installLiveSessions(registry);
  cookie = await cookieFor(world.users.engineer.userId, world.a.workspaceId);
});
afterEach(async () => {
  await clients.closeAll();
  await registry.shutdown();
});
afterAll(() => {
  installLiveSessions(undefined);
  destroyWorld(world);
});

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function request(
  load: () => Promise<unknown>,
  method: string,
  path: string,
  params: Record<string, string>,
  body?: unknown,
) {
  const handlers = (await load()) as Record<string, unknown>;
  return call(handlers[method], {
    method,
    path,
    params,
    cookie,
    ...(body === undefined ? {} : { body }),
  });
}

/** Starts and publishes a session of the demo bench; returns its view. */
async function published(): Promise<LiveSessionView> {
  const started = await request(
    () => import("@/app/api/live-sessions/route"),
    "POST",
    "/",
    {},
    {
      benchId,
    },
  );
  expect(started.status, await started.clone().text()).toBe(201);
  const { id } = ((await started.json()) as { session: LiveSessionView }).session;
  const response = await request(
    () => import("@/app/api/live-sessions/[sessionId]/endpoint/route"),
    "POST",
    `/api/live-sessions/${id}/endpoint`,
    { sessionId: id },
  );
  expect(response.status, await response.clone().text()).toBe(200);
  return liveSessionViewSchema.parse(((await response.json()) as { session: unknown }).session);
}

async function viewOf(id: string): Promise<LiveSessionView> {
  const response = await request(
    () => import("@/app/api/live-sessions/[sessionId]/route"),
    "GET",
    `/api/live-sessions/${id}`,
    { sessionId: id },
  );
  return liveSessionViewSchema.parse(((await response.json()) as { session: unknown }).session);
}

const isWrite =
  (dest: string, src?: string) => (service: string, source: string, destination: string) =>
    service === "GroupValue_Write" && destination === dest && (src === undefined || source === src);

describe("a published live session with the knx package as a real client", () => {
  it("takes a setpoint written as DPT 9.001 and answers with the gateway's status indication; the log marks the tunnel", async () => {
    const session = await published();
    const events = await request(
      () => import("@/app/api/live-sessions/[sessionId]/events/route"),
      "GET",
      `/api/live-sessions/${session.id}/events`,
      { sessionId: session.id },
    );
    const stream = sseReader(events);
    const client = await clients.connect(session.endpoint!.port);
    const status = waitFor(client, "event", isWrite("2/1/2"));
    const confirmed = waitFor(client, "confirmed");
    client.write("2/0/2", 23.5, "DPT9.001");
    const [confirmation] = (await confirmed) as [{ cemi: { dest_addr: string } }];
    expect(confirmation.cemi.dest_addr).toBe("2/0/2");
    const [, src, , value] = await status;
    expect(src).toBe("1.1.20"); // the gateway on the demo bench
    expect(dpt9(value)).toBe(23.5);

    const view = await viewOf(session.id);
    expect(view.endpoint?.clients).toEqual([
      expect.objectContaining({
        address: "127.0.0.1",
        individualAddress: expect.stringMatching(/^1\.1\.\d+$/),
        telegramsIn: 1,
      }),
    ]);
    const tunnel = view.endpoint!.clients[0]!.individualAddress;
    // Viewers see the client's telegram in the log, marked with the tunnel's address.
    const row = await stream.next(
      (e) =>
        e.event === "message" &&
        ((e.data as { rows?: { destination: string; tunnel?: string }[] }).rows ?? []).some(
          (r) => r.destination === "2/0/2" && r.tunnel === tunnel,
        ),
    );
    expect(row.event).toBe("message");
    await stream.close();
  });

  it("answers a read of a status address with the value the unit took", async () => {
    const session = await published();
    const client = await clients.connect(session.endpoint!.port);
    const clamped = waitFor(client, "event", isWrite("2/1/2"));
    client.write("2/0/2", 35, "DPT9.001"); // above the gateway's 30 °C limit
    await clamped;
    const [src, value] = await readResponse(client, "2/1/2");
    expect(src).toBe("1.1.20");
    expect(dpt9(value)).toBe(30);
  });

  it("keeps the tunnel across heartbeats, and drops it when they stop (1 s timeout for the test)", async () => {
    const session = await published();
    const client = await clients.connect(session.endpoint!.port);
    for (let i = 0; i < 6; i++) {
      await sleep(200);
      await heartbeat(client);
    }
    expect((await viewOf(session.id)).endpoint?.clients).toHaveLength(1);
    // A connected tunnel also keeps the session from idling; silence ends the tunnel.
    await waitFor(client, "disconnected");
    expect((await viewOf(session.id)).endpoint?.clients).toEqual([]);
  });

  it("lets two clients see each other's telegrams, and disconnects one on the owner's request", async () => {
    const session = await published();
    const a = await clients.connect(session.endpoint!.port);
    const b = await clients.connect(session.endpoint!.port);
    const [ia, ib] = (await viewOf(session.id)).endpoint!.clients.map((c) => c.individualAddress);
    const seenByB = waitFor(b, "event", isWrite("1/0/1", ia));
    a.write("1/0/1", 1, "DPT1.001");
    await seenByB;
    const seenByA = waitFor(a, "event", isWrite("1/0/2", ib));
    b.write("1/0/2", 1, "DPT1.001");
    await seenByA;

    const channel = (await viewOf(session.id)).endpoint!.clients.find(
      (c) => c.individualAddress === ib,
    )!.channelId;
    const bGone = waitFor(b, "disconnected");
    const response = await request(
      () => import("@/app/api/live-sessions/[sessionId]/endpoint/clients/[channelId]/route"),
      "DELETE",
      `/api/live-sessions/${session.id}/endpoint/clients/${channel}`,
      { sessionId: session.id, channelId: String(channel) },
    );
    expect(response.status).toBe(204);
    await bGone;
    expect((await viewOf(session.id)).endpoint!.clients.map((c) => c.individualAddress)).toEqual([
      ia,
    ]);
  });

  it("ends the tunnels with a DISCONNECT_REQUEST when the session restarts (reset) and when it stops", async () => {
    const session = await published();
    const client = await clients.connect(session.endpoint!.port);
    const afterReset = waitFor(client, "disconnected");
    const reset = await request(
      () => import("@/app/api/live-sessions/[sessionId]/commands/route"),
      "POST",
      `/api/live-sessions/${session.id}/commands`,
      { sessionId: session.id },
      { type: "reset" },
    );
    expect(reset.status).toBe(202);
    await afterReset;
    // The endpoint stays published after a reset: the client connects again (it retries after 3 s).
    await waitFor(client, "connected", () => true, 8000);
    // The new run plays at real time again: the gateway answers a setpoint.
    const status = waitFor(client, "event", isWrite("2/1/2"));
    client.write("2/0/2", 24, "DPT9.001");
    expect(dpt9((await status)[3])).toBe(24);
    const afterStop = waitFor(client, "disconnected");
    const stopped = await request(
      () => import("@/app/api/live-sessions/[sessionId]/route"),
      "DELETE",
      `/api/live-sessions/${session.id}`,
      { sessionId: session.id },
    );
    expect(stopped.status).toBe(204);
    await afterStop;
  }, 15_000);

  it("ends the tunnels when the owner unpublishes", async () => {
    const session = await published();
    const client = await clients.connect(session.endpoint!.port);
    const gone = waitFor(client, "disconnected");
    const response = await request(
      () => import("@/app/api/live-sessions/[sessionId]/endpoint/route"),
      "DELETE",
      `/api/live-sessions/${session.id}/endpoint`,
      { sessionId: session.id },
    );
    expect(((await response.json()) as { session: LiveSessionView }).session.endpoint).toBe(null);
    await gone;
  });
});
