/**
 * Runs a simulation's virtual clock at real time (1x): on every tick the
 * simulation advances by the wall time elapsed since `start`, so outside software
 * talking to the bench sees telegrams at their TP1 pace. The clock and timers are
 * injected for tests.
 */

/** Wall clock and timers; `systemClock` is Node's. */
export interface WallClock {
  /** Monotonic milliseconds (fractions allowed). */
  nowMs(): number;
  setTimeout(callback: () => void, delayMs: number): unknown;
  clearTimeout(handle: unknown): void;
}

export const systemClock: WallClock = {
  nowMs: () => performance.now(),
  setTimeout: (callback, delayMs) => setTimeout(callback, delayMs),
  clearTimeout: (handle) => clearTimeout(handle as ReturnType<typeof setTimeout>),
};

/** The part of a simulation the pacer drives. */
export interface VirtualClock {
  readonly nowUs: number;
  runUntil(timeUs: number): void;
}

export interface RealTimePacerOptions {
  readonly clock?: WallClock;
  /** Wall milliseconds between ticks; 1 by default (Node's timers do not go finer). */
  readonly tickMs?: number;
  /** Called after every advance, outside the simulation's run, to deliver what happened. */
  readonly onAdvance?: () => void;
}

export class RealTimePacer {
  private readonly clock: WallClock;
  private readonly tickMs: number;
  private readonly onAdvance: () => void;
  private wallStartMs = 0;
  private virtualStartUs = 0;
  private timer: unknown;
  private running = false;

  constructor(
    private readonly sim: VirtualClock,
    options: RealTimePacerOptions = {},
  ) {
    this.clock = options.clock ?? systemClock;
    this.tickMs = options.tickMs ?? 1;
    this.onAdvance = options.onAdvance ?? (() => undefined);
  }

  /** Starts pacing from the simulation's current virtual time. */
  start(): void {
    if (this.running) return;
    this.running = true;
    this.wallStartMs = this.clock.nowMs();
    this.virtualStartUs = this.sim.nowUs;
    this.schedule();
  }

  stop(): void {
    this.running = false;
    if (this.timer !== undefined) this.clock.clearTimeout(this.timer);
    this.timer = undefined;
  }

  /** Advances the simulation to the wall clock now (a no-op when stopped or already there). */
  catchUp(): void {
    if (!this.running) return;
    const targetUs =
      this.virtualStartUs + Math.floor((this.clock.nowMs() - this.wallStartMs) * 1000);
    if (targetUs > this.sim.nowUs) this.sim.runUntil(targetUs);
    this.onAdvance();
  }

  private schedule(): void {
    this.timer = this.clock.setTimeout(() => {
      this.timer = undefined;
      if (!this.running) return;
      this.catchUp();
      this.schedule();
    }, this.tickMs);
  }
}
