/**
 * A device's live timers: the generation of the latest `timer.set` per timer
 * name. A queued timer whose generation is no longer here was replaced,
 * cancelled or dropped by a restart, and does not fire.
 *
 * Kept as two short parallel arrays rather than a Map: a device has a handful
 * of timers at most, and every fork of a settled run copies every device's
 * timers, which a Map makes several times dearer.
 */
export class DeviceTimers {
  private names: string[] = [];
  private generations: number[] = [];

  /** The live generation of a timer, or undefined when it is not set. */
  get(name: string): number | undefined {
    const i = this.names.indexOf(name);
    return i < 0 ? undefined : this.generations[i];
  }

  set(name: string, generation: number): void {
    const i = this.names.indexOf(name);
    if (i >= 0) this.generations[i] = generation;
    else {
      this.names.push(name);
      this.generations.push(generation);
    }
  }

  delete(name: string): void {
    const i = this.names.indexOf(name);
    if (i < 0) return;
    // Order does not matter: swap the last entry in.
    const last = this.names.length - 1;
    this.names[i] = this.names[last]!;
    this.generations[i] = this.generations[last]!;
    this.names.pop();
    this.generations.pop();
  }

  clear(): void {
    this.names = [];
    this.generations = [];
  }

  /** An independent copy, for a forked run. */
  copy(): DeviceTimers {
    const copy = new DeviceTimers();
    copy.names = this.names.slice();
    copy.generations = this.generations.slice();
    return copy;
  }
}
