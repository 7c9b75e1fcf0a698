/**
 * Progress of runs inside this server process, for the server-sent events
 * route. A channel is a run id or a suite run id. Events are small and say
 * where a run stands; the stored rows stay the source of truth, so a page that
 * connects late first reads a snapshot from the database.
 */
export type RunProgressEvent =
  | {
      readonly kind: "run.snapshot" | "run.started";
      readonly status: "queued" | "running" | "finished" | "errored";
      /** Scenarios finished and in total (1 for a single scenario run). */
      readonly done: number;
      readonly total: number;
    }
  | {
      readonly kind: "scenario.finished";
      readonly runId: string;
      readonly scenarioName: string;
      readonly verdict: "pass" | "fail" | "error";
      readonly outcome: string;
      readonly done: number;
      readonly total: number;
    }
  | {
      readonly kind: "run.finished";
      readonly status: "finished" | "errored";
      readonly verdict: "pass" | "fail" | "error" | null;
      readonly done: number;
      readonly total: number;
      readonly durationMs: number | null;
      /** Why the run ended early: a cap it hit, an error, or a server stop that interrupted it. */
      readonly message?: string;
    };

type Listener = (event: RunProgressEvent) => void;

const globalForEvents = globalThis as typeof globalThis & {
  __benchlineRunListeners?: Map<string, Set<Listener>>;
};

function listeners(): Map<string, Set<Listener>> {
  globalForEvents.__benchlineRunListeners ??= new Map();
  return globalForEvents.__benchlineRunListeners;
}

/** Listen to one run's (or suite run's) progress; returns the unsubscribe function. */
export function subscribeToRun(channel: string, listener: Listener): () => void {
  const all = listeners();
  let set = all.get(channel);
  if (!set) {
    set = new Set();
    all.set(channel, set);
  }
  set.add(listener);
  return () => {
    set.delete(listener);
    if (set.size === 0) all.delete(channel);
  };
}

export function publishRunEvent(channel: string, event: RunProgressEvent): void {
  const set = listeners().get(channel);
  if (!set) return;
  for (const listener of [...set]) {
    try {
      listener(event);
    } catch (error) {
      console.error("run events: a listener failed", error);
    }
  }
}
