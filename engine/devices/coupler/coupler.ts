import { z } from "zod";
import { parseGroupAddress } from "../../address";
import type { DeviceType } from "../device-type";

/**
 * A line or area coupler (knx-reference.md, Topology). Its individual address
 * says which lines it joins: a.l.0 joins line a.l to the main line a.0, a.0.0
 * joins main line a.0 to the backbone 0.0 (checked by the bench loader). It has
 * no group objects: what it does lives in the runtime (engine/sim/couplers),
 * which acknowledges, queues and passes telegrams between the two lines.
 */

/**
 * Telegrams a coupler holds per direction while the far line is busy. 32 is
 * our own choice (no published source); a coupler's buffer is commonly a few
 * dozen telegrams (common practice, no published source). Under a burst the
 * buffer fills and the coupler answers BUSY (see engine/sim/couplers).
 */
export const DEFAULT_COUPLER_QUEUE_CAPACITY = 32;

const filterEntrySchema = z.string().refine((text) => parseGroupAddress(text).ok, {
  message: 'expected a group address like "1/0/1"',
});

export const couplerParametersSchema = z.object({
  /** Group telegrams: pass by filter table, pass all, or pass none. */
  groupTelegrams: z.enum(["filter", "forward", "block"]).default("filter"),
  /** Individually addressed telegrams: pass by destination address, pass all, or pass none. */
  individualTelegrams: z.enum(["route", "forward", "block"]).default("route"),
  /**
   * Group addresses the coupler passes in "filter" mode. Absent: generated from
   * the bench's links when the bench loads (as commissioning would). Present: a
   * stored table, which goes stale when links change later.
   */
  filterTable: z.array(filterEntrySchema).max(65_535).optional(),
  /** Telegrams buffered per direction. */
  queueCapacity: z.number().int().min(1).max(1024).default(DEFAULT_COUPLER_QUEUE_CAPACITY),
});
export type CouplerParameters = z.infer<typeof couplerParametersSchema>;

/** Catalogue id of couplers; the runtime and the checks find couplers by it. */
export const COUPLER_TYPE_ID = "coupler";

export const couplerType: DeviceType<CouplerParameters, Record<string, never>> = {
  id: COUPLER_TYPE_ID,
  label: "Coupler",
  description:
    "Line coupler (a.l.0) or area coupler (a.0.0): passes telegrams between its line and the line above by filter table and routing counter.",
  medium: "knx",
  parameters: couplerParametersSchema,
  groupObjects: () => [],
  buttons: () => [],
  initialState: () => ({}),
  transition: (state) => ({ state, effects: [] }),
};
