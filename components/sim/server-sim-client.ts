import { liveSessionViewSchema } from "@/app/_lib/live/live-session-view";
import type { LiveLinkStore } from "./live-link-store";
import { checkSimMessage, type SimCommand, type SimMessage } from "./sim-protocol";
import type { SimStore } from "./sim-store";
import type { SimTransport } from "./sim-transport";

/** The part of an EventSource the client uses, so tests can hand in a fake. */
export interface EventStreamLike {
  /** 0 connecting, 1 open, 2 closed (the EventSource constants). */
  readonly readyState: number;
  addEventListener(type: string, listener: (event: Event) => void): void;
  close(): void;
}

const STREAM_CLOSED = 2;
/** A stream the server refused is opened again this often while the session still exists. */
const REOPEN_AFTER_MS = 2000;
/** Refused streams in a row before the console says it lost the session. */
const MAX_REOPENS = 5;

export interface ServerSimClientOptions {
  readonly sessionId: string;
  readonly store: SimStore;
  readonly link: LiveLinkStore;
  readonly openStream?: (url: string) => EventStreamLike;
  readonly fetch?: typeof fetch;
  readonly reopenAfterMs?: number;
}

/** The name a refusal reports for a command, as the worker's command-errors do. */
function commandName(command: SimCommand): string {
  return command.type === "input" ? command.input.kind : command.type;
}

/**
 * An API error body as { error: string, field? } or { error: { message, field? } }; anything
 * else (an HTML error page from a proxy) becomes a sentence with the status.
 */
export async function readApiError(
  response: Response,
): Promise<{ message: string; field?: string }> {
  const fallback = { message: `the server answered ${response.status}` };
  let body: unknown;
  try {
    body = await response.json();
  } catch {
    return fallback;
  }
  if (typeof body !== "object" || body === null) return fallback;
  const { error, field } = body as { error?: unknown; field?: unknown };
  const nested =
    typeof error === "object" && error !== null
      ? (error as { message?: unknown; field?: unknown })
      : null;
  const message = typeof error === "string" ? error : nested?.message;
  const named = typeof field === "string" ? field : nested?.field;
  if (typeof message !== "string" || message === "") return fallback;
  return typeof named === "string" ? { message, field: named } : { message };
}

/**
 * The server transport: the session runs in the server process at real time,
 * its messages arrive on the event stream (GET /api/live-sessions/:id/events,
 * the same SimMessage JSON the worker posts) and commands go out as POSTs to
 * /api/live-sessions/:id/commands, one at a time in the order they were sent.
 *
 * Messages get the page's envelope check, as the worker's do: the server runs
 * the same engine code, and the full schema cannot be used on JSON anyway (an
 * object without a value yet has `raw: undefined`, which JSON drops and the
 * schema requires). What is not JSON, not a protocol type, or breaks the fold
 * is counted and skipped, and the console keeps going. A refused command comes back into the store as a command-error
 * naming the field (the console shows it like a worker's refusal). On
 * (re)connect the server first sends the session's whole current state, so a
 * reconnect needs nothing from the client but to keep listening. When the
 * stream ends, the session is asked for once: gone means ended, there means
 * open the stream again (a bounded number of times).
 */
export class ServerSimClient implements SimTransport {
  private readonly base: string;
  private readonly fetch: typeof fetch;
  private readonly openStream: (url: string) => EventStreamLike;
  private readonly reopenAfterMs: number;
  private stream: EventStreamLike | null = null;
  private reopens = 0;
  private reopenTimer: ReturnType<typeof setTimeout> | undefined;
  private queue: Promise<void> = Promise.resolve();
  private disposed = false;

  constructor(private readonly options: ServerSimClientOptions) {
    this.base = `/api/live-sessions/${encodeURIComponent(options.sessionId)}`;
    this.fetch = options.fetch ?? ((input, init) => fetch(input, init));
    this.openStream = options.openStream ?? ((url) => new EventSource(url));
    this.reopenAfterMs = options.reopenAfterMs ?? REOPEN_AFTER_MS;
    this.open();
  }

  /** Posts the command after the ones before it; a refusal lands in the store. */
  send(command: SimCommand): void {
    // Each post answers its own failures; the catch only keeps one bug from stalling every later command.
    this.queue = this.queue.then(() => this.post(command)).catch(() => undefined);
  }

  /** Resolves when every command sent so far has its answer (tests). */
  settled(): Promise<void> {
    return this.queue;
  }

  dispose(): void {
    this.disposed = true;
    clearTimeout(this.reopenTimer);
    this.stream?.close();
    this.stream = null;
  }

  private get link() {
    return this.options.link.getState();
  }

  private open(): void {
    const stream = this.openStream(`${this.base}/events`);
    this.stream = stream;
    stream.addEventListener("open", () => {
      this.reopens = 0;
      this.link.setStatus("live");
    });
    stream.addEventListener("message", (event) => this.onMessage(event as MessageEvent<string>));
    stream.addEventListener("session", (event) => this.onSession(event as MessageEvent<string>));
    stream.addEventListener("ended", (event) => this.onEnded(event as MessageEvent<string>));
    stream.addEventListener("error", () => this.onError(stream));
  }

  private onMessage(event: MessageEvent<string>): void {
    const message = this.read<SimMessage>(event, (raw) => {
      try {
        return { success: true as const, data: checkSimMessage(raw) };
      } catch {
        return { success: false as const };
      }
    });
    if (message === null) return;
    this.link.setStatus("live");
    try {
      this.options.store.getState().apply(message);
    } catch {
      // A message of a known type with the wrong shape: skipped, the console keeps going.
      this.link.countUnreadable();
    }
  }

  private onSession(event: MessageEvent<string>): void {
    const view = this.read(event, (raw) => liveSessionViewSchema.safeParse(raw));
    if (view !== null) this.link.setSession(view);
  }

  private onEnded(event: MessageEvent<string>): void {
    const body = this.read(event, (raw) =>
      typeof raw === "object" &&
      raw !== null &&
      typeof (raw as { reason?: unknown }).reason === "string"
        ? { success: true as const, data: (raw as { reason: string }).reason }
        : { success: false as const },
    );
    this.end(body ?? "ended");
  }

  /** Parses one event's JSON data with `check`; null (and counted) when it does not pass. */
  private read<T>(
    event: MessageEvent<string>,
    check: (raw: unknown) => { success: true; data: T } | { success: false },
  ): T | null {
    if (this.disposed) return null;
    let raw: unknown;
    try {
      raw = JSON.parse(event.data);
    } catch {
      this.link.countUnreadable();
      return null;
    }
    const checked = check(raw);
    if (checked.success) return checked.data;
    this.link.countUnreadable();
    return null;
  }

  private onError(stream: EventStreamLike): void {
    if (this.disposed || stream !== this.stream || this.link.status === "ended") return;
    this.link.setStatus("reconnecting");
    // A network drop leaves the EventSource retrying on its own; a refused stream
    // (404 after a restart, 401 after sign-out, a 5xx) closes it for good.
    if (stream.readyState === STREAM_CLOSED) void this.askAfterRefusal();
  }

  private async askAfterRefusal(): Promise<void> {
    let status: number | null = null;
    try {
      status = (await this.fetch(this.base, { headers: { Accept: "application/json" } })).status;
    } catch {
      // The server is not answering at all; try the stream again below.
    }
    if (this.disposed) return;
    if (status === 404 || status === 403) return this.end("gone");
    if (status === 401) return this.end("signed-out");
    if (++this.reopens > MAX_REOPENS) return this.end("lost");
    this.reopenTimer = setTimeout(() => {
      if (!this.disposed && this.link.status !== "ended") this.open();
    }, this.reopenAfterMs);
  }

  private end(reason: string): void {
    this.link.end(reason);
    this.stream?.close();
  }

  private async post(command: SimCommand): Promise<void> {
    if (this.disposed) return;
    const refuse = (message: string, field?: string) => {
      if (this.disposed) return;
      this.options.store.getState().apply({
        type: "command-error",
        command: commandName(command),
        message,
        ...(field === undefined ? {} : { field }),
      });
    };
    if (this.link.status === "ended") return refuse("the session has ended; nothing was sent");
    let response: Response;
    try {
      response = await this.fetch(`${this.base}/commands`, {
        method: "POST",
        headers: { "Content-Type": "application/json", Accept: "application/json" },
        body: JSON.stringify(command),
      });
    } catch {
      return refuse("the server could not be reached; the command was not sent");
    }
    if (response.ok) return;
    const error = await readApiError(response);
    if (response.status === 404) this.end("gone");
    refuse(error.message, error.field);
  }
}
