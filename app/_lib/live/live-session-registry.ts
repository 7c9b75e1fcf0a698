import { randomUUID } from "node:crypto";
import { parseSimCommand } from "@/engine";
import { findRevision } from "@/db/queries/bench-history";
import { findBench, latestRevision } from "@/db/queries/benches";
import { scopeOf } from "../capabilities";
import {
  knxNetIpSettings,
  liveSessionLimits,
  type KnxNetIpSettings,
  type LiveSessionLimits,
} from "../config";
import type { VerifiedSession } from "../dal";
import { AppError } from "../errors";
import { benchCan, loadBench } from "../policy/bench";
import { notFound, type Who } from "../policy/policy";
import { HostedLiveSession, type LiveSessionEvent } from "./hosted-live-session";
import { systemLiveSessionClock, type LiveSessionClock } from "./live-session-clock";
import type { LiveSessionView } from "./live-session-view";
import type { ServerOverrides } from "./session-endpoint";

export type { LiveSessionEvent } from "./hosted-live-session";

/**
 * The server-hosted live sessions of this process, in memory: they survive
 * nothing, and a stopping process ends them (instrumentation.ts). Every
 * method takes the verified session of the request and applies the live
 * console's access rules itself:
 *
 * - starting needs the bench policy's "run" on the bench (as opening it live);
 * - seeing a session needs the bench to be readable, and either owning the
 *   session or holding the live console workspace-wide (a trainer watches an
 *   apprentice's lab copy; an apprentice sees only their own);
 * - commanding, publishing, disconnecting a client and stopping belong to the
 *   owner and to admins.
 *
 * A session one may not see is 404, one that may be seen but not controlled 403.
 */
export interface LiveSessionRegistryOptions {
  readonly clock?: LiveSessionClock;
  readonly limits?: () => LiveSessionLimits;
  readonly knxNetIp?: () => KnxNetIpSettings;
  /** Tunnelling-server overrides (tests shorten the heartbeat timeout). */
  readonly tunnellingServer?: ServerOverrides;
}

/** Commands a real-time session refuses: they would pause, jump or replace the running bench. */
const FIXED_PACE_REFUSALS: Readonly<Record<string, { field: string; message: string }>> = {
  load: {
    field: "type",
    message: "a server session runs the bench revision it was started with; start another session",
  },
  pause: { field: "type", message: "a server session runs at real time and cannot pause" },
  step: { field: "type", message: "a server session runs at real time and cannot step" },
  jump: {
    field: "durationUs",
    message: "a server session runs at real time and cannot jump ahead",
  },
  "scene-dry-run": {
    field: "type",
    message: "a scene dry-run jumps virtual time ahead; run it in a local session",
  },
};

export class LiveSessionRegistry {
  private readonly sessions = new Map<string, HostedLiveSession>();
  private readonly clock: LiveSessionClock;
  private readonly limits: () => LiveSessionLimits;
  private readonly knxNetIp: () => KnxNetIpSettings;
  private readonly tunnellingServer: ServerOverrides;

  constructor(options: LiveSessionRegistryOptions = {}) {
    this.clock = options.clock ?? systemLiveSessionClock;
    this.limits = options.limits ?? liveSessionLimits;
    this.knxNetIp = options.knxNetIp ?? knxNetIpSettings;
    this.tunnellingServer = options.tunnellingServer ?? {};
  }

  /** Starts a session of the bench's latest revision (or `revision`), running at 1x; registered only once running. */
  start(
    who: Pick<VerifiedSession, "userId" | "workspaceId" | "role" | "name">,
    input: { readonly benchId: string; readonly revision?: number | undefined },
  ): LiveSessionView {
    const bench = loadBench(who, input.benchId, "run", { field: "benchId" });
    const revision =
      input.revision === undefined
        ? latestRevision({ benchId: bench.id })
        : findRevision({ benchId: bench.id, number: input.revision });
    if (revision === undefined)
      throw new AppError("not_found", "revision: no such revision of this bench", {
        field: "revision",
      });
    const limits = this.limits();
    const mine = [...this.sessions.values()].filter(
      (s) => s.identity.owner.memberId === who.userId,
    );
    if (mine.length >= limits.perMember)
      throw new AppError(
        "rate_limited",
        `you already run ${mine.length} live sessions on the server (LIVE_SESSION_LIMIT_PER_MEMBER = ${limits.perMember}); stop one first`,
      );
    const workspace = [...this.sessions.values()].filter(
      (s) => s.identity.workspaceId === who.workspaceId,
    );
    if (workspace.length >= limits.perWorkspace)
      throw new AppError(
        "rate_limited",
        `this workspace already runs ${workspace.length} live sessions on the server (LIVE_SESSION_LIMIT_PER_WORKSPACE = ${limits.perWorkspace}); stop one first`,
      );
    let document: unknown;
    try {
      document = JSON.parse(revision.document);
    } catch {
      throw new AppError("conflict", `revision ${revision.number} of this bench is not JSON`, {
        field: "revision",
      });
    }
    const session = new HostedLiveSession({
      id: randomUUID(),
      workspaceId: who.workspaceId,
      benchId: bench.id,
      benchName: bench.name,
      revision: revision.number,
      owner: { memberId: who.userId, name: who.name },
      document,
      clock: this.clock,
      idleMs: limits.idleMs,
      onEnded: (ended) => {
        if (this.sessions.get(ended.identity.id) === ended) this.sessions.delete(ended.identity.id);
      },
    });
    this.sessions.set(session.identity.id, session);
    return session.view(who);
  }

  /** Sessions `who` may see, oldest first. */
  list(who: Who): LiveSessionView[] {
    return [...this.sessions.values()]
      .filter((session) => this.visible(who, session))
      .map((session) => session.view(who));
  }

  view(who: Who, id: string): LiveSessionView {
    return this.find(who, id).view(who);
  }

  /** Streams the session to a viewer (full state first); returns the function that stops it. */
  watch(who: Who, id: string, send: (event: LiveSessionEvent) => void): () => void {
    return this.find(who, id).watch({ who, send });
  }

  /** One command in the console's protocol, checked by the engine's schema; 400/409 naming the field. */
  command(who: Who, id: string, raw: unknown): void {
    const session = this.find(who, id, "control", "command this session");
    const parsed = parseSimCommand(raw);
    if (!parsed.ok)
      throw new AppError("invalid_input", `${parsed.field}: ${parsed.message}`, {
        field: parsed.field,
      });
    const command = parsed.value;
    const refusal = FIXED_PACE_REFUSALS[command.type];
    if (refusal !== undefined)
      throw new AppError("conflict", refusal.message, { field: refusal.field });
    if (command.type === "play" && command.speed !== 1)
      throw new AppError("conflict", "speed: a server session runs at real time (1x) only", {
        field: "speed",
      });
    const error = session.command(raw);
    if (error !== undefined)
      throw new AppError(
        "invalid_input",
        `${error.field ?? error.command}: ${error.message}`,
        error.field === undefined ? undefined : { field: error.field },
      );
  }

  async stop(who: Who, id: string): Promise<void> {
    await this.find(who, id, "control", "stop this session").end("stopped");
  }

  async publish(who: Who, id: string): Promise<LiveSessionView> {
    const session = this.find(who, id, "control", "publish this session");
    await session.publish(this.knxNetIp(), this.tunnellingServer);
    return session.view(who);
  }

  async unpublish(who: Who, id: string): Promise<LiveSessionView> {
    const session = this.find(who, id, "control", "unpublish this session");
    await session.unpublish();
    return session.view(who);
  }

  disconnectClient(who: Who, id: string, channelId: number): void {
    const session = this.find(who, id, "control", "disconnect its clients");
    if (!session.disconnectClient(channelId))
      throw new AppError("not_found", "no such tunnel client");
  }

  /** Sessions running now (all workspaces): for tests and the shutdown. */
  get size(): number {
    return this.sessions.size;
  }

  /**
   * Ends every session: tunnels get their DISCONNECT_REQUEST at once (before
   * the first await, so a process that exits right after has sent them),
   * viewers get `ended`. The promise settles when the sockets are closed.
   */
  shutdown(): Promise<void> {
    return Promise.all([...this.sessions.values()].map((s) => s.end("shutdown"))).then(
      () => undefined,
    );
  }

  private visible(who: Who, session: HostedLiveSession): boolean {
    if (session.identity.workspaceId !== who.workspaceId) return false;
    const scope = scopeOf(who.role, "console.use");
    if (scope === "none") return false;
    if (session.identity.owner.memberId !== who.userId && scope !== "workspace") return false;
    const bench = findBench({ workspaceId: who.workspaceId, benchId: session.identity.benchId });
    return bench !== undefined && benchCan(who, bench).read;
  }

  private find(
    who: Who,
    id: string,
    action: "view" | "control" = "view",
    what = "",
  ): HostedLiveSession {
    const session = this.sessions.get(id);
    if (session === undefined || session.isEnded || !this.visible(who, session))
      throw notFound("live session");
    if (action === "control" && !session.canControl(who))
      throw new AppError(
        "forbidden",
        `only the session's owner (${session.identity.owner.name}) or an admin may ${what}`,
      );
    return session;
  }
}

const globalForLiveSessions = globalThis as typeof globalThis & {
  __benchlineLiveSessions?: LiveSessionRegistry;
};

/**
 * The process's registry, on globalThis so every route handler bundle Next
 * builds shares one (as the run pool does). Tests install their own.
 */
export function liveSessions(): LiveSessionRegistry {
  return (globalForLiveSessions.__benchlineLiveSessions ??= new LiveSessionRegistry());
}

/** Installs a registry (tests); returns the one it replaced. */
export function installLiveSessions(
  registry: LiveSessionRegistry | undefined,
): LiveSessionRegistry | undefined {
  const previous = globalForLiveSessions.__benchlineLiveSessions;
  if (registry === undefined) delete globalForLiveSessions.__benchlineLiveSessions;
  else globalForLiveSessions.__benchlineLiveSessions = registry;
  return previous;
}
