/**
 * A device's live timers: the generation (unique in a run) and the data of the
 * latest `timer.set` per timer name. A queued timer whose generation is no
 * longer here was replaced, cancelled or dropped by a restart, and does not
 * fire; one that is here finds its name and data here, so the queue holds only
 * the generation and the device, not an object per timer set.
 *
 * Kept as two short parallel arrays rather than a Map: a device has a handful
 * of timers at most, and every fork of a settled run copies every device's
 * timers, which a Map makes several times dearer.
 */
export class DeviceTimers {
  private names: string[] = [];
  private generations: number[] = [];
  private data: unknown[] = [];

  /** The live generation of a timer, or undefined when it is not set. */
  get(name: string): number | undefined {
    const i = this.names.indexOf(name);
    return i < 0 ? undefined : this.generations[i];
  }

  set(name: string, generation: number, data?: unknown): void {
    const i = this.names.indexOf(name);
    if (i >= 0) {
      this.generations[i] = generation;
      this.data[i] = data;
    } else {
      this.names.push(name);
      this.generations.push(generation);
      this.data.push(data);
    }
  }

  /** Where the timer set with this generation is, or -1 when it no longer is (replaced, cancelled, restarted). */
  indexOfGeneration(generation: number): number {
    return this.generations.indexOf(generation);
  }

  /** Name of the timer at `index` (from `indexOfGeneration`). */
  nameAt(index: number): string {
    return this.names[index]!;
  }

  /** Data of the timer at `index` (from `indexOfGeneration`). */
  dataAt(index: number): unknown {
    return this.data[index];
  }

  delete(name: string): void {
    const i = this.names.indexOf(name);
    if (i < 0) return;
    // Order does not matter: swap the last entry in.
    const last = this.names.length - 1;
    this.names[i] = this.names[last]!;
    this.generations[i] = this.generations[last]!;
    this.data[i] = this.data[last];
    this.names.pop();
    this.generations.pop();
    this.data.pop();
  }

  clear(): void {
    this.names = [];
    this.generations = [];
    this.data = [];
  }

  /** An independent copy, for a forked run. */
  copy(): DeviceTimers {
    const copy = new DeviceTimers();
    copy.names = this.names.slice();
    copy.generations = this.generations.slice();
    copy.data = this.data.slice();
    return copy;
  }
}
