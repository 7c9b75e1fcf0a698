import type { LogRow } from "./sim-protocol";

/**
 * The telegram log's storage: a fixed-capacity ring of rows that the store
 * mutates in place, so appending a batch of thousands costs no copying and no
 * new React state beyond one version number. Index 0 is the oldest kept row.
 */
export class LogRing {
  private readonly rows: (LogRow | undefined)[];
  private head = 0;
  private count = 0;
  /** Rows ever appended, including ones the ring has since forgotten. */
  total = 0;

  constructor(readonly capacity: number) {
    if (!Number.isInteger(capacity) || capacity < 1)
      throw new RangeError(`LogRing: capacity ${capacity} is not a positive integer`);
    this.rows = new Array<LogRow | undefined>(capacity);
  }

  get length(): number {
    return this.count;
  }

  push(rows: readonly LogRow[]): void {
    for (let i = 0; i < rows.length; i++) {
      const index = (this.head + this.count) % this.capacity;
      this.rows[index] = rows[i];
      if (this.count < this.capacity) this.count++;
      else this.head = (this.head + 1) % this.capacity;
    }
    this.total += rows.length;
  }

  /** The i-th kept row, oldest first. */
  at(i: number): LogRow {
    if (i < 0 || i >= this.count)
      throw new RangeError(`LogRing: row ${i} is outside 0..${this.count - 1}`);
    return this.rows[(this.head + i) % this.capacity]!;
  }

  clear(): void {
    this.rows.fill(undefined);
    this.head = 0;
    this.count = 0;
    this.total = 0;
  }
}
