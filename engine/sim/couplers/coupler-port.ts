import type { Telegram, Tp1Line } from "../../bus";
import { Tp1Sender } from "../../bus";
import type { SequentialIds } from "../../core/ids";
import type { CouplerTraceFields, Trace } from "../../core/trace";
import { ACK_OCTET, BUSY_OCTET, type DataFrame } from "../../frame";
import { NO_ACK_OCTET } from "../../bus";
import {
  groupPasses,
  individualPasses,
  nextHopCount,
  type CouplerDropReason,
  type CrossingDirection,
} from "../../topology/coupler-rules";
import type { TopologyCoupler } from "../../topology/bench-topology";

/** What a port needs of the rest of the run. */
export interface PortContext {
  readonly trace: Trace;
  readonly clock: { readonly nowUs: number };
  readonly telegramIds: SequentialIds;
  /** The coupler device's acknowledgement while a bus fault is injected into it (ACK when none). */
  readonly busAnswer: () => number;
  readonly counts: CouplerCounts;
}

/** Totals of one coupler since the start of the run. */
export interface CouplerCounts {
  forwarded: number;
  readonly dropped: Record<CouplerDropReason, number>;
}

export function emptyCouplerCounts(): CouplerCounts {
  return {
    forwarded: 0,
    dropped: { filter: 0, blocked: 0, "hop-count": 0, "queue-full": 0, "not-acknowledged": 0 },
  };
}

/**
 * One side of a coupler: it hears every frame on its line, and sends on its
 * line what the other side passes to it, from its own sender (its buffer for
 * that direction, bounded by the coupler's queueCapacity).
 *
 * At the end of a frame (`receive`) it decides, in this order:
 * 1. its own frame, or a fault injected into the coupler: as a device would;
 * 2. a repetition of a telegram it already took: acknowledge, do nothing;
 * 3. not passed by its setting or filter table (engine/topology/coupler-rules):
 *    no acknowledgement (a coupler acknowledges only what it passes on);
 * 4. routing counter 0: not passed, no acknowledgement;
 * 5. buffer for the far line full: BUSY, so the sender repeats later;
 * 6. else acknowledge and queue a copy on the far line with the counter
 *    decreased, sent with that line's timing, arbitration and repetitions.
 * Outcomes 3 to 6 are traced (coupler.forward, .hold, .drop), except that a
 * group telegram not passed in step 3 is traced only when someone on the far
 * side listens to its address, and an individual one only when its setting
 * blocks it: filtering traffic that stays inside a line is
 * the coupler's everyday work, not news (otherwise every local telegram would
 * leave a drop per coupler that hears it).
 */
export class CouplerPort {
  /** The other side; set right after both exist. */
  far!: CouplerPort;
  /** Sends on this port's line what the far side passes down or up to it. */
  readonly sender: Tp1Sender;
  /** Forwarded telegrams (as sent on this line) -> the id they had where they were heard. */
  private readonly origins = new WeakMap<Telegram, number>();

  constructor(
    public coupler: TopologyCoupler,
    /** Group addresses with a listener on the far side (by the bench's links). */
    public farListens: ReadonlySet<number>,
    /** Direction a frame heard on this side travels when passed: "up" on the lower line, "down" on the upper. */
    readonly direction: CrossingDirection,
    readonly lineId: string,
    readonly line: Tp1Line,
    private readonly context: PortContext,
  ) {
    this.sender = new Tp1Sender(coupler.individualAddress, coupler.id, coupler.id);
  }

  /** End of a frame on this port's line; returns this port's acknowledgement character. */
  receive(telegram: Telegram, repeated: boolean): number {
    if (telegram.sender === this.sender) return NO_ACK_OCTET;
    const busAnswer = this.context.busAnswer();
    if (busAnswer !== ACK_OCTET) return busAnswer;
    if (repeated && telegram.takenBy?.includes(this) === true) return ACK_OCTET;
    const frame = telegram.frame;
    const coupler = this.coupler;
    const decision =
      frame.addressType === "group"
        ? groupPasses(coupler.groupTelegrams, coupler.filterTable, frame.destination)
        : individualPasses(
            coupler.individualTelegrams,
            coupler.lowerLineAddress,
            this.direction,
            frame.destination,
          );
    if (decision !== "pass") {
      // Only the first transmission is traced: its repetitions meet the same setting.
      // Routing an individual telegram to its own side is the coupler's everyday work too.
      if (
        telegram.transmissions === 1 &&
        (frame.addressType === "group"
          ? this.farListens.has(frame.destination)
          : decision === "blocked")
      )
        this.drop(telegram.id, frame, decision);
      return NO_ACK_OCTET;
    }
    const hopCount = nextHopCount(frame.hopCount);
    if (hopCount === undefined) {
      if (telegram.transmissions === 1) this.drop(telegram.id, frame, "hop-count");
      return NO_ACK_OCTET;
    }
    const far = this.far;
    if (far.sender.pending >= coupler.queueCapacity) {
      this.drop(telegram.id, frame, "queue-full");
      return BUSY_OCTET;
    }
    const forwardedId = this.context.telegramIds.next();
    // The forward and a hold name the same crossing; built only when someone records.
    const crossing: CouplerTraceFields | undefined = this.context.trace.active
      ? {
          timeUs: this.context.clock.nowUs,
          coupler: coupler.id,
          telegramId: telegram.id,
          forwardedTelegramId: forwardedId,
          fromLine: this.lineId,
          toLine: far.lineId,
          destination: frame.destination,
          ...individual(frame),
        }
      : undefined;
    if (crossing !== undefined)
      this.context.trace.append({ kind: "coupler.forward", ...crossing, hopCount });
    const copy: DataFrame = { ...frame, repeated: false, hopCount };
    const waitingBefore = far.sender.pending;
    const forwarded = far.line.queue(far.sender, copy, forwardedId);
    far.origins.set(forwarded, telegram.id);
    this.context.counts.forwarded++;
    if (crossing !== undefined && (waitingBefore > 0 || far.line.isBusy))
      this.context.trace.append({ kind: "coupler.hold", ...crossing, queued: waitingBefore });
    (telegram.takenBy ??= []).push(this);
    return ACK_OCTET;
  }

  /** A telegram this port sent was not acknowledged after its last repetition. */
  lost(telegram: Telegram): void {
    const origin = this.origins.get(telegram);
    if (origin === undefined) return;
    // Its far side heard it and took it: the drop is that side's, as if it had not passed it.
    this.far.drop(origin, telegram.frame, "not-acknowledged", telegram.id);
  }

  /** Takes over `other`'s origins for the fork's copies of its telegrams. */
  copyOrigin(original: Telegram, copy: Telegram): void {
    const origin = this.origins.get(original);
    if (origin !== undefined) this.origins.set(copy, origin);
  }

  /**
   * Counts and traces a telegram heard on this side that does not reach the far
   * line; `forwardedTelegramId` when it was sent there and not acknowledged.
   */
  private drop(
    telegramId: number,
    frame: DataFrame,
    reason: CouplerDropReason,
    forwardedTelegramId?: number,
  ): void {
    this.context.counts.dropped[reason]++;
    const trace = this.context.trace;
    if (trace.active)
      trace.append({
        kind: "coupler.drop",
        timeUs: this.context.clock.nowUs,
        coupler: this.coupler.id,
        telegramId,
        ...(forwardedTelegramId === undefined ? {} : { forwardedTelegramId }),
        fromLine: this.lineId,
        toLine: this.far.lineId,
        destination: frame.destination,
        ...individual(frame),
        reason,
      });
  }
}

/** The trace's mark of an individually addressed telegram (absent on group telegrams, as in telegram events). */
function individual(frame: DataFrame): { individual?: true } {
  return frame.addressType === "individual" ? { individual: true } : {};
}
