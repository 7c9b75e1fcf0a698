import { z } from "zod";

/**
 * Ids that people write in bench and scenario files: lower-case letters, digits
 * and single hyphens, starting with a letter ("pb-hall", "actuator-1"). They
 * appear in URLs, trace filters and golden files, so they stay plain.
 */
export const entityIdSchema = z
  .string()
  .regex(
    /^[a-z][a-z0-9]*(?:-[a-z0-9]+)*$/,
    "an id is lower-case letters, digits and single hyphens, starting with a letter",
  );

export type EntityId = z.infer<typeof entityIdSchema>;

/**
 * Hands out consecutive integer ids inside one run (telegram ids, timer
 * generations). Deterministic: the n-th id of a run is always the same number.
 */
export class SequentialIds {
  private nextId: number;

  constructor(first = 1) {
    this.nextId = first;
  }

  next(): number {
    return this.nextId++;
  }

  /** The id the next call returns; useful for snapshots. */
  peek(): number {
    return this.nextId;
  }

  /** Continues where `other` stands (a forked run). */
  copyFrom(other: SequentialIds): void {
    this.nextId = other.nextId;
  }
}
