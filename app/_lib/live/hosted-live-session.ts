import { LiveSession, type SimMessage } from "@/engine";
import type { KnxNetIpSettings } from "../config";
import { AppError } from "../errors";
import type { Who } from "../policy/policy";
import type { LiveSessionClock } from "./live-session-clock";
import { LiveSessionLine } from "./live-session-line";
import type { LiveSessionEndReason, LiveSessionView } from "./live-session-view";
import { SessionEndpoint, type ServerOverrides } from "./session-endpoint";

/** What goes to one viewer's event stream. */
export type LiveSessionEvent =
  | { readonly event: "message"; readonly data: SimMessage }
  | { readonly event: "session"; readonly data: LiveSessionView }
  | { readonly event: "ended"; readonly data: { readonly reason: LiveSessionEndReason } };

export interface Viewer {
  readonly who: Who;
  send(event: LiveSessionEvent): void;
}

/**
 * Batches go out this often, wall ms: the browser worker's tick (components/sim/sim.worker.ts),
 * so a server session reads on the console exactly like a local one.
 */
export const TICK_MS = 50;
/** The session's view goes to viewers at most this often when its endpoint or clients change. */
const VIEW_EVERY_MS = 1000;

/** Which session this is: the bench revision it runs, where, and who started it. */
export interface LiveSessionIdentity {
  readonly id: string;
  readonly workspaceId: string;
  readonly benchId: string;
  readonly benchName: string;
  readonly revision: number;
  readonly owner: { readonly memberId: string; readonly name: string };
}

export interface HostedLiveSessionInit extends LiveSessionIdentity {
  readonly document: unknown;
  readonly clock: LiveSessionClock;
  readonly idleMs: number;
  /** Called once when the session has ended, whatever the reason. */
  readonly onEnded: (session: HostedLiveSession) => void;
}

/**
 * One live session hosted by the server process: the engine's LiveSession at
 * 1x on the wall clock, ticked by a timer whether anyone watches or not, its
 * messages fanned out to every viewer, and, once published, a KNXnet/IP
 * endpoint on its line. Construction either yields a running session or
 * throws with nothing left behind (no timer, no socket).
 */
export class HostedLiveSession {
  readonly identity: LiveSessionIdentity;
  readonly startedAtMs: number;

  private readonly clock: LiveSessionClock;
  private readonly idleMs: number;
  private readonly onEnded: (session: HostedLiveSession) => void;
  private readonly live: LiveSession;
  private readonly line: LiveSessionLine;
  private readonly viewers = new Set<Viewer>();
  private lastActivityMs: number;
  private tickTimer: unknown;
  private wakeTimer: unknown;
  private wakeAtMs = Infinity;
  private ended = false;
  private endpoint: SessionEndpoint | undefined;
  private publishing: Promise<void> | undefined;
  private lastViewKey = "";
  private lastViewSentMs = -Infinity;
  /** While a command is handled: its errors are answered to the sender, not broadcast. */
  private commandErrors: Extract<SimMessage, { type: "command-error" }>[] | undefined;
  private loadFailure: string | undefined;

  constructor(init: HostedLiveSessionInit) {
    const { id, workspaceId, benchId, benchName, revision, owner } = init;
    this.identity = { id, workspaceId, benchId, benchName, revision, owner };
    this.clock = init.clock;
    this.idleMs = init.idleMs;
    this.onEnded = init.onEnded;
    this.startedAtMs = init.clock.epochMs();
    this.lastActivityMs = this.startedAtMs;
    this.line = new LiveSessionLine(
      () => this.live,
      () => this.scheduleWake(),
    );
    this.live = new LiveSession({
      post: (message) => this.post(message),
      now: () => this.clock.nowMs(),
      onSimulation: (sim) => {
        // A reset starts a new run: the tunnels of the old one end the way the spec says.
        this.endpoint?.disconnectAll();
        this.line.attach(sim);
      },
    });
    this.live.handle({ type: "load", bench: init.document, seed: 1 });
    if (this.loadFailure !== undefined) {
      this.line.stop();
      throw new AppError(
        "conflict",
        `revision ${init.revision} of this bench does not load: ${this.loadFailure}`,
        { field: "revision" },
      );
    }
    this.live.handle({ type: "play", speed: 1 });
    this.scheduleTick();
  }

  // ---------------------------------------------------------------- viewers and commands

  /** Adds a viewer: it gets the full current state at once, then everything as it happens. */
  watch(viewer: Viewer): () => void {
    for (const message of this.live.currentState())
      viewer.send({ event: "message", data: message });
    viewer.send({ event: "session", data: this.view(viewer.who) });
    this.viewers.add(viewer);
    this.touch();
    return () => {
      if (this.viewers.delete(viewer)) this.touch();
    };
  }

  /** Applies a checked command; a refusal by the session comes back as its command-error. */
  command(command: unknown): Extract<SimMessage, { type: "command-error" }> | undefined {
    this.touch();
    const errors: Extract<SimMessage, { type: "command-error" }>[] = [];
    this.commandErrors = errors;
    try {
      this.live.handle(command);
      // A reset starts the new run paused, as in the browser; a server session runs at real time.
      if ((command as { type?: unknown }).type === "reset")
        this.live.handle({ type: "play", speed: 1 });
    } finally {
      this.commandErrors = undefined;
    }
    this.line.deliver();
    this.scheduleWake();
    return errors[0];
  }

  private post(message: SimMessage): void {
    if (message.type === "command-error" && this.commandErrors !== undefined) {
      this.commandErrors.push(message);
      return;
    }
    if (message.type === "load-failed") {
      this.loadFailure = message.errors.map((e) => e.message).join("; ");
      return;
    }
    for (const viewer of [...this.viewers]) viewer.send({ event: "message", data: message });
  }

  private touch(): void {
    this.lastActivityMs = this.clock.epochMs();
  }

  // ---------------------------------------------------------------- time

  private scheduleTick(): void {
    this.tickTimer = this.clock.setTimeout(() => {
      this.tickTimer = undefined;
      if (this.ended) return;
      this.tick();
      if (!this.ended) this.scheduleTick();
    }, TICK_MS);
  }

  /** One regular tick: run to the wall clock, post a batch, hand the line's news to the endpoint, check idleness. */
  tick(): void {
    this.live.tick();
    this.line.deliver();
    const nowMs = this.clock.epochMs();
    if (this.viewers.size > 0 || (this.endpoint?.clientCount ?? 0) > 0) this.lastActivityMs = nowMs;
    if (nowMs - this.lastActivityMs >= this.idleMs) {
      void this.end("idle");
      return;
    }
    if (nowMs - this.lastViewSentMs >= VIEW_EVERY_MS) this.sendViewIfChanged(nowMs);
    this.scheduleWake();
  }

  /**
   * Between ticks, wakes up when the line may have something for a tunnel (a
   * frame ending, a confirmation), so KNXnet/IP clients are not held to the
   * 50 ms batch rhythm. Only while tunnels are open.
   */
  private scheduleWake(): void {
    if (this.ended || (this.endpoint?.clientCount ?? 0) === 0) return;
    const inMs = this.line.nextDueInMs();
    if (inMs === undefined || inMs >= TICK_MS) return;
    const atMs = this.clock.nowMs() + Math.max(1, inMs);
    if (this.wakeTimer !== undefined && this.wakeAtMs <= atMs) return;
    if (this.wakeTimer !== undefined) this.clock.clearTimeout(this.wakeTimer);
    this.wakeAtMs = atMs;
    this.wakeTimer = this.clock.setTimeout(
      () => {
        this.wakeTimer = undefined;
        this.wakeAtMs = Infinity;
        if (this.ended) return;
        this.live.advanceToNow();
        this.line.deliver();
        this.scheduleWake();
      },
      Math.ceil(Math.max(1, inMs)),
    );
  }

  // ---------------------------------------------------------------- KNXnet/IP

  /** Publishes the session on KNXnet/IP; a second call while the first binds waits for it. */
  async publish(settings: KnxNetIpSettings, server: ServerOverrides = {}): Promise<void> {
    if (this.endpoint !== undefined) return;
    this.publishing ??= this.bind(settings, server).finally(() => (this.publishing = undefined));
    await this.publishing;
  }

  private async bind(settings: KnxNetIpSettings, server: ServerOverrides): Promise<void> {
    const sim = this.live.simulation;
    if (sim === undefined) throw new AppError("conflict", "the session has no running bench");
    const endpoint = await SessionEndpoint.open({
      line: this.line,
      bench: sim.bench,
      settings,
      server,
      clock: this.clock,
      onClientsChanged: () => {
        this.touch();
        this.lastViewSentMs = -Infinity; // a client came or went: tell viewers at the next tick
      },
    });
    if (this.ended) {
      await endpoint.close();
      throw new AppError("not_found", "no such live session");
    }
    this.endpoint = endpoint;
    this.live.setTunnelSources(endpoint.tunnelAddresses);
    this.sendViewIfChanged(this.clock.epochMs());
  }

  /** Takes the session off KNXnet/IP: every tunnel gets a DISCONNECT_REQUEST, then the socket closes. */
  async unpublish(): Promise<void> {
    if (this.publishing !== undefined) await this.publishing.catch(() => undefined);
    const endpoint = this.endpoint;
    this.endpoint = undefined;
    this.live.setTunnelSources([]);
    if (endpoint !== undefined) await endpoint.close();
    this.sendViewIfChanged(this.clock.epochMs());
  }

  /** False when no tunnel has that channel. */
  disconnectClient(channelId: number): boolean {
    if (this.endpoint?.disconnect(channelId) !== true) return false;
    this.sendViewIfChanged(this.clock.epochMs());
    return true;
  }

  /** The running simulation: benchmarks read its trace and line statistics. */
  get simulation() {
    return this.live.simulation;
  }

  // ---------------------------------------------------------------- ending

  get isEnded(): boolean {
    return this.ended;
  }

  /**
   * Ends the session: timers stop, tunnels get their DISCONNECT_REQUEST (sent
   * before this returns its promise's first await, so a process exiting right
   * after still sends them), viewers get `ended` and their streams close.
   */
  end(reason: LiveSessionEndReason): Promise<void> {
    if (this.ended) return Promise.resolve();
    this.ended = true;
    if (this.tickTimer !== undefined) this.clock.clearTimeout(this.tickTimer);
    if (this.wakeTimer !== undefined) this.clock.clearTimeout(this.wakeTimer);
    const endpoint = this.endpoint;
    this.endpoint = undefined;
    const closing = endpoint?.close() ?? Promise.resolve();
    this.line.stop();
    for (const viewer of [...this.viewers]) viewer.send({ event: "ended", data: { reason } });
    this.viewers.clear();
    this.onEnded(this);
    return closing;
  }

  // ---------------------------------------------------------------- views

  private sendViewIfChanged(nowMs: number): void {
    const key = JSON.stringify(this.endpointView());
    if (key === this.lastViewKey) return;
    this.lastViewKey = key;
    this.lastViewSentMs = nowMs;
    for (const viewer of [...this.viewers])
      viewer.send({ event: "session", data: this.view(viewer.who, this.canControl(viewer.who)) });
  }

  /** Whether `who` may command, publish, disconnect clients and stop: the owner or an admin. */
  canControl(who: Who): boolean {
    return who.userId === this.identity.owner.memberId || who.role === "admin";
  }

  view(who: Who, canControl = this.canControl(who)): LiveSessionView {
    return {
      id: this.identity.id,
      benchId: this.identity.benchId,
      benchName: this.identity.benchName,
      revision: this.identity.revision,
      owner: this.identity.owner,
      startedAt: new Date(this.startedAtMs).toISOString(),
      lastActivityAt: new Date(this.lastActivityMs).toISOString(),
      idleStopAt: new Date(this.lastActivityMs + this.idleMs).toISOString(),
      canControl,
      endpoint: this.endpointView(),
    };
  }

  private endpointView() {
    return this.endpoint?.view(this.startedAtMs) ?? null;
  }
}
