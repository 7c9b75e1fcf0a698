/**
 * Fixed-capacity storage that the store mutates in place: appending a batch
 * costs no copying and no new React state beyond one version number, which is
 * what keeps a busy bus cheap on the page's main thread. Index 0 is the oldest
 * kept item; pushing beyond the capacity forgets the oldest.
 */
export class SampleRing<T> {
  private readonly items: (T | undefined)[];
  private head = 0;
  private count = 0;
  /** Items ever appended, including ones the ring has since forgotten. */
  total = 0;

  constructor(readonly capacity: number) {
    if (!Number.isInteger(capacity) || capacity < 1)
      throw new RangeError(`ring capacity ${capacity} is not a positive integer`);
    this.items = new Array<T | undefined>(capacity);
  }

  get length(): number {
    return this.count;
  }

  push(items: readonly T[]): void {
    for (let i = 0; i < items.length; i++) this.pushOne(items[i]!);
  }

  pushOne(item: T): void {
    const index = (this.head + this.count) % this.capacity;
    this.items[index] = item;
    if (this.count < this.capacity) this.count++;
    else this.head = (this.head + 1) % this.capacity;
    this.total++;
  }

  /** The i-th kept item, oldest first. */
  at(i: number): T {
    if (i < 0 || i >= this.count)
      throw new RangeError(`ring item ${i} is outside 0..${this.count - 1}`);
    return this.items[(this.head + i) % this.capacity]!;
  }

  /** The kept items, oldest first, as a new array (for a view that redraws now and then, not per batch). */
  toArray(): T[] {
    const out = new Array<T>(this.count);
    for (let i = 0; i < this.count; i++) out[i] = this.items[(this.head + i) % this.capacity]!;
    return out;
  }

  clear(): void {
    this.items.fill(undefined);
    this.head = 0;
    this.count = 0;
    this.total = 0;
  }
}
