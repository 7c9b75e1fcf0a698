import { SampleRing } from "./sample-ring";
import type { AddressRateSample, BusLoadSample, RoomSample } from "./sim-protocol";

/** The chart series a room sample belongs to: "room:<id>" for a bench room, "unit:<id>" for a unit's own room. */
export function roomSeriesKey(
  sample: { readonly roomId: string } | { readonly unitId: string },
): string {
  return "roomId" in sample ? `room:${sample.roomId}` : `unit:${sample.unitId}`;
}

/** Room samples kept per series (a bench room, or a unit in no room). */
export const ROOM_SAMPLES_KEPT = 1_000;
/** Virtual seconds of bus load and address rates kept for the charts. */
export const SECONDS_KEPT = 300;

/** What the charts draw, copied out of the rings when a chart redraws (about once a second). */
export interface ChartSnapshot {
  /** By series key (`roomSeriesKey`). */
  readonly rooms: Readonly<Record<string, readonly RoomSample[]>>;
  readonly busLoad: readonly BusLoadSample[];
  readonly rates: readonly AddressRateSample[];
}

/**
 * The console's chart samples in rings mutated in place. A batch appends to
 * them without copying what is already kept (the store bumps one version
 * number); the charts copy them out only when they redraw.
 */
export class ChartSamples {
  private readonly rooms = new Map<string, SampleRing<RoomSample>>();
  private busLoad = new SampleRing<BusLoadSample>(SECONDS_KEPT);
  private readonly rates = new SampleRing<AddressRateSample>(SECONDS_KEPT);

  /** Forgets everything; bus load keeps SECONDS_KEPT seconds of each of `lines` lines. */
  reset(lines: number): void {
    this.rooms.clear();
    this.busLoad = new SampleRing<BusLoadSample>(SECONDS_KEPT * Math.max(1, lines));
    this.rates.clear();
  }

  /** Appends one batch's samples; true when anything was added. */
  add(
    rooms: readonly RoomSample[],
    busLoad: readonly BusLoadSample[],
    rates: readonly AddressRateSample[],
  ): boolean {
    for (const sample of rooms) {
      const key = roomSeriesKey(sample);
      let ring = this.rooms.get(key);
      if (ring === undefined) {
        ring = new SampleRing<RoomSample>(ROOM_SAMPLES_KEPT);
        this.rooms.set(key, ring);
      }
      ring.pushOne(sample);
    }
    this.busLoad.push(busLoad);
    this.rates.push(rates);
    return rooms.length + busLoad.length + rates.length > 0;
  }

  /** Room samples of one series (see `roomSeriesKey`), oldest first (a copy). */
  roomSamples(key: string): RoomSample[] {
    return this.rooms.get(key)?.toArray() ?? [];
  }

  /** Everything kept, oldest first (copies). */
  snapshot(): ChartSnapshot {
    const rooms: Record<string, readonly RoomSample[]> = {};
    for (const [key, ring] of this.rooms) rooms[key] = ring.toArray();
    return { rooms, busLoad: this.busLoad.toArray(), rates: this.rates.toArray() };
  }
}
