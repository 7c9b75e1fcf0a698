import dgram from "node:dgram";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { liveSessionViewSchema, type LiveSessionView } from "@/app/_lib/live/live-session-view";
import { installLiveSessions, LiveSessionRegistry } from "@/app/_lib/live/live-session-registry";
import { createBench } from "@/db/queries/benches";
import type { Role } from "@/db/schema";
import { decodeCemi, encodeCemi, ROUTE_BACK_HPAI, simMessageSchema, STATUS } from "@/engine";
import { fakeWallClock } from "@/test/harness/fake-wall-clock";
import { sseReader } from "./support/live-sessions";
import { call, cookieFor, createWorld, destroyWorld, type World } from "./support/world";
import { rawKnxNetIpClient } from "@/test/harness/raw-knxnetip-client";

/**
 * The live-session routes, called as Next calls them, against a registry on a
 * fake clock (time moves only when the test says; the idle stop is counted on
 * it) and KNXnet/IP endpoints on any free loopback port. Who may do what
 * follows the live console: seeing a session needs the bench and either owning
 * the session or holding the console workspace-wide; controlling it needs to
 * own it or be an admin.
 */

const routes = {
  list: () => import("@/app/api/live-sessions/route"),
  one: () => import("@/app/api/live-sessions/[sessionId]/route"),
  events: () => import("@/app/api/live-sessions/[sessionId]/events/route"),
  commands: () => import("@/app/api/live-sessions/[sessionId]/commands/route"),
  endpoint: () => import("@/app/api/live-sessions/[sessionId]/endpoint/route"),
  client: () => import("@/app/api/live-sessions/[sessionId]/endpoint/clients/[channelId]/route"),
};

const IDLE_MS = 60_000;
let world: World;
let fake: ReturnType<typeof fakeWallClock>;
let registry: LiveSessionRegistry;
const limits = { perMember: 2, perWorkspace: 4, idleMs: IDLE_MS };
/** The endpoints' port range: any free port unless a test names one. */
let knxPorts = { first: 0, last: 0 };

beforeAll(() => {
  world = createWorld();
});
afterAll(async () => {
  await registry.shutdown();
  installLiveSessions(undefined);
  destroyWorld(world);
});

function freshRegistry() {
  fake = fakeWallClock();
  registry = new LiveSessionRegistry({
    clock: fake.clock,
    limits: () => limits,
    knxNetIp: () => ({
      host: "127.0.0.1",
      loopback: true,
      ports: knxPorts,
      tunnels: 2,
    }),
  });
  installLiveSessions(registry);
}
freshRegistry();

afterEach(async () => {
  knxPorts = { first: 0, last: 0 };
  await registry.shutdown();
  freshRegistry();
});

const cookieOf = (role: Role) => cookieFor(world.users[role].userId, world.a.workspaceId);

async function start(role: Role, benchId = world.a.benchId): Promise<LiveSessionView> {
  const response = await call((await routes.list()).POST, {
    method: "POST",
    path: "/api/live-sessions",
    cookie: await cookieOf(role),
    body: { benchId },
  });
  expect(response.status, await response.clone().text()).toBe(201);
  return liveSessionViewSchema.parse(((await response.json()) as { session: unknown }).session);
}

type ErrorBody = { error: { code: string; message: string; field?: string } };

async function expectError(response: Response, status: number, field?: string) {
  const text = await response.text();
  expect(response.status, text).toBe(status);
  const body = JSON.parse(text) as ErrorBody;
  if (field !== undefined) expect(body.error.field, text).toBe(field);
  return body.error;
}

function sessionRequest(
  route: keyof typeof routes,
  method: string,
  id: string,
  options: { cookie?: string; body?: unknown; channelId?: string } = {},
) {
  return (async () => {
    const handlers = (await routes[route]()) as unknown as Record<string, unknown>;
    const suffix = {
      list: "",
      one: "",
      events: "/events",
      commands: "/commands",
      endpoint: "/endpoint",
      client: `/endpoint/clients/${options.channelId ?? "1"}`,
    }[route];
    return call(handlers[method], {
      method,
      path: `/api/live-sessions/${id}${suffix}`,
      params: {
        sessionId: id,
        ...(route === "client" ? { channelId: options.channelId ?? "1" } : {}),
      },
      ...(options.cookie ? { cookie: options.cookie } : {}),
      ...(options.body !== undefined ? { body: options.body } : {}),
    });
  })();
}

describe("starting and listing", () => {
  it("starts a session of the bench's latest revision at real time, and lists it", async () => {
    const session = await start("engineer");
    expect(session).toMatchObject({
      benchId: world.a.benchId,
      benchName: "Bench a",
      revision: 1,
      owner: { memberId: world.users.engineer.userId },
      canControl: true,
      endpoint: null,
      startedAt: "2031-03-04T08:00:00.000Z",
      idleStopAt: "2031-03-04T08:01:00.000Z",
    });
    const listed = await call((await routes.list()).GET, {
      method: "GET",
      path: "/api/live-sessions",
      cookie: await cookieOf("engineer"),
    });
    const body = (await listed.json()) as { sessions: LiveSessionView[] };
    expect(body.sessions.map((s) => s.id)).toEqual([session.id]);
  });

  it("answers 400 naming the field for a bad body, 404 for a revision or bench that is not there", async () => {
    const { POST } = await routes.list();
    const cookie = await cookieOf("engineer");
    const post = (body: unknown) =>
      call(POST, { method: "POST", path: "/api/live-sessions", cookie, body });
    await expectError(await post({}), 400, "benchId");
    await expectError(await post({ benchId: world.a.benchId, revision: "2" }), 400, "revision");
    await expectError(await post({ benchId: world.a.benchId, speed: 10 }), 400, "speed");
    await expectError(await post({ benchId: world.a.benchId, revision: 99 }), 404, "revision");
    await expectError(await post({ benchId: world.b.benchId }), 404, "benchId");
    await expectError(await post({ benchId: world.sandboxBenchId }), 404, "benchId");
    expect(registry.size).toBe(0);
  });

  it("answers 403 to an apprentice on a shared bench and starts one on their own copy", async () => {
    const { POST } = await routes.list();
    const refused = await call(POST, {
      method: "POST",
      path: "/api/live-sessions",
      cookie: await cookieOf("apprentice"),
      body: { benchId: world.a.benchId },
    });
    await expectError(refused, 403);
    await start("apprentice", world.sandboxBenchId);
  });

  it("never leaves a half-started session: a revision that does not load is 409 and nothing is registered", async () => {
    const broken = createBench({
      values: {
        workspaceId: world.a.workspaceId,
        name: "Broken bench",
        createdBy: world.users.admin.userId,
      },
      document: JSON.stringify({ format: 1, name: "Broken", devices: "none" }),
    });
    const response = await call((await routes.list()).POST, {
      method: "POST",
      path: "/api/live-sessions",
      cookie: await cookieOf("engineer"),
      body: { benchId: broken.bench.id },
    });
    const error = await expectError(response, 409, "revision");
    expect(error.message).toMatch(/revision 1 of this bench does not load/);
    expect(registry.size).toBe(0);
    // No timer of a half-built session is left to fire either.
    fake.advance(10 * IDLE_MS);
    expect(registry.size).toBe(0);
  });

  it("answers 429 naming the limit per member, then per workspace", async () => {
    await start("engineer");
    await start("engineer");
    const { POST } = await routes.list();
    const third = await call(POST, {
      method: "POST",
      path: "/api/live-sessions",
      cookie: await cookieOf("engineer"),
      body: { benchId: world.a.benchId },
    });
    const member = await expectError(third, 429);
    expect(member.message).toMatch(/you already run 2 live sessions/);
    expect(member.message).toMatch(/LIVE_SESSION_LIMIT_PER_MEMBER = 2/);
    await start("qa");
    await start("trainer");
    const fifth = await call(POST, {
      method: "POST",
      path: "/api/live-sessions",
      cookie: await cookieOf("admin"),
      body: { benchId: world.a.benchId },
    });
    const workspace = await expectError(fifth, 429);
    expect(workspace.message).toMatch(/LIVE_SESSION_LIMIT_PER_WORKSPACE = 4/);
    expect(registry.size).toBe(4);
  });
});

describe("who sees and who controls a session", () => {
  it("lets a trainer watch an apprentice's session without controlling it, and hides it from others", async () => {
    const session = await start("apprentice", world.sandboxBenchId);
    const trainerView = await sessionRequest("one", "GET", session.id, {
      cookie: await cookieOf("trainer"),
    });
    expect(trainerView.status).toBe(200);
    expect(((await trainerView.json()) as { session: LiveSessionView }).session.canControl).toBe(
      false,
    );
    // An engineer may not read the apprentice's private copy, so the session does not exist for them.
    await expectError(
      await sessionRequest("one", "GET", session.id, { cookie: await cookieOf("engineer") }),
      404,
    );
    const outsider = await cookieFor(world.outsider.userId, world.b.workspaceId);
    await expectError(await sessionRequest("one", "GET", session.id, { cookie: outsider }), 404);
    const trainer = await cookieOf("trainer");
    for (const [route, method, body] of [
      ["one", "DELETE", undefined],
      ["commands", "POST", { type: "write", groupAddress: "1/0/1", value: true }],
      ["endpoint", "POST", undefined],
      ["endpoint", "DELETE", undefined],
      ["client", "DELETE", undefined],
    ] as const) {
      const error = await expectError(
        await sessionRequest(route, method, session.id, { cookie: trainer, body }),
        403,
      );
      expect(error.message).toMatch(/only the session's owner .* or an admin/);
    }
    const apprenticeList = await call((await routes.list()).GET, {
      method: "GET",
      path: "/api/live-sessions",
      cookie: await cookieOf("engineer"),
    });
    expect(((await apprenticeList.json()) as { sessions: unknown[] }).sessions).toEqual([]);
  });

  it("lets an apprentice see only their own sessions", async () => {
    const admins = await start("admin");
    await expectError(
      await sessionRequest("one", "GET", admins.id, { cookie: await cookieOf("apprentice") }),
      404,
    );
  });

  it("answers 401 on every route without a session and 404 for a session that is not there", async () => {
    const session = await start("engineer");
    const cases = [
      ["one", "GET"],
      ["one", "DELETE"],
      ["events", "GET"],
      ["commands", "POST"],
      ["endpoint", "POST"],
      ["endpoint", "DELETE"],
      ["client", "DELETE"],
    ] as const;
    for (const [route, method] of cases) {
      const body = route === "commands" ? { type: "reset" } : undefined;
      await expectError(await sessionRequest(route, method, session.id, { body }), 401);
      await expectError(
        await sessionRequest(route, method, "no-such-session", {
          cookie: await cookieOf("engineer"),
          body,
        }),
        404,
      );
    }
    for (const method of ["GET", "POST"] as const) {
      const handlers = await routes.list();
      const response = await call(handlers[method], {
        method,
        path: "/api/live-sessions",
        ...(method === "POST" ? { body: { benchId: world.a.benchId } } : {}),
      });
      await expectError(response, 401);
    }
  });

  it("lets an admin stop anyone's session; a stopped session is gone", async () => {
    const session = await start("engineer");
    const stopped = await sessionRequest("one", "DELETE", session.id, {
      cookie: await cookieOf("admin"),
    });
    expect(stopped.status).toBe(204);
    await expectError(
      await sessionRequest("one", "GET", session.id, { cookie: await cookieOf("engineer") }),
      404,
    );
  });
});

describe("commands", () => {
  it("applies a command from the owner (202) and refuses bad ones naming the field", async () => {
    const session = await start("engineer");
    const cookie = await cookieOf("engineer");
    const send = (body: unknown) =>
      sessionRequest("commands", "POST", session.id, { cookie, body });
    const ok = await send({ type: "write", groupAddress: "1/0/1", value: true });
    expect(ok.status).toBe(202);
    expect(await ok.json()).toEqual({ ok: true });
    await expectError(await send({ type: "write", value: true }), 400, "groupAddress");
    await expectError(await send({ type: "teleport" }), 400, "type");
    // Refused by the running session itself: its command-error becomes the 400.
    await expectError(
      await send({ type: "press", deviceId: "nobody", buttonId: "b" }),
      400,
      "deviceId",
    );
    // A real-time session keeps its pace: speed changes and time jumps are 409 naming the field.
    await expectError(await send({ type: "play", speed: 10 }), 409, "speed");
    await expectError(await send({ type: "jump", durationUs: 1_000_000 }), 409, "durationUs");
    await expectError(await send({ type: "pause" }), 409, "type");
    await expectError(await send({ type: "load", bench: {} }), 409, "type");
    expect((await send({ type: "play", speed: 1 })).status).toBe(202);
  });
});

describe("the event stream", () => {
  it("sends a new viewer the whole state first, then batches as they happen, and `ended` when stopped", async () => {
    const session = await start("engineer");
    const cookie = await cookieOf("engineer");
    await sessionRequest("commands", "POST", session.id, {
      cookie,
      body: { type: "write", groupAddress: "1/0/1", value: true },
    });
    fake.advance(1000);
    const response = await sessionRequest("events", "GET", session.id, { cookie });
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toMatch(/^text\/event-stream/);
    const stream = sseReader(response);
    const loaded = await stream.next();
    expect(loaded.event).toBe("message");
    expect(simMessageSchema.parse(loaded.data)).toMatchObject({ type: "loaded", fresh: true });
    const state = simMessageSchema.parse((await stream.next()).data);
    // The write before the viewer came is in the state it gets, acknowledged by the actuator.
    expect(state.type === "batch" && state.rows).toContainEqual(
      expect.objectContaining({ destination: "1/0/1", service: "GroupValue_Write", ack: "ack" }),
    );
    expect(state.type === "batch" && state.devices.map((d) => d.id)).toEqual(["act"]);
    const view = await stream.next();
    expect(view.event).toBe("session");
    expect(liveSessionViewSchema.parse(view.data).id).toBe(session.id);

    await sessionRequest("commands", "POST", session.id, {
      cookie,
      body: { type: "write", groupAddress: "1/0/1", value: false },
    });
    fake.advance(500);
    const batch = await stream.next(
      (e) =>
        e.event === "message" &&
        (e.data as { type: string; rows?: { value: string }[] }).rows?.some(
          (r) => r.value === "Off",
        ) === true,
    );
    expect(simMessageSchema.parse(batch.data).type).toBe("batch");

    expect((await sessionRequest("one", "DELETE", session.id, { cookie })).status).toBe(204);
    const rest = await stream.rest();
    expect(rest.at(-1)).toEqual({ event: "ended", data: { reason: "stopped" } });
  });
});

describe("idle stop", () => {
  it("stops a session after the idle time with no viewer, command or tunnel; a viewer keeps it running", async () => {
    const cookie = await cookieOf("engineer");
    const quiet = await start("engineer");
    fake.advance(IDLE_MS - 100);
    expect(registry.size).toBe(1);
    fake.advance(200);
    expect(registry.size).toBe(0);
    await expectError(await sessionRequest("one", "GET", quiet.id, { cookie }), 404);

    const watched = await start("engineer");
    const stream = sseReader(await sessionRequest("events", "GET", watched.id, { cookie }));
    fake.advance(3 * IDLE_MS);
    expect(registry.size).toBe(1);
    // A command counts as activity too: the idle time starts again from it.
    await stream.close();
    await new Promise((resolve) => setTimeout(resolve, 10));
    fake.advance(IDLE_MS / 2);
    await sessionRequest("commands", "POST", watched.id, {
      cookie,
      body: { type: "read", groupAddress: "1/0/1" },
    });
    fake.advance(IDLE_MS - 100);
    expect(registry.size).toBe(1);
    const view = liveSessionViewSchema.parse(
      (
        (await (await sessionRequest("one", "GET", watched.id, { cookie })).json()) as {
          session: unknown;
        }
      ).session,
    );
    expect(Date.parse(view.idleStopAt) - Date.parse(view.lastActivityAt)).toBe(IDLE_MS);
    fake.advance(200);
    expect(registry.size).toBe(0);
  });
});

describe("publishing on KNXnet/IP", () => {
  it("publishes on a loopback port, lists no clients yet, refuses an unknown client, and unpublishes", async () => {
    const session = await start("engineer");
    const cookie = await cookieOf("engineer");
    const published = await sessionRequest("endpoint", "POST", session.id, { cookie });
    expect(published.status, await published.clone().text()).toBe(200);
    const view = liveSessionViewSchema.parse(
      ((await published.json()) as { session: unknown }).session,
    );
    expect(view.endpoint).toMatchObject({ address: "127.0.0.1", loopback: true, clients: [] });
    expect(view.endpoint!.port).toBeGreaterThan(0);
    // Publishing twice changes nothing.
    const again = await sessionRequest("endpoint", "POST", session.id, { cookie });
    expect(((await again.json()) as { session: LiveSessionView }).session.endpoint?.port).toBe(
      view.endpoint!.port,
    );
    await expectError(
      await sessionRequest("client", "DELETE", session.id, { cookie, channelId: "7" }),
      404,
    );
    await expectError(
      await sessionRequest("client", "DELETE", session.id, { cookie, channelId: "x1" }),
      404,
    );
    const unpublished = await sessionRequest("endpoint", "DELETE", session.id, { cookie });
    expect(((await unpublished.json()) as { session: LiveSessionView }).session.endpoint).toBe(
      null,
    );
  });
});

describe("publishing when no port is free", () => {
  it("answers 409 naming the range and leaves the session running unpublished", async () => {
    const taken = dgram.createSocket("udp4");
    await new Promise<void>((resolve) => taken.bind(0, "127.0.0.1", () => resolve()));
    try {
      const port = taken.address().port;
      knxPorts = { first: port, last: port };
      const session = await start("engineer");
      const cookie = await cookieOf("engineer");
      const error = await expectError(
        await sessionRequest("endpoint", "POST", session.id, { cookie }),
        409,
      );
      expect(error.message).toContain(
        `no free UDP port for KNXnet/IP on 127.0.0.1 in ${port}..${port}`,
      );
      const view = await sessionRequest("one", "GET", session.id, { cookie });
      expect(((await view.json()) as { session: LiveSessionView }).session.endpoint).toBe(null);
      // The next attempt, with a free port, publishes.
      knxPorts = { first: 0, last: 0 };
      expect((await sessionRequest("endpoint", "POST", session.id, { cookie })).status).toBe(200);
    } finally {
      taken.close();
    }
  });
});

describe("a tunnel on a session's own clock", () => {
  it("confirms a tunnel's frame once the line has carried it, without waiting for the session's 50 ms tick, and keeps the session from idling until its heartbeat lapses", async () => {
    const session = await start("engineer");
    const cookie = await cookieOf("engineer");
    const published = await sessionRequest("endpoint", "POST", session.id, { cookie });
    const { port } = ((await published.json()) as { session: LiveSessionView }).session.endpoint!;
    const client = await rawKnxNetIpClient(port);
    try {
      const connected = await client.connectTunnel();
      expect(connected.status).toBe(STATUS.E_NO_ERROR);
      const channelId = connected.channelId;
      client.send({
        service: "TUNNELLING_REQUEST",
        channelId,
        sequenceCounter: 0,
        cemi: encodeCemi({
          messageCode: "L_Data.req",
          ackRequest: true,
          frame: {
            priority: "low",
            repeated: false,
            source: 0,
            destination: 0x0801, // 1/0/1, the actuator's switch address
            addressType: "group",
            hopCount: 6,
            service: "GroupValue_Write",
            payload: Uint8Array.of(1),
            shortPayload: true,
          },
        }),
      });
      expect(await client.receive((f) => f.service === "TUNNELLING_ACK")).toBeDefined();
      // 9 octets and the acknowledgement take under 20 ms of line time (knx-reference.md, TP1
      // timing: 193 bit times at 9600 bit/s); the session's first tick is at 50 ms.
      fake.advance(30);
      const confirmation = await client.receive((f) => f.service === "TUNNELLING_REQUEST");
      if (confirmation?.service !== "TUNNELLING_REQUEST") throw new Error("no L_Data.con");
      const cemi = decodeCemi(confirmation.cemi);
      expect(cemi.ok && cemi.value).toMatchObject({
        messageCode: "L_Data.con",
        confirmError: false,
      });
      client.send({
        service: "TUNNELLING_ACK",
        channelId,
        sequenceCounter: confirmation.sequenceCounter,
        status: STATUS.E_NO_ERROR,
      });
      // A heartbeat answered means the acknowledgement before it was taken too (one socket, in order).
      client.send({
        service: "CONNECTIONSTATE_REQUEST",
        channelId,
        controlEndpoint: ROUTE_BACK_HPAI,
      });
      expect(await client.receive((f) => f.service === "CONNECTIONSTATE_RESPONSE")).toMatchObject({
        status: STATUS.E_NO_ERROR,
      });

      // A connected tunnel is activity: past the idle time the session still runs ...
      fake.advance(IDLE_MS + 5_000);
      expect(registry.size).toBe(1);
      // ... until the client's heartbeat lapses (120 s, knx-reference.md) and the server ends
      // the tunnel with a DISCONNECT_REQUEST; the idle time counts from then.
      fake.advance(120_000 - IDLE_MS);
      expect(await client.receive((f) => f.service === "DISCONNECT_REQUEST")).toMatchObject({
        channelId,
      });
      expect(registry.size).toBe(1);
      fake.advance(IDLE_MS);
      expect(registry.size).toBe(0);
    } finally {
      client.close();
    }
  });
});
