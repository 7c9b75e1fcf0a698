import type { Scheduler } from "../core/scheduler";
import { toHex, type Trace, type TelegramTraceFields, type TraceEvent } from "../core/trace";
import { runArray } from "../core/run-objects";
import {
  ACK_CHARACTER_BIT_TIMES,
  ACK_GAP_BIT_TIMES,
  ACK_OCTET,
  BUSY_OCTET,
  BUSY_RETRY_WAIT_BIT_TIMES,
  IDLE_BEFORE_FRAME_BIT_TIMES,
  MAX_REPETITIONS,
  bitTimesToUs,
  encodeTp1Frame,
  frameDurationUs,
  tp1FrameOctets,
  type DataFrame,
  type Priority,
} from "../frame";

/**
 * One TP1 line: a shared medium at 9600 bit/s (knx-reference.md, TP1 timing).
 *
 * A transmission cycle, in bit times:
 *
 *   idle >= 50 | frame: 13 per octet | gap 15 | acknowledgement 11
 *
 * - A sender may start only after the line has been idle for 50 bit times. All
 *   senders waiting for the line start in the same slot, when those 50 bit times
 *   end; a sender whose telegram arrives while the line has already been idle
 *   long enough starts at once.
 * - Senders that start in the same slot arbitrate bit by bit, as on the real
 *   medium where a logical 0 dominates: the frame octets are compared in order,
 *   each character least significant bit first (UART order, recalled from
 *   memory, consistent with the Basic course's character format), and the
 *   sender transmitting a 1 where another sends a 0 drops out. The control octet
 *   goes first, so the priority bits decide before the source address
 *   (system > urgent > normal > low), and a repetition (R = 0) beats a first
 *   transmission of the same priority. Losers try again in the next slot.
 * - At the end of the frame the host delivers it and returns the wired-AND of
 *   every addressed station's acknowledgement character (ACK 0xCC, NAK 0x0C,
 *   BUSY 0xC0; 0xFF when no station answers). Because 0 dominates, one NAK
 *   among ACKs reads as NAK and one BUSY as BUSY; NAK with BUSY (0x00) is
 *   treated as BUSY, our own rule.
 * - Anything but ACK makes the sender repeat with the repeat flag set (R = 0),
 *   at most 3 times; after BUSY it first waits 150 bit times.
 *
 * Silence in the acknowledgement slot counts toward the next sender's 50 idle
 * bit times. The conformance tests' 53 bit times for normal and low priority
 * are not modelled: every priority waits 50.
 *
 * Bus load follows the Basic course's accounting: an acknowledged telegram
 * occupies idle 50 + frame + gap 15 + acknowledgement 11 bit times (193 for a
 * 9-octet telegram), an unacknowledged one idle 50 + frame. `busyUs` is the
 * narrower time the line carries a signal (frame and acknowledgement).
 */

/** Acknowledgement the line reports when no station answered (an idle line reads all ones). */
export const NO_ACK_OCTET = 0xff;

const IDLE_US = bitTimesToUs(IDLE_BEFORE_FRAME_BIT_TIMES);
const ACK_SLOT_US = bitTimesToUs(ACK_GAP_BIT_TIMES + ACK_CHARACTER_BIT_TIMES);
const ACK_CHARACTER_US = bitTimesToUs(ACK_CHARACTER_BIT_TIMES);
const BUSY_WAIT_US = bitTimesToUs(BUSY_RETRY_WAIT_BIT_TIMES);

type TelegramEventKind = Extract<TraceEvent, { telegramId: number }>["kind"];
type Mutable<T> = { -readonly [K in keyof T]: T[K] };

/**
 * An empty array that holds doubles from the start: history times pass the
 * small-integer range after about 36 virtual minutes, and an array changing its
 * kind then would leave the code that writes it handling two kinds at once.
 */
function noDoubles(): number[] {
  const array = [0.5];
  array.pop();
  return array;
}

const PRIORITY_CODE: Readonly<Record<Priority, number>> = {
  system: 0,
  normal: 1,
  urgent: 2,
  low: 3,
};

/** A telegram from its queueing until it is acknowledged or given up; the same object across repetitions. */
export interface Telegram {
  /** Run-wide id, shared by the frame's repetitions. */
  readonly id: number;
  /** The frame as first sent (repeated = false); repetitions set R on the wire only. */
  readonly frame: DataFrame;
  readonly octets: number;
  readonly sender: Tp1Sender;
  /** Transmissions so far (0 before the first). */
  transmissions: number;
  /** Earliest start of the next transmission (after BUSY, 150 bit times after the acknowledgement). */
  readyAtUs: number;
  readonly queuedAtUs: number;
  /**
   * Stations that took this telegram in a transmission that was not fully
   * acknowledged, so they can ignore its repetitions. Filled by the host only
   * when a repetition may follow, so a clean ACK costs nothing.
   */
  takenBy: unknown[] | undefined;
  /** The payload as the trace writes it, formatted once for all of the telegram's events. */
  payloadHex: string | undefined;
}

/** A telegram as a line queues it: a class, not a literal (engine/core/run-objects.ts). */
class QueuedTelegram implements Telegram {
  transmissions = 0;
  readyAtUs: number;
  takenBy: unknown[] | undefined = undefined;
  payloadHex: string | undefined = undefined;

  constructor(
    readonly id: number,
    readonly frame: DataFrame,
    readonly octets: number,
    readonly sender: Tp1Sender,
    readonly queuedAtUs: number,
  ) {
    this.readyAtUs = queuedAtUs;
  }
}

/**
 * Another run's telegram as this run's copy (a forked run): the same frame and
 * progress, with this run's sender and the stations of this run that took it.
 */
export function copiedTelegram(
  telegram: Telegram,
  sender: Tp1Sender,
  takenBy: unknown[] | undefined,
): Telegram {
  const copy = new QueuedTelegram(
    telegram.id,
    telegram.frame,
    telegram.octets,
    sender,
    telegram.queuedAtUs,
  );
  copy.transmissions = telegram.transmissions;
  copy.readyAtUs = telegram.readyAtUs;
  copy.takenBy = takenBy;
  copy.payloadHex = telegram.payloadHex;
  return copy;
}

/** One station's sending side: a queue of telegrams sent one at a time, each with its repetitions. */
export class Tp1Sender {
  private readonly queue: Telegram[] = runArray<Telegram>();
  private head = 0;
  /** Position in the line's contender list, -1 when idle. */
  contenderIndex = -1;

  constructor(
    readonly individualAddress: number,
    /** Device id, undefined for the test tool. */
    readonly deviceId: string | undefined,
    /** Key for per-sender counts: the device id or "test-tool". */
    readonly countKey: string,
  ) {}

  get pending(): number {
    return this.queue.length - this.head;
  }

  /** Takes over `other`'s waiting telegrams (as the fork's copies), for a forked run. */
  copyFrom(other: Tp1Sender, copyTelegram: (telegram: Telegram) => Telegram): void {
    this.queue.length = 0;
    for (let i = other.head; i < other.queue.length; i++)
      this.queue.push(copyTelegram(other.queue[i]!));
    this.head = 0;
    this.contenderIndex = other.contenderIndex;
  }

  current(): Telegram | undefined {
    return this.queue[this.head];
  }

  push(telegram: Telegram): void {
    this.queue.push(telegram);
  }

  shift(): void {
    this.queue[this.head] = undefined as unknown as Telegram;
    this.head++;
    if (this.head === this.queue.length) {
      this.queue.length = 0;
      this.head = 0;
    } else if (this.head > 1024 && this.head * 2 > this.queue.length) {
      this.queue.splice(0, this.head);
      this.head = 0;
    }
  }
}

/** The simulation side of a line: who takes a frame and what they answer. */
export interface Tp1LineHost {
  /**
   * Called at the end of every frame. Delivers it to the stations that take it
   * and returns the wired-AND of their acknowledgement characters, or
   * `NO_ACK_OCTET` when nobody is addressed.
   */
  receiveFrame(telegram: Telegram, repeated: boolean): number;
  /** Called when a telegram is given up after its last repetition (couplers trace their drop). */
  telegramLost?(telegram: Telegram): void;
}

/** Load and counts on one line over a window of virtual time. */
export interface BusStats {
  readonly line: string;
  readonly fromUs: number;
  readonly toUs: number;
  /** Frames on the line in the window, repetitions included. */
  readonly transmissions: number;
  /** First transmissions only: telegrams sent. */
  readonly telegrams: number;
  readonly repetitions: number;
  /** Time the line carried a frame or an acknowledgement, µs. */
  readonly busyUs: number;
  /** Time held by telegrams in the Basic course's accounting (idle 50 + frame + gap + acknowledgement), µs. */
  readonly occupiedUs: number;
  /** occupiedUs as a percentage of the window (the course's bus load). */
  readonly loadPercent: number;
  /** Telegrams (first transmissions) per raw destination address in the window. */
  readonly byGroupAddress: ReadonlyMap<number, number>;
  /** Telegrams per sender (device id or "test-tool") in the window. */
  readonly bySender: ReadonlyMap<string, number>;
  /** True when the window reaches further back than the kept transmission history. */
  readonly truncated: boolean;
}

export interface Tp1LineOptions {
  /** Transmissions kept for windowed statistics (a ring); 65,536 by default, about 22 minutes of a saturated line. */
  readonly historyCapacity?: number;
}

export class Tp1Line {
  private readonly slotTag: number;
  private readonly frameEndTag: number;
  private readonly ackEndTag: number;

  private busy = false;
  private idleSinceUs = 0;
  private nextSlotUs = -1;
  private readonly contenders: Tp1Sender[] = runArray<Tp1Sender>();

  private current: Telegram | undefined;
  private currentRepeated = false;
  private currentFrameEndUs = 0;
  private currentAck = NO_ACK_OCTET;

  // Transmission history for windowed statistics, as parallel columns in a ring.
  // The columns grow one entry per transmission up to the capacity (the ring
  // wraps only then), so a short run, such as a scenario replay, does not pay for
  // a long one. Plain arrays, not typed arrays: a fork of a settled run copies
  // them, and a typed array costs far more to create.
  private readonly historyCapacity: number;
  private historyCount = 0;
  private historyNext = 0;
  private histOccupiedStart = noDoubles();
  private histOccupiedEnd = noDoubles();
  private histBusyUs: number[] = [];
  private histDestination: number[] = [];
  private histRepeated: boolean[] = [];
  private histSender: (string | undefined)[] = [];

  /** Totals since the start of the run. */
  transmissionsTotal = 0;
  telegramsTotal = 0;
  busyUsTotal = 0;
  occupiedUsTotal = 0;
  readonly telegramsByGroupAddress = new Map<number, number>();
  readonly telegramsBySender = new Map<string, number>();

  constructor(
    readonly id: string,
    private readonly scheduler: Scheduler,
    private readonly trace: Trace,
    private readonly host: Tp1LineHost,
    options: Tp1LineOptions = {},
  ) {
    this.slotTag = scheduler.register(() => this.onSlot());
    this.frameEndTag = scheduler.register(() => this.onFrameEnd());
    this.ackEndTag = scheduler.register(() => this.onAckEnd());
    this.historyCapacity = options.historyCapacity ?? 65_536;
  }

  /**
   * Takes over `other`'s state: the cycle in progress, its contenders (as the
   * fork's senders, whose queues are already copied), statistics and history.
   * For a forked run; `copyTelegram` gives the fork's copy of a telegram.
   */
  copyFrom(
    other: Tp1Line,
    sender: (original: Tp1Sender) => Tp1Sender,
    copyTelegram: (telegram: Telegram) => Telegram,
  ): void {
    this.busy = other.busy;
    this.idleSinceUs = other.idleSinceUs;
    this.nextSlotUs = other.nextSlotUs;
    this.contenders.length = 0;
    for (const contender of other.contenders) this.contenders.push(sender(contender));
    this.current = other.current === undefined ? undefined : copyTelegram(other.current);
    this.currentRepeated = other.currentRepeated;
    this.currentFrameEndUs = other.currentFrameEndUs;
    this.currentAck = other.currentAck;
    this.historyCount = other.historyCount;
    this.historyNext = other.historyNext;
    // A settled run often has sent nothing yet; its empty columns need no copies.
    if (other.historyCount > 0) {
      this.histOccupiedStart = other.histOccupiedStart.slice();
      this.histOccupiedEnd = other.histOccupiedEnd.slice();
      this.histBusyUs = other.histBusyUs.slice();
      this.histDestination = other.histDestination.slice();
      this.histRepeated = other.histRepeated.slice();
      this.histSender = other.histSender.slice();
    }
    this.transmissionsTotal = other.transmissionsTotal;
    this.telegramsTotal = other.telegramsTotal;
    this.busyUsTotal = other.busyUsTotal;
    this.occupiedUsTotal = other.occupiedUsTotal;
    this.telegramsByGroupAddress.clear();
    for (const [address, count] of other.telegramsByGroupAddress)
      this.telegramsByGroupAddress.set(address, count);
    this.telegramsBySender.clear();
    for (const [key, count] of other.telegramsBySender) this.telegramsBySender.set(key, count);
  }

  /** True while a frame or its acknowledgement slot is on the line. */
  get isBusy(): boolean {
    return this.busy;
  }

  /** Telegrams waiting or in flight on this line. */
  get pendingTelegrams(): number {
    let count = 0;
    for (const sender of this.contenders) count += sender.pending;
    return count;
  }

  /** Queues a telegram; it goes out when the line and arbitration allow. */
  queue(sender: Tp1Sender, frame: DataFrame, id: number): Telegram {
    const now = this.scheduler.nowUs;
    const telegram = new QueuedTelegram(id, frame, tp1FrameOctets(frame), sender, now);
    sender.push(telegram);
    if (this.trace.active) this.trace.append(this.telegramEvent("telegram.queued", telegram, now));
    if (sender.contenderIndex < 0) {
      sender.contenderIndex = this.contenders.length;
      this.contenders.push(sender);
      this.requestSlot(now);
    }
    return telegram;
  }

  /**
   * A telegram trace event with the fields every kind shares; the caller adds
   * its kind's own fields. Built as one object (no spreads) because a full trace
   * holds several of these per telegram.
   */
  private telegramEvent<K extends TelegramEventKind>(
    kind: K,
    telegram: Telegram,
    timeUs: number,
  ): Mutable<Extract<TraceEvent, { kind: K }>> {
    const frame = telegram.frame;
    const event: Mutable<TelegramTraceFields> & { kind: K } = {
      kind,
      timeUs,
      telegramId: telegram.id,
      line: this.id,
      source: frame.source,
      destination: frame.destination,
      service: frame.service,
      priority: frame.priority,
      payloadHex: (telegram.payloadHex ??= toHex(frame.payload)),
      shortPayload: frame.shortPayload,
    };
    if (telegram.sender.deviceId !== undefined) event.deviceId = telegram.sender.deviceId;
    if (frame.addressType === "individual") event.individual = true;
    return event as Mutable<Extract<TraceEvent, { kind: K }>>;
  }

  private requestSlot(readyAtUs: number): void {
    if (this.busy) return; // the end of the current cycle asks again
    const atUs = Math.max(readyAtUs, this.idleSinceUs + IDLE_US, this.scheduler.nowUs);
    if (this.nextSlotUs >= 0 && this.nextSlotUs <= atUs) return;
    this.nextSlotUs = atUs;
    this.scheduler.schedule(atUs, this.slotTag);
  }

  private onSlot(): void {
    const now = this.scheduler.nowUs;
    // A later request may have replaced this slot with an earlier one, which started a frame.
    if (this.busy || now !== this.nextSlotUs) return;
    this.nextSlotUs = -1;
    let winner: Telegram | undefined;
    let losers = 0;
    let nextReadyUs = Infinity;
    const contenders = this.contenders;
    for (let i = 0; i < contenders.length; i++) {
      const telegram = contenders[i]!.current()!;
      if (telegram.readyAtUs > now) {
        if (telegram.readyAtUs < nextReadyUs) nextReadyUs = telegram.readyAtUs;
        continue;
      }
      if (winner === undefined) winner = telegram;
      else {
        losers++;
        if (winsArbitration(telegram, winner)) winner = telegram;
      }
    }
    if (winner === undefined) {
      if (nextReadyUs !== Infinity) this.requestSlot(nextReadyUs);
      return;
    }
    this.busy = true;
    this.current = winner;
    this.currentRepeated = winner.transmissions > 0;
    const attempt = winner.transmissions++;
    const frameEndUs = now + frameDurationUs(winner.octets);
    this.currentFrameEndUs = frameEndUs;
    this.scheduler.schedule(frameEndUs, this.frameEndTag);
    if (this.trace.active) {
      const event = this.telegramEvent("telegram.sent", winner, now);
      event.endUs = frameEndUs;
      event.attempt = attempt;
      event.repeated = this.currentRepeated;
      event.octets = winner.octets;
      event.arbitrationLosers = losers;
      this.trace.append(event);
    }
  }

  private onFrameEnd(): void {
    const telegram = this.current!;
    this.currentAck = this.host.receiveFrame(telegram, this.currentRepeated);
    // The sender listens for the acknowledgement slot whether or not anyone answers.
    this.scheduler.schedule(this.scheduler.nowUs + ACK_SLOT_US, this.ackEndTag);
  }

  private onAckEnd(): void {
    const now = this.scheduler.nowUs;
    const telegram = this.current!;
    const ack = this.currentAck;
    const answered = ack !== NO_ACK_OCTET;
    const frameEndUs = this.currentFrameEndUs;
    const frameStartUs = frameEndUs - frameDurationUs(telegram.octets);
    this.idleSinceUs = answered ? now : frameEndUs;
    this.busy = false;
    this.current = undefined;
    this.record(
      telegram,
      frameStartUs - IDLE_US,
      answered ? now : frameEndUs,
      frameEndUs - frameStartUs + (answered ? ACK_CHARACTER_US : 0),
    );

    const sender = telegram.sender;
    const attempt = telegram.transmissions - 1;
    if (ack === ACK_OCTET) {
      if (this.trace.active) {
        const event = this.telegramEvent("telegram.acked", telegram, now);
        event.attempt = attempt;
        this.trace.append(event);
      }
      this.finish(sender, now);
    } else {
      const busy = ack === BUSY_OCTET || ack === 0x00;
      const reason = !answered ? "none" : busy ? "busy" : "nak";
      if (attempt < MAX_REPETITIONS) {
        telegram.readyAtUs = busy ? now + BUSY_WAIT_US : now;
        if (this.trace.active) {
          const event = this.telegramEvent("telegram.repeated", telegram, now);
          event.attempt = attempt;
          event.reason = reason;
          this.trace.append(event);
        }
      } else {
        if (this.trace.active) {
          const event = this.telegramEvent("telegram.lost", telegram, now);
          event.attempt = attempt;
          event.reason = reason;
          this.trace.append(event);
        }
        this.host.telegramLost?.(telegram);
        this.finish(sender, now);
      }
    }
    // Next slot: the earliest ready telegram, no sooner than 50 idle bit times.
    let nextReadyUs = Infinity;
    const contenders = this.contenders;
    for (let i = 0; i < contenders.length; i++) {
      const readyAtUs = contenders[i]!.current()!.readyAtUs;
      if (readyAtUs < nextReadyUs) nextReadyUs = readyAtUs;
    }
    if (nextReadyUs !== Infinity) this.requestSlot(nextReadyUs);
  }

  private finish(sender: Tp1Sender, now: number): void {
    sender.shift();
    const next = sender.current();
    if (next !== undefined) {
      next.readyAtUs = now;
      return;
    }
    // Remove from contenders by swapping in the last one.
    const index = sender.contenderIndex;
    const last = this.contenders.pop()!;
    if (last !== sender) {
      this.contenders[index] = last;
      last.contenderIndex = index;
    }
    sender.contenderIndex = -1;
  }

  private record(
    telegram: Telegram,
    occupiedStartUs: number,
    occupiedEndUs: number,
    busyUs: number,
  ): void {
    const repeated = telegram.transmissions > 1;
    const i = this.historyNext;
    // Before the ring first wraps, `i` is the columns' length: the writes append.
    this.histOccupiedStart[i] = occupiedStartUs;
    this.histOccupiedEnd[i] = occupiedEndUs;
    this.histBusyUs[i] = busyUs;
    this.histDestination[i] = telegram.frame.destination;
    this.histRepeated[i] = repeated;
    this.histSender[i] = telegram.sender.countKey;
    this.historyNext = i + 1 === this.historyCapacity ? 0 : i + 1;
    if (this.historyCount < this.historyCapacity) this.historyCount++;

    this.transmissionsTotal++;
    this.busyUsTotal += busyUs;
    this.occupiedUsTotal += occupiedEndUs - occupiedStartUs;
    if (!repeated) {
      this.telegramsTotal++;
      const destination = telegram.frame.destination;
      this.telegramsByGroupAddress.set(
        destination,
        (this.telegramsByGroupAddress.get(destination) ?? 0) + 1,
      );
      const key = telegram.sender.countKey;
      this.telegramsBySender.set(key, (this.telegramsBySender.get(key) ?? 0) + 1);
    }
  }

  /**
   * Load and counts over the last `windowUs` of virtual time (ending now).
   * Transmissions are clipped to the window; counts go by the frame's start.
   */
  stats(windowUs: number): BusStats {
    if (!(windowUs > 0) || !Number.isSafeInteger(windowUs))
      throw new RangeError(`busStats: windowUs ${windowUs} is not a positive integer`);
    const toUs = this.scheduler.nowUs;
    const fromUs = toUs - windowUs;
    let transmissions = 0;
    let telegrams = 0;
    let busyUs = 0;
    let occupiedUs = 0;
    const byGroupAddress = new Map<number, number>();
    const bySender = new Map<string, number>();
    let index = this.historyNext;
    for (let n = 0; n < this.historyCount; n++) {
      index = index === 0 ? this.historyCapacity - 1 : index - 1;
      const start = this.histOccupiedStart[index]!;
      const end = this.histOccupiedEnd[index]!;
      if (end <= fromUs) break;
      const clippedStart = start < fromUs ? fromUs : start;
      const clippedEnd = end > toUs ? toUs : end;
      occupiedUs += clippedEnd - clippedStart;
      const fraction = (clippedEnd - clippedStart) / (end - start);
      busyUs += this.histBusyUs[index]! * fraction;
      // A transmission counts where its frame starts: after the 50 idle bit times.
      if (start + IDLE_US >= fromUs) {
        transmissions++;
        if (!this.histRepeated[index]) {
          telegrams++;
          const destination = this.histDestination[index]!;
          byGroupAddress.set(destination, (byGroupAddress.get(destination) ?? 0) + 1);
          const key = this.histSender[index]!;
          bySender.set(key, (bySender.get(key) ?? 0) + 1);
        }
      }
    }
    // The transmission on the line now is recorded only when its acknowledgement slot ends: count
    // it here, in the window its frame started in, with the time it has held the line so far (the
    // next window clips the recorded one to its own start, so nothing counts twice or is lost).
    const current = this.current;
    if (current !== undefined) {
      const frameStartUs = this.currentFrameEndUs - frameDurationUs(current.octets);
      const occupiedStartUs = frameStartUs - IDLE_US;
      const clippedStart = occupiedStartUs < fromUs ? fromUs : occupiedStartUs;
      if (toUs > clippedStart) occupiedUs += toUs - clippedStart;
      const frameSoFarUs = Math.min(toUs, this.currentFrameEndUs) - Math.max(fromUs, frameStartUs);
      if (frameSoFarUs > 0) busyUs += frameSoFarUs;
      if (frameStartUs >= fromUs) {
        transmissions++;
        if (!this.currentRepeated) {
          telegrams++;
          const destination = current.frame.destination;
          byGroupAddress.set(destination, (byGroupAddress.get(destination) ?? 0) + 1);
          const key = current.sender.countKey;
          bySender.set(key, (bySender.get(key) ?? 0) + 1);
        }
      }
    }
    // A full ring has forgotten older transmissions; say so when the window reaches past the oldest kept.
    const truncated =
      this.historyCount === this.historyCapacity &&
      this.histOccupiedStart[this.historyNext]! > fromUs;
    return {
      line: this.id,
      fromUs,
      toUs,
      transmissions,
      telegrams,
      repetitions: transmissions - telegrams,
      busyUs: Math.round(busyUs),
      occupiedUs,
      loadPercent: (occupiedUs / windowUs) * 100,
      byGroupAddress,
      bySender,
      truncated,
    };
  }
}

/**
 * True when `a` wins bitwise arbitration against `b` (see the class comment).
 * Octets are compared in transmission order, each least significant bit first;
 * at the first differing bit the frame sending 0 wins.
 */
export function winsArbitration(a: Telegram, b: Telegram): boolean {
  const fa = a.frame;
  const fb = b.frame;
  const controlA = 0x90 | (a.transmissions > 0 ? 0 : 0x20) | (PRIORITY_CODE[fa.priority] << 2);
  const controlB = 0x90 | (b.transmissions > 0 ? 0 : 0x20) | (PRIORITY_CODE[fb.priority] << 2);
  let verdict = compareOctet(controlA, controlB);
  if (verdict !== 0) return verdict < 0;
  verdict = compareOctet(fa.source >> 8, fb.source >> 8);
  if (verdict !== 0) return verdict < 0;
  verdict = compareOctet(fa.source & 0xff, fb.source & 0xff);
  if (verdict !== 0) return verdict < 0;
  // Same control and source: only one station can own an address, so this is rare; compare the rest.
  const bytesA = encodeTp1Frame({ ...fa, repeated: a.transmissions > 0 });
  const bytesB = encodeTp1Frame({ ...fb, repeated: b.transmissions > 0 });
  const length = Math.min(bytesA.length, bytesB.length);
  for (let i = 3; i < length; i++) {
    verdict = compareOctet(bytesA[i]!, bytesB[i]!);
    if (verdict !== 0) return verdict < 0;
  }
  return false;
}

/** -1 when `x` wins (sends the first 0 where they differ, LSB first), 1 when `y` wins, 0 when equal. */
function compareOctet(x: number, y: number): number {
  const differing = x ^ y;
  if (differing === 0) return 0;
  const lowest = differing & -differing;
  return (x & lowest) === 0 ? -1 : 1;
}
