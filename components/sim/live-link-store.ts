import { createStore, type StoreApi } from "zustand/vanilla";
import type { LiveSessionView } from "@/app/_lib/live/live-session-view";

/**
 * What the console knows about its link to a session hosted by the server:
 * the stream's state, the session as the server last described it (owner,
 * idle stop, KNXnet/IP endpoint and its clients) and, once it ended, why.
 * The simulation itself (log, devices, clock) lives in the SimStore like a
 * browser run's; this store holds only what a browser run does not have.
 */
export type LinkStatus =
  /** Opening the event stream for the first time. */
  | "connecting"
  /** The stream is open and the session's state has arrived. */
  | "live"
  /** The stream broke; the browser is trying again. */
  | "reconnecting"
  /** The session stopped (or is gone); nothing more will arrive. */
  | "ended";

export interface SessionEnd {
  /**
   * The server's reason as sent (liveSessionEndReasonSchema: "stopped", "idle", "shutdown"),
   * or what the console found: "gone", "signed-out", "lost".
   */
  readonly reason: string;
  /** One sentence for the member. */
  readonly text: string;
}

export interface LiveLinkState {
  readonly sessionId: string;
  readonly status: LinkStatus;
  readonly session: LiveSessionView | null;
  readonly ended: SessionEnd | null;
  /** Messages from the stream the console could not read (skipped, never applied). */
  readonly unreadable: number;
}

export interface LiveLinkActions {
  setStatus(status: Exclude<LinkStatus, "ended">): void;
  setSession(session: LiveSessionView): void;
  end(reason: string): void;
  countUnreadable(): void;
}

export type LiveLinkStore = StoreApi<LiveLinkState & LiveLinkActions>;

const END_TEXT: Readonly<Record<string, string>> = {
  idle: "The session stopped after a time with no activity.",
  stopped: "The session's owner stopped it.",
  shutdown: "The server stopped or restarted, which ends every session it hosted.",
  "signed-out": "You were signed out; sign in again to attach to the session.",
  lost: "The console lost its link to the server; reload the page to attach again.",
  gone: "The session no longer runs on the server (it was stopped, or the server restarted).",
};

/** One sentence for an end reason; an unknown reason is named as the server sent it. */
export function sessionEndText(reason: string): string {
  return END_TEXT[reason] ?? `The session ended (${reason}).`;
}

export function createLiveLinkStore(
  sessionId: string,
  session: LiveSessionView | null = null,
): LiveLinkStore {
  return createStore<LiveLinkState & LiveLinkActions>()((set, get) => ({
    sessionId,
    status: "connecting",
    session,
    ended: null,
    unreadable: 0,
    // Once ended, a late stream event or command answer never revives the session.
    setStatus: (status) => {
      if (get().status !== "ended") set({ status });
    },
    setSession: (view) => {
      if (get().status !== "ended") set({ session: view });
    },
    end: (reason) => {
      if (get().status === "ended") return;
      const current = get().session;
      set({
        status: "ended",
        ended: { reason, text: sessionEndText(reason) },
        // An ended session has no endpoint: its tunnels were disconnected with it.
        session: current === null ? null : { ...current, endpoint: null },
      });
    },
    countUnreadable: () => set({ unreadable: get().unreadable + 1 }),
  }));
}
