import { formatIndividualAddress } from "@/engine";
import { Tp1Sender, type Tp1Line } from "@/engine";
import type { TraceEvent } from "@/engine";
import { DEFAULT_HOP_COUNT, fromHex, type DataFrame } from "@/engine";
import type { LineAccess } from "@/engine";
import type { Simulation } from "@/engine";
import { RealTimePacer, type RealTimePacerOptions } from "./real-time-pacer";

/**
 * `LineAccess` over today's `Simulation`, paced at real time. Frames from a tunnel
 * are queued on the line's TP1 model with a sender of the tunnel's own individual
 * address, so they take part in arbitration, acknowledgement and repetition like
 * any device's. What the line does is read from the simulation's trace:
 * `telegram.sent` (first transmission) is handed to subscribers once virtual time
 * has reached the end of the frame; `telegram.acked` / `telegram.lost` of a
 * tunnel's telegram confirm its `put`. Both are buffered while the simulation runs
 * and delivered after each advance, so listeners never act inside a run.
 *
 * The simulation must keep a bounded trace (`traceCapacity`) when it runs for long:
 * this adapter subscribes to it.
 */
export interface PacedSimulationLine {
  readonly line: LineAccess;
  start(): void;
  /** Stops pacing and unsubscribes from the simulation's trace. */
  stop(): void;
}

export interface PacedSimulationLineOptions extends Omit<RealTimePacerOptions, "onAdvance"> {
  /** The bench line to serve; the test tool's line by default. */
  readonly lineId?: string;
}

type Pending =
  | { readonly kind: "frame"; readonly atUs: number; readonly frame: DataFrame }
  | {
      readonly kind: "done";
      readonly atUs: number;
      readonly telegramId: number;
      readonly acknowledged: boolean;
    };

export function pacedSimulationLine(
  sim: Simulation,
  options: PacedSimulationLineOptions = {},
): PacedSimulationLine {
  // The pacer and the line refer to each other: the line catches the pacer up before a put,
  // the pacer delivers what the line buffered after every advance (never before start()).
  const pacer = new RealTimePacer(sim, { ...options, onAdvance: () => core.deliver() });
  const core = simulationLine(sim, { lineId: options.lineId, catchUp: () => pacer.catchUp() });
  return {
    line: core.line,
    start: () => pacer.start(),
    stop() {
      pacer.stop();
      core.stop();
    },
  };
}

/**
 * `LineAccess` over a simulation that someone else advances (a pacer, or a
 * live session's own tick): `catchUp` runs it to the present before a frame is
 * queued, and the owner calls `deliver` after every advance.
 */
export interface SimulationLine {
  readonly line: LineAccess;
  /** Hands buffered frames and confirmations whose time has come to their listeners. */
  deliver(): void;
  /** Virtual time of the next buffered item, or undefined when nothing waits. */
  nextDueUs(): number | undefined;
  /** Unsubscribes from the simulation's trace; later puts are confirmed negatively. */
  stop(): void;
}

export function simulationLine(
  sim: Simulation,
  options: { readonly lineId?: string | undefined; readonly catchUp: () => void },
): SimulationLine {
  const tp1: Tp1Line = sim.line(options.lineId);
  const listeners = new Set<(frame: DataFrame) => void>();
  const callbacks = new Map<number, (acknowledged: boolean) => void>();
  const senders = new Map<number, Tp1Sender>();
  const pending: Pending[] = [];
  let stopped = false;
  // The simulation numbers its telegrams from 0 up and uses -1 as "none"; ours count down from -2.
  let nextTelegramId = -2;

  const unsubscribe = sim.subscribe((event: TraceEvent) => {
    if (event.kind === "telegram.sent") {
      if (event.line !== tp1.id || event.attempt !== 0) return;
      pending.push({ kind: "frame", atUs: event.endUs, frame: frameOf(event) });
    } else if (event.kind === "telegram.acked" || event.kind === "telegram.lost") {
      if (!callbacks.has(event.telegramId)) return;
      pending.push({
        kind: "done",
        atUs: event.timeUs,
        telegramId: event.telegramId,
        acknowledged: event.kind === "telegram.acked",
      });
    }
  });

  function deliver(): void {
    while (pending.length > 0 && pending[0]!.atUs <= sim.nowUs) {
      const item = pending.shift()!;
      if (item.kind === "frame") for (const listener of [...listeners]) listener(item.frame);
      else {
        const onDone = callbacks.get(item.telegramId);
        callbacks.delete(item.telegramId);
        onDone?.(item.acknowledged);
      }
    }
  }

  const line: LineAccess = {
    put(frame, onDone) {
      // Today's line model carries group telegrams only.
      if (stopped || frame.addressType !== "group") {
        onDone(false);
        return;
      }
      options.catchUp(); // queue at the present virtual time, not the last tick's
      let sender = senders.get(frame.source);
      if (sender === undefined) {
        sender = new Tp1Sender(
          frame.source,
          undefined,
          `tunnel ${formatIndividualAddress(frame.source)}`,
        );
        senders.set(frame.source, sender);
      }
      const id = nextTelegramId--;
      callbacks.set(id, onDone);
      tp1.queue(sender, frame, id);
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };

  return {
    line,
    deliver,
    nextDueUs: () => pending[0]?.atUs,
    stop() {
      stopped = true;
      unsubscribe();
      pending.length = 0;
      callbacks.clear();
    },
  };
}

function frameOf(event: Extract<TraceEvent, { kind: "telegram.sent" }>): DataFrame {
  return {
    priority: event.priority,
    repeated: false,
    source: event.source,
    destination: event.destination,
    // Lines that carry individually addressed telegrams mark them in the trace.
    addressType: (event as { readonly individual?: true }).individual ? "individual" : "group",
    hopCount: DEFAULT_HOP_COUNT, // not in the trace; devices send 6
    service: event.service,
    payload: fromHex(event.payloadHex) ?? new Uint8Array(0),
    shortPayload: event.shortPayload,
  };
}
