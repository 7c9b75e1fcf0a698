import type { DataFrame } from "../frame/data-frame";

/**
 * What a KNXnet/IP endpoint needs from a running simulation: one line to put
 * frames on and to watch. Keeping the coupling to this one interface lets the
 * same endpoint serve today's `Simulation` or any later live session.
 *
 * Contract:
 * - `put(frame, onDone)` queues a group frame on the line as sent by the station
 *   with individual address `frame.source` (the tunnel's own address), with the
 *   line's TP1 timing, arbitration and repetitions. `onDone(true)` is called once
 *   when the frame was acknowledged on the line; `onDone(false)` once when it was
 *   not (NAK, BUSY or silence after the repetitions), or when the line cannot
 *   carry it at all (a frame the model does not take). `onDone` may run inside
 *   `put`; callers must tolerate that.
 * - `subscribe(listener)` calls `listener(frame)` for every frame on the line,
 *   once per telegram (its first transmission, repetitions not again), at the end
 *   of the frame, in line order, including frames that came in through `put`.
 *   It returns the function that unsubscribes.
 * - Times are the line's business: the endpoint never asks for the clock.
 */
export interface LineAccess {
  put(frame: DataFrame, onDone: (acknowledged: boolean) => void): void;
  subscribe(listener: (frame: DataFrame) => void): () => void;
}
