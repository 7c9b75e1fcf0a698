import type { WallClock } from "../knxnet/real-time-pacer";

/**
 * The clocks a server-hosted live session runs on: the monotonic wall clock
 * and timers that pace the simulation and the KNXnet/IP endpoint, and the
 * calendar clock for the dates a session shows (started, idle stop). Tests
 * give a fake one and move time themselves.
 */
export interface LiveSessionClock extends WallClock {
  /** Milliseconds since the epoch. */
  epochMs(): number;
}

/**
 * Node's clocks. Timers are unref'd: a live session must never be what keeps
 * the process alive (a test run or a stopping server ends regardless).
 */
export const systemLiveSessionClock: LiveSessionClock = {
  nowMs: () => performance.now(),
  epochMs: () => Date.now(),
  setTimeout: (callback, delayMs) => setTimeout(callback, delayMs).unref(),
  clearTimeout: (handle) => clearTimeout(handle as ReturnType<typeof setTimeout>),
};
