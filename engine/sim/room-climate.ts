import {
  NO_DRIVE,
  roomBalance,
  temperatureAfterC,
  type RoomBalance,
  type RoomDrive,
  type RoomSpec,
} from "../room";

/**
 * One room of a run: its physics, the drives acting on it, and its temperature
 * at the last change. A class, not a literal (engine/core/run-objects.ts).
 */
class RoomRuntime {
  /** The last read (time, °C), since every unit and sensor in a room reads it at the same times; -1: none since the anchor moved. */
  readUs = -1;
  readC = 0;

  constructor(
    public spec: RoomSpec,
    /** Device id -> that device's share of the heat balance. */
    readonly drives: Map<string, RoomDrive>,
    public balance: RoomBalance,
    /** Temperature at `anchorUs`, °C. */
    public anchorC: number,
    public anchorUs: number,
  ) {}
}

/**
 * The rooms of a run, each modelled once (engine/room/lumped-room.ts): every
 * device in a room reads the same temperature and adds its own drive. A room
 * holds no timer; its temperature is computed in closed form from the last
 * change when someone reads it, so a room nobody reads costs nothing. Reading
 * never moves the anchor, so whether or when anybody reads cannot change a run.
 */
export class RoomClimate {
  private readonly rooms = new Map<string, RoomRuntime>();

  constructor(private readonly clock: { readonly nowUs: number }) {}

  /** Adds a room (or gives an existing one new physics, keeping its temperature now). */
  define(roomId: string, spec: RoomSpec): void {
    const room = this.rooms.get(roomId);
    if (room === undefined) {
      this.rooms.set(
        roomId,
        new RoomRuntime(spec, new Map(), roomBalance(spec, []), spec.initialC, this.clock.nowUs),
      );
      return;
    }
    this.advance(room);
    room.spec = spec;
    room.balance = roomBalance(spec, room.drives.values());
    room.readUs = -1;
  }

  has(roomId: string): boolean {
    return this.rooms.has(roomId);
  }

  /** The room's temperature now, °C. */
  temperatureC(roomId: string): number {
    return this.currentC(this.room(roomId));
  }

  /** A room's temperature at the present virtual time, °C. */
  private currentC(room: RoomRuntime): number {
    const nowUs = this.clock.nowUs;
    // The same inputs give the same value: a second read at the same time skips the exponential.
    if (room.readUs === nowUs) return room.readC;
    room.readC = temperatureAfterC(
      room.anchorC,
      (nowUs - room.anchorUs) / 1_000_000,
      room.spec,
      room.balance,
    );
    room.readUs = nowUs;
    return room.readC;
  }

  /** The room's outdoor temperature, °C. */
  outdoorC(roomId: string): number {
    return this.room(roomId).spec.outdoorC;
  }

  /** The room's physics and current drives, for tests and charts. */
  describe(roomId: string): {
    readonly spec: RoomSpec;
    readonly balance: RoomBalance;
    readonly drives: ReadonlyMap<string, RoomDrive>;
  } {
    const room = this.room(roomId);
    return { spec: room.spec, balance: room.balance, drives: room.drives };
  }

  /** Sets a device's share of its room's heat balance from now on (NO_DRIVE or zeros remove it). */
  drive(roomId: string, deviceId: string, drive: RoomDrive): void {
    const room = this.room(roomId);
    const before = room.drives.get(deviceId) ?? NO_DRIVE;
    if (
      before.conductanceWPerK === drive.conductanceWPerK &&
      before.towardC === drive.towardC &&
      before.watts === drive.watts
    )
      return;
    this.advance(room);
    if (drive.conductanceWPerK === 0 && drive.watts === 0) room.drives.delete(deviceId);
    else room.drives.set(deviceId, drive);
    room.balance = roomBalance(room.spec, room.drives.values());
    room.readUs = -1;
  }

  /** Removes a device's drive from every room (a restart). */
  release(deviceId: string): void {
    for (const [id, room] of this.rooms)
      if (room.drives.has(deviceId)) this.drive(id, deviceId, NO_DRIVE);
  }

  /** Takes over `other`'s rooms as they stand, for a forked run. */
  copyFrom(other: RoomClimate): void {
    this.rooms.clear();
    for (const [id, room] of other.rooms) {
      const copy = new RoomRuntime(
        room.spec,
        new Map(room.drives),
        room.balance,
        room.anchorC,
        room.anchorUs,
      );
      copy.readUs = room.readUs;
      copy.readC = room.readC;
      this.rooms.set(id, copy);
    }
  }

  /** Moves the anchor to now (only before the balance changes). */
  private advance(room: RoomRuntime): void {
    room.anchorC = this.currentC(room);
    room.anchorUs = this.clock.nowUs;
  }

  private room(roomId: string): RoomRuntime {
    const room = this.rooms.get(roomId);
    if (room === undefined) throw new Error(`no room "${roomId}" in this run`);
    return room;
  }
}
