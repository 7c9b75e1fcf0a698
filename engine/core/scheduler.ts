/**
 * The virtual clock and its event queue.
 *
 * Time is an integer number of microseconds since the start of the run and only
 * moves when an event is taken from the queue (or when a run is asked to end at a
 * later time). The queue is a binary heap ordered by (time, insertion sequence),
 * so events at the same microsecond come out in the order they were scheduled:
 * that stable order is what makes a run reproducible.
 *
 * The heap is kept in parallel arrays indexed by slot, with a free list of
 * slots, so scheduling and taking an event allocate nothing once the arrays have
 * grown to the run's working size. They are plain arrays of numbers rather than
 * typed arrays: a typed array costs far more to create (every run, and every
 * fork of a settled run, creates a scheduler) and no faster to read. An event
 * is a small integer `tag` saying what to do, an integer `arg` (usually an
 * index into the caller's tables) and an optional object `payload`.
 * Cancellation is left to callers (generation counters), which is cheaper than
 * removing from the middle of a heap.
 *
 * Owners of events (a line, the device runtime) `register` a handler and get
 * the tag to schedule with; `run` and `runOne` dispatch each event to it.
 */
import { runArray } from "./run-objects";

export type EventHandler = (arg: number, payload: unknown) => void;

/** `length` zeros, as a packed array (a hole-free array reads faster). */
function zeros(length: number): number[] {
  const array: number[] = [];
  for (let i = 0; i < length; i++) array.push(0);
  return array;
}

/**
 * `length` zeros in an array that holds doubles from the start. Times pass the
 * small-integer range after about 36 virtual minutes; an array that changed its
 * kind then would leave the queue code handling two kinds of array at once
 * (every new run starts small-integer again), which is slower for all runs.
 */
function doubles(length: number): number[] {
  const array = [0.5];
  array.pop();
  for (let i = 0; i < length; i++) array.push(0);
  return array;
}

export class Scheduler {
  /** Virtual time now, integer microseconds. */
  nowUs = 0;

  /** Tag, arg and payload of the event last taken by `next()`. */
  firedTag = 0;
  firedArg = 0;
  firedPayload: unknown = undefined;

  private heap: number[];
  private size = 0;
  private slotTimeUs: number[];
  private slotSeq: number[];
  private slotTag: number[];
  private slotArg: number[];
  private slotPayload: unknown[];
  private freeSlots: number[];
  private freeCount: number;
  private seq = 0;
  private readonly handlers: EventHandler[] = runArray<EventHandler>();

  constructor(initialCapacity = 256) {
    const capacity = Math.max(16, initialCapacity);
    this.heap = zeros(capacity);
    this.slotTimeUs = doubles(capacity);
    this.slotSeq = zeros(capacity);
    this.slotTag = zeros(capacity);
    this.slotArg = zeros(capacity);
    this.slotPayload = runArray<unknown>();
    for (let i = 0; i < capacity; i++) this.slotPayload.push(undefined);
    this.freeSlots = zeros(capacity);
    for (let i = 0; i < capacity; i++) this.freeSlots[i] = capacity - 1 - i;
    this.freeCount = capacity;
  }

  /** Registers a handler and returns the tag that routes events to it. */
  register(handler: EventHandler): number {
    this.handlers.push(handler);
    return this.handlers.length - 1;
  }

  /** Takes and dispatches one event due at or before `limitUs`; false when there is none. */
  runOne(limitUs = Infinity): boolean {
    if (!this.next(limitUs)) return false;
    const handler = this.handlers[this.firedTag];
    if (handler === undefined)
      throw new Error(`Scheduler: no handler registered for tag ${this.firedTag}`);
    handler(this.firedArg, this.firedPayload);
    return true;
  }

  /** Dispatches every event due at or before `limitUs` (including ones scheduled meanwhile); returns how many. */
  run(limitUs: number): number {
    let count = 0;
    const handlers = this.handlers;
    while (this.next(limitUs)) {
      const handler = handlers[this.firedTag];
      if (handler === undefined)
        throw new Error(`Scheduler: no handler registered for tag ${this.firedTag}`);
      handler(this.firedArg, this.firedPayload);
      count++;
    }
    return count;
  }

  /** Number of events waiting. */
  get pending(): number {
    return this.size;
  }

  /** Time of the earliest waiting event, or `Infinity` when the queue is empty. */
  peekTimeUs(): number {
    return this.size === 0 ? Infinity : this.slotTimeUs[this.heap[0]!]!;
  }

  /**
   * Queues an event at an absolute virtual time. Scheduling in the past or at a
   * fractional microsecond is a bug in the caller and throws.
   */
  schedule(atUs: number, tag: number, arg = 0, payload?: unknown): void {
    if (!(atUs >= this.nowUs) || !Number.isSafeInteger(atUs)) {
      throw new Error(
        `Scheduler.schedule: time ${atUs} µs is not an integer at or after now (${this.nowUs} µs)`,
      );
    }
    if (this.freeCount === 0) this.grow();
    const slot = this.freeSlots[--this.freeCount]!;
    this.slotTimeUs[slot] = atUs;
    this.slotSeq[slot] = this.seq++;
    this.slotTag[slot] = tag;
    this.slotArg[slot] = arg;
    this.slotPayload[slot] = payload;
    this.siftUp(this.size++, slot);
  }

  /**
   * Takes the earliest event if it is due at or before `limitUs`, advances the
   * clock to its time and exposes it in `firedTag`, `firedArg` and
   * `firedPayload`. Returns false (and leaves the clock alone) otherwise.
   */
  next(limitUs = Infinity): boolean {
    if (this.size === 0) return false;
    const top = this.heap[0]!;
    const timeUs = this.slotTimeUs[top]!;
    if (timeUs > limitUs) return false;
    this.nowUs = timeUs;
    this.firedTag = this.slotTag[top]!;
    this.firedArg = this.slotArg[top]!;
    this.firedPayload = this.slotPayload[top];
    this.slotPayload[top] = undefined;
    this.freeSlots[this.freeCount++] = top;
    const last = this.heap[--this.size]!;
    if (this.size > 0) this.siftDown(0, last);
    return true;
  }

  /** Moves the clock forward to `timeUs` without taking events (used at the end of a run window). */
  advanceTo(timeUs: number): void {
    if (!Number.isSafeInteger(timeUs))
      throw new Error(`Scheduler.advanceTo: ${timeUs} µs is not an integer`);
    if (timeUs > this.nowUs) {
      if (this.size > 0 && this.peekTimeUs() < timeUs) {
        throw new Error(
          `Scheduler.advanceTo: an event is due at ${this.peekTimeUs()} µs, before ${timeUs} µs`,
        );
      }
      this.nowUs = timeUs;
    }
  }

  /**
   * Takes over `other`'s clock and queue exactly (same slots, same sequence
   * numbers, so ties come out in the same order), for a forked run. Handlers
   * are not copied: the fork registers its own in the same order, and
   * `copyPayload` turns each queued payload into the fork's equivalent.
   */
  copyFrom(other: Scheduler, copyPayload: (tag: number, payload: unknown) => unknown): void {
    if (other.handlers.length !== this.handlers.length)
      throw new Error("Scheduler.copyFrom: the two schedulers have different handlers");
    this.nowUs = other.nowUs;
    this.heap = other.heap.slice();
    this.slotTimeUs = other.slotTimeUs.slice();
    this.slotSeq = other.slotSeq.slice();
    this.slotTag = other.slotTag.slice();
    this.slotArg = other.slotArg.slice();
    this.freeSlots = other.freeSlots.slice();
    this.size = other.size;
    // Payloads lead into the run (its devices), so their array comes from runArray, not map.
    const payloads = runArray<unknown>();
    for (let slot = 0; slot < other.slotPayload.length; slot++) {
      const payload = other.slotPayload[slot];
      payloads.push(payload === undefined ? undefined : copyPayload(other.slotTag[slot]!, payload));
    }
    this.slotPayload = payloads;
    this.freeCount = other.freeCount;
    this.seq = other.seq;
  }

  private before(a: number, b: number): boolean {
    const ta = this.slotTimeUs[a]!;
    const tb = this.slotTimeUs[b]!;
    return ta < tb || (ta === tb && this.slotSeq[a]! < this.slotSeq[b]!);
  }

  private siftUp(index: number, slot: number): void {
    const heap = this.heap;
    while (index > 0) {
      const parentIndex = (index - 1) >> 1;
      const parent = heap[parentIndex]!;
      if (!this.before(slot, parent)) break;
      heap[index] = parent;
      index = parentIndex;
    }
    heap[index] = slot;
  }

  private siftDown(index: number, slot: number): void {
    const heap = this.heap;
    const size = this.size;
    for (;;) {
      let child = 2 * index + 1;
      if (child >= size) break;
      const right = child + 1;
      if (right < size && this.before(heap[right]!, heap[child]!)) child = right;
      const childSlot = heap[child]!;
      if (!this.before(childSlot, slot)) break;
      heap[index] = childSlot;
      index = child;
    }
    heap[index] = slot;
  }

  private grow(): void {
    const old = this.heap.length;
    const capacity = old * 2;
    for (let i = old; i < capacity; i++) {
      this.heap.push(0);
      this.slotTimeUs.push(0);
      this.slotSeq.push(0);
      this.slotTag.push(0);
      this.slotArg.push(0);
      this.slotPayload.push(undefined);
      this.freeSlots.push(0);
    }
    // Every old slot is in use when we grow, so the free list is exactly the new slots.
    let count = 0;
    for (let i = capacity - 1; i >= old; i--) this.freeSlots[count++] = i;
    this.freeCount = count;
  }
}
