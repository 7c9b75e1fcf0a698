import type { LiveSessionClock } from "@/app/_lib/live/live-session-clock";

/**
 * A fake wall clock for the server's paced parts (the KNXnet/IP endpoint's
 * pacer, live sessions): time moves only when the test says, and the timers
 * due on the way fire in order, earliest first (ties in the order they were
 * set). Dates start at a fixed invented moment.
 */
export function fakeWallClock(startEpochMs = Date.parse("2031-03-04T08:00:00.000Z")) {
  let nowMs = 0;
  let nextId = 1;
  const timers = new Map<number, { at: number; callback: () => void }>();
  const clock: LiveSessionClock = {
    nowMs: () => nowMs,
    epochMs: () => startEpochMs + nowMs,
    setTimeout(callback, delayMs) {
      timers.set(nextId, { at: nowMs + Math.max(0, delayMs), callback });
      return nextId++;
    },
    clearTimeout: (handle) => void timers.delete(handle as number),
  };
  return {
    clock,
    /** Moves time forward by `ms`, firing every timer due on the way, earliest first. */
    advance(ms: number) {
      const end = nowMs + ms;
      for (;;) {
        let due: [number, { at: number; callback: () => void }] | undefined;
        for (const entry of timers)
          if (entry[1].at <= end && (!due || entry[1].at < due[1].at)) due = entry;
        if (due === undefined) break;
        timers.delete(due[0]);
        nowMs = Math.max(nowMs, due[1].at);
        due[1].callback();
      }
      nowMs = end;
    },
  };
}
