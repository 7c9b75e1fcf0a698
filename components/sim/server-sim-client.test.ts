import { afterEach, describe, expect, it, vi } from "vitest";
import { LiveSession } from "@/engine";
import { trainingRoomBench } from "@/test/harness/training-room-bench";
import { createLiveLinkStore } from "./live-link-store";
import { ServerSimClient, type EventStreamLike } from "./server-sim-client";
import type { LogRow, SimCommand, SimMessage } from "./sim-protocol";
import { createSimStore } from "./sim-store";
import { publishedSessionView } from "@/test/harness/live-session-views";

/**
 * The server transport against a fake EventSource and a fake fetch, fed with
 * messages a real LiveSession (the engine code the server runs) produced: what
 * arrives on the stream must land in the store exactly as the worker's
 * messages do, and everything else (bad data, refusals, breaks, the end) must
 * be shown, never applied.
 */

/** An EventSource stand-in the test drives: open, deliver events, drop or refuse. */
class FakeStream implements EventStreamLike {
  readyState = 0;
  closed = false;
  private readonly listeners = new Map<string, ((event: Event) => void)[]>();
  constructor(readonly url: string) {}
  addEventListener(type: string, listener: (event: Event) => void): void {
    this.listeners.set(type, [...(this.listeners.get(type) ?? []), listener]);
  }
  close(): void {
    this.readyState = 2;
    this.closed = true;
  }
  private emit(type: string, data?: string): void {
    const event = { type, data } as unknown as Event;
    for (const listener of this.listeners.get(type) ?? []) listener(event);
  }
  open(): void {
    this.readyState = 1;
    this.emit("open");
  }
  /** One SSE event with its data line, as the browser hands it over. */
  deliver(type: string, data: unknown): void {
    this.emit(type, typeof data === "string" ? data : JSON.stringify(data));
  }
  /** A network drop: the browser keeps the stream and retries by itself. */
  drop(): void {
    this.readyState = 0;
    this.emit("error");
  }
  /** A refused (re)connection (404, 401, 5xx): the browser closes the stream for good. */
  refuse(): void {
    this.readyState = 2;
    this.emit("error");
  }
}

/** The messages a live session of the training-room bench posts: load, then a write and its batches. */
function sessionMessages(): SimMessage[] {
  const messages: SimMessage[] = [];
  let wallMs = 0;
  const session = new LiveSession({
    post: (message) => messages.push(structuredClone(message)),
    now: () => wallMs,
  });
  session.handle({ type: "load", bench: trainingRoomBench });
  session.handle({ type: "play", speed: 1 });
  session.handle({ type: "write", groupAddress: "1/0/1", value: true });
  for (let i = 0; i < 20; i++) {
    wallMs += 50;
    session.tick();
  }
  return messages;
}

const view = publishedSessionView;

type FetchCall = { url: string; init: RequestInit | undefined };

function json(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { "Content-Type": "application/json" },
  });
}

function wired(
  answer: (call: FetchCall) => Response | Promise<Response> = () => json(202, { ok: true }),
) {
  const store = createSimStore();
  const link = createLiveLinkStore("ls-1");
  const streams: FakeStream[] = [];
  const calls: FetchCall[] = [];
  const client = new ServerSimClient({
    sessionId: "ls-1",
    store,
    link,
    reopenAfterMs: 1000,
    openStream: (url) => {
      const stream = new FakeStream(url);
      streams.push(stream);
      return stream;
    },
    fetch: (async (input: RequestInfo | URL, init?: RequestInit) => {
      const call = { url: String(input), init };
      calls.push(call);
      return answer(call);
    }) as typeof fetch,
  });
  return {
    store,
    link,
    client,
    calls,
    streams,
    get stream() {
      return streams[streams.length - 1]!;
    },
  };
}

function rows(store: ReturnType<typeof createSimStore>): LogRow[] {
  const log = store.getState().log;
  return Array.from({ length: log.length }, (_, i) => log.at(i));
}

afterEach(() => vi.useRealTimers());

describe("ServerSimClient: the event stream", () => {
  it("opens the session's event stream and applies its messages as the worker's are applied", () => {
    const messages = sessionMessages();
    expect(messages.some((m) => m.type === "batch" && m.rows.length > 0)).toBe(true);
    const direct = createSimStore();
    for (const message of messages) direct.getState().apply(message);

    const w = wired();
    expect(w.stream.url).toBe("/api/live-sessions/ls-1/events");
    expect(w.link.getState().status).toBe("connecting");
    w.stream.open();
    for (const message of messages) w.stream.deliver("message", message);

    expect(w.link.getState().status).toBe("live");
    const state = w.store.getState();
    expect(state.status).toBe("ready");
    expect(state.bench?.name).toBe(direct.getState().bench?.name);
    expect(state.clock).toEqual(direct.getState().clock);
    expect(rows(w.store)).toEqual(rows(direct));
    expect(Object.keys(state.devices)).toEqual(Object.keys(direct.getState().devices));
    expect(w.link.getState().unreadable).toBe(0);
  });

  it("keeps the tunnel a telegram came in over, so the log can mark it", () => {
    const messages = sessionMessages();
    const batch = messages.find(
      (m): m is Extract<SimMessage, { type: "batch" }> => m.type === "batch" && m.rows.length > 0,
    )!;
    const w = wired();
    w.stream.deliver("message", messages[0]); // loaded
    w.stream.deliver("message", {
      ...batch,
      rows: [{ ...batch.rows[0]!, source: "1.1.241", deviceId: "", tunnel: "1.1.241" }],
    });
    expect(rows(w.store).at(-1)).toMatchObject({ source: "1.1.241", tunnel: "1.1.241" });
  });

  it("skips and counts what it cannot read: not JSON, an unknown type, a batch without rows", () => {
    const messages = sessionMessages();
    const w = wired();
    w.stream.open();
    w.stream.deliver("message", messages[0]);
    const before = w.store.getState();
    w.stream.deliver("message", "{not json");
    w.stream.deliver("message", { type: "teleport" });
    w.stream.deliver("message", { type: "batch", seq: 1, clock: before.clock });
    w.stream.deliver("session", { id: "ls-1" });
    expect(w.link.getState().unreadable).toBe(4);
    expect(w.store.getState().batches).toBe(before.batches);
    expect(w.store.getState().log.length).toBe(before.log.length);
    expect(w.link.getState().session).toBeNull();
  });

  it("takes the session's view (endpoint, clients) from `session` events", () => {
    const w = wired();
    w.stream.deliver("session", view);
    expect(w.link.getState().session).toEqual(view);
    const unpublished = { ...view, endpoint: null };
    w.stream.deliver("session", unpublished);
    expect(w.link.getState().session?.endpoint).toBeNull();
  });

  it("reconnects after a drop, and the state the server resends replaces the old log instead of doubling it", () => {
    const messages = sessionMessages();
    const w = wired();
    w.stream.open();
    for (const message of messages) w.stream.deliver("message", message);
    const count = w.store.getState().log.length;
    w.stream.drop();
    expect(w.link.getState().status).toBe("reconnecting");
    // The browser's EventSource reconnects by itself: same stream, no new one.
    expect(w.streams).toHaveLength(1);
    w.stream.open();
    expect(w.link.getState().status).toBe("live");
    for (const message of messages) w.stream.deliver("message", message);
    expect(w.store.getState().log.length).toBe(count);
  });

  it("ends on an `ended` event, says why, closes the stream and sends no more commands", async () => {
    const w = wired();
    w.stream.open();
    w.stream.deliver("session", view);
    w.stream.deliver("ended", { reason: "idle" });
    const link = w.link.getState();
    expect(link.status).toBe("ended");
    expect(link.ended).toEqual({
      reason: "idle",
      text: "The session stopped after a time with no activity.",
    });
    // Its tunnels went with it.
    expect(link.session?.endpoint).toBeNull();
    expect(w.stream.closed).toBe(true);
    // A stream error after the end is not a reconnect.
    w.stream.refuse();
    expect(w.link.getState().status).toBe("ended");

    w.client.send({ type: "pause" });
    await w.client.settled();
    expect(w.calls).toHaveLength(0);
    expect(w.store.getState().lastError).toMatchObject({
      command: "pause",
      message: "the session has ended; nothing was sent",
    });
  });

  it("names each end distinctly: shutdown or restart, owner's stop, gone, one not known yet", () => {
    for (const [reason, text] of [
      ["shutdown", /server stopped or restarted/],
      ["gone", /no longer runs on the server/],
      ["stopped", /owner stopped it/],
      ["something-new", /ended \(something-new\)/],
    ] as const) {
      const w = wired();
      w.stream.deliver("ended", { reason });
      expect(w.link.getState().ended?.text).toMatch(text);
    }
  });

  it("asks for the session when the stream is refused: gone means ended", async () => {
    const w = wired((call) =>
      call.url === "/api/live-sessions/ls-1"
        ? json(404, { error: "no such session" })
        : json(202, {}),
    );
    w.stream.open();
    w.stream.refuse();
    await vi.waitFor(() => expect(w.link.getState().status).toBe("ended"));
    expect(w.link.getState().ended?.reason).toBe("gone");
    expect(w.calls.map((c) => c.url)).toEqual(["/api/live-sessions/ls-1"]);
  });

  it("opens the stream again while the session still exists, and gives up after five refusals in a row", async () => {
    vi.useFakeTimers();
    const w = wired((call) =>
      call.url === "/api/live-sessions/ls-1" ? json(200, { session: view }) : json(202, {}),
    );
    for (let attempt = 1; attempt <= 5; attempt++) {
      w.stream.refuse();
      await vi.advanceTimersByTimeAsync(1000);
      expect(w.streams).toHaveLength(attempt + 1);
      expect(w.link.getState().status).toBe("reconnecting");
    }
    w.stream.refuse();
    await vi.advanceTimersByTimeAsync(1000);
    expect(w.streams).toHaveLength(6);
    expect(w.link.getState().ended?.reason).toBe("lost");
  });

  it("counts refusals in a row only: an opened stream starts the count again", async () => {
    vi.useFakeTimers();
    const w = wired(() => json(200, { session: view }));
    for (let attempt = 0; attempt < 8; attempt++) {
      w.stream.refuse();
      await vi.advanceTimersByTimeAsync(1000);
      w.stream.open();
    }
    expect(w.link.getState().status).toBe("live");
    expect(w.streams).toHaveLength(9);
  });

  it("stops listening when disposed", async () => {
    const w = wired();
    w.client.dispose();
    expect(w.stream.closed).toBe(true);
    w.stream.deliver("message", sessionMessages()[0]);
    expect(w.store.getState().status).toBe("idle");
  });
});

describe("ServerSimClient: commands", () => {
  it("posts each command as JSON to the session's commands, in the order sent", async () => {
    let release: () => void = () => {};
    const first = new Promise<void>((resolve) => (release = resolve));
    const w = wired(async (call) => {
      if (call.init?.body === JSON.stringify({ type: "write", groupAddress: "1/0/1", value: true }))
        await first;
      return json(202, { ok: true });
    });
    w.client.send({ type: "write", groupAddress: "1/0/1", value: true });
    w.client.send({ type: "pause" });
    await Promise.resolve();
    // The second waits for the first's answer, so the server sees them in order.
    expect(w.calls).toHaveLength(1);
    release();
    await w.client.settled();
    expect(w.calls.map((c) => [c.url, c.init?.method, JSON.parse(String(c.init?.body))])).toEqual([
      [
        "/api/live-sessions/ls-1/commands",
        "POST",
        { type: "write", groupAddress: "1/0/1", value: true },
      ],
      ["/api/live-sessions/ls-1/commands", "POST", { type: "pause" }],
    ]);
    expect(w.store.getState().lastError).toBeNull();
  });

  it("shows a refused command's message and field, in either error body shape", async () => {
    const answers = [
      json(400, { error: "groupAddress is not a group address", field: "groupAddress" }),
      json(409, {
        error: { code: "conflict", message: "a server session runs in real time", field: "speed" },
      }),
      json(403, {
        error: { code: "forbidden", message: "only the session's owner sends commands" },
      }),
      new Response("<html>bad gateway</html>", { status: 502 }),
    ];
    const w = wired(() => answers.shift()!);
    const errors: unknown[] = [];
    w.store.subscribe((s) => errors.push(s.lastError));
    w.client.send({ type: "write", groupAddress: "9/9/9/9", value: true });
    w.client.send({ type: "play", speed: 10 });
    w.client.send({ type: "input", input: { kind: "read", groupAddress: "1/0/1" } } as SimCommand);
    w.client.send({ type: "reset" });
    await w.client.settled();
    expect(errors.filter(Boolean).map((e) => e as object)).toEqual([
      expect.objectContaining({
        command: "write",
        field: "groupAddress",
        message: "groupAddress is not a group address",
      }),
      expect.objectContaining({
        command: "play",
        field: "speed",
        message: "a server session runs in real time",
      }),
      expect.objectContaining({
        command: "read",
        message: "only the session's owner sends commands",
      }),
      expect.objectContaining({ command: "reset", message: "the server answered 502" }),
    ]);
  });

  it("says when the server cannot be reached, and ends the session when the command finds it gone", async () => {
    const answers: (() => Response)[] = [
      () => {
        throw new TypeError("fetch failed");
      },
      () => json(404, { error: "no such session" }),
    ];
    const w = wired(() => answers.shift()!());
    w.client.send({ type: "pause" });
    await w.client.settled();
    expect(w.store.getState().lastError?.message).toMatch(/could not be reached/);
    expect(w.link.getState().status).not.toBe("ended");
    w.client.send({ type: "pause" });
    await w.client.settled();
    expect(w.link.getState().ended?.reason).toBe("gone");
    expect(w.stream.closed).toBe(true);
  });
});
