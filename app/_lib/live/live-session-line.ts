import type { DataFrame, LineAccess, LiveSession, Simulation } from "@/engine";
import { simulationLine, type SimulationLine } from "../knxnet/simulation-line";

/**
 * `LineAccess` for a KNXnet/IP endpoint over a live session's simulation, with
 * one clock: the session's own wall-clock pace. Before a tunnel's frame is
 * queued the session runs to the present (`advanceToNow`); its owner calls
 * `deliver` after every tick and wake-up. The session may start a new
 * simulation (reset): `attach` moves the line to it, and listeners stay.
 */
export class LiveSessionLine implements LineAccess {
  private core: SimulationLine | undefined;
  private sim: Simulation | undefined;
  private readonly listeners = new Set<(frame: DataFrame) => void>();

  constructor(
    private readonly live: () => LiveSession | undefined,
    /** Called after a frame was queued, so the owner wakes up for its transmission rather than at its next tick. */
    private readonly onQueued: () => void = () => undefined,
  ) {}

  /** Serves the bench line of the test tool in `sim` from now on; frames in flight in the old run are dropped. */
  attach(sim: Simulation): void {
    this.core?.stop();
    this.sim = sim;
    const core = simulationLine(sim, {
      lineId: sim.bench.testToolLine,
      catchUp: () => this.live()?.advanceToNow(),
    });
    core.line.subscribe((frame) => {
      for (const listener of [...this.listeners]) listener(frame);
    });
    this.core = core;
  }

  put(frame: DataFrame, onDone: (acknowledged: boolean) => void): void {
    if (this.core === undefined) onDone(false);
    else {
      this.core.line.put(frame, onDone);
      this.onQueued();
    }
  }

  subscribe(listener: (frame: DataFrame) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  /** Hands what the line did up to the simulation's present to the endpoint. */
  deliver(): void {
    this.core?.deliver();
  }

  /**
   * How long until the line may have something for the endpoint, wall ms at
   * 1x: the next buffered frame or confirmation, or the simulation's next
   * event (a frame ending, a device answering). Undefined when nothing is due.
   */
  nextDueInMs(): number | undefined {
    const sim = this.sim;
    if (sim === undefined) return undefined;
    const due = Math.min(this.core?.nextDueUs() ?? Infinity, sim.nextEventUs);
    if (!Number.isFinite(due)) return undefined;
    return Math.max(0, (due - sim.nowUs) / 1000);
  }

  stop(): void {
    this.core?.stop();
    this.core = undefined;
    this.sim = undefined;
    this.listeners.clear();
  }
}
