import { SampleRing } from "./sample-ring";
import type { AddressRateSample, BusLoadSample, RoomSample } from "./sim-protocol";

/** Room samples kept per indoor unit. */
export const ROOM_SAMPLES_KEPT = 1_000;
/** Virtual seconds of bus load and address rates kept for the charts. */
export const SECONDS_KEPT = 300;

/** What the charts draw, copied out of the rings when a chart redraws (about once a second). */
export interface ChartSnapshot {
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
      let ring = this.rooms.get(sample.unitId);
      if (ring === undefined) {
        ring = new SampleRing<RoomSample>(ROOM_SAMPLES_KEPT);
        this.rooms.set(sample.unitId, ring);
      }
      ring.pushOne(sample);
    }
    this.busLoad.push(busLoad);
    this.rates.push(rates);
    return rooms.length + busLoad.length + rates.length > 0;
  }

  /** Room samples of one unit, oldest first (a copy). */
  roomSamples(unitId: string): RoomSample[] {
    return this.rooms.get(unitId)?.toArray() ?? [];
  }

  /** Everything kept, oldest first (copies). */
  snapshot(): ChartSnapshot {
    const rooms: Record<string, readonly RoomSample[]> = {};
    for (const [unitId, ring] of this.rooms) rooms[unitId] = ring.toArray();
    return { rooms, busLoad: this.busLoad.toArray(), rates: this.rates.toArray() };
  }
}
