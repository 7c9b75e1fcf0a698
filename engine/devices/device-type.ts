import type { z } from "zod";
import type { RoomDrive, RoomSpec } from "../room";

/**
 * The device-type interface every simulated device implements.
 *
 * A device is a pure state machine: `transition(state, event, context)` returns
 * the next state and a list of effects, and never runs them. The simulation
 * runtime (engine/sim) applies the effects: it encodes and queues telegrams,
 * schedules timers on the virtual clock, routes unit-link messages and appends
 * notes to the trace. Because transitions are pure, a run is a function of
 * (bench, inputs, seed) and can be replayed exactly.
 *
 * Group object values live in the runtime, as on a real bus coupler: the runtime
 * answers GroupValue_Read for objects with the read flag from the stored value,
 * so device types only deal with writes, responses and their own behaviour.
 */

/** The standard communication flags of a group object. */
export interface GroupObjectFlags {
  readonly communication: boolean;
  readonly read: boolean;
  readonly write: boolean;
  readonly transmit: boolean;
  readonly update: boolean;
  readonly readOnInit: boolean;
}

/** Whether an object takes commands, reports state, or both; drawn differently on the canvas. */
export type GroupObjectRole = "command" | "status" | "input" | "output";

/** One group object as a device type declares it for a given set of parameters. */
export interface GroupObjectSpec {
  /** Object number, unique within the device, stable across parameter changes. */
  readonly number: number;
  /** Short name shown on the device card, e.g. "Setpoint status". */
  readonly name: string;
  /** DPT id from engine/dpt, e.g. "9.001". */
  readonly dpt: string;
  readonly flags: GroupObjectFlags;
  readonly role: GroupObjectRole;
}

/** A local control on the device (push-button rocker, wall controller key). */
export interface LocalButtonSpec {
  readonly id: string;
  readonly label: string;
}

/**
 * Name of the timer event a device with a start-up delay receives once the
 * runtime has sent its statuses after bus power returned (so a device that
 * paces its own sends, such as on-change room temperature, counts that send).
 */
export const STARTUP_DONE_TIMER = "runtime.startup";

/** Descriptive fault identifiers of our own, e.g. "link.two-primaries". */
export type FaultId = string;

/** Something that happens to a device. Times are virtual microseconds. */
export type DeviceEvent =
  /** The simulation started; read-on-init reads are issued by the runtime. */
  | { readonly kind: "start" }
  /** A GroupValue_Write reached an object with the write flag; the runtime already stored the value. */
  | {
      readonly kind: "group.write";
      readonly object: number;
      readonly value: unknown;
      readonly source: number;
    }
  /** A GroupValue_Response reached an object with the update flag; the runtime already stored the value. */
  | {
      readonly kind: "group.response";
      readonly object: number;
      readonly value: unknown;
      readonly source: number;
    }
  /** A timer this device set has expired. */
  | { readonly kind: "timer"; readonly name: string; readonly data?: unknown }
  /** A person pressed (or released) one of the device's local buttons. */
  | {
      readonly kind: "button";
      readonly button: string;
      readonly action: "press" | "release" | "long-press";
    }
  /** A local input changed that is not a button (e.g. a window opened, presence seen). */
  | { readonly kind: "input"; readonly input: string; readonly value: unknown }
  /** A message from another member of a unit link (HVAC wiring, not KNX). */
  | {
      readonly kind: "link.receive";
      readonly link: string;
      readonly from: string;
      readonly message: unknown;
    }
  /** A fault was injected into or cleared from this device from outside. */
  | { readonly kind: "fault.inject"; readonly fault: FaultId }
  | { readonly kind: "fault.clear"; readonly fault: FaultId };

/** What a transition asks the runtime to do. */
export type DeviceEffect =
  /** Send the object's value on its sending address: write (or response to a read). Also stores the value. */
  | {
      readonly kind: "group.send";
      readonly object: number;
      readonly service: "write" | "response";
      readonly value: unknown;
    }
  /** Send a GroupValue_Read on the object's sending address. */
  | { readonly kind: "group.read"; readonly object: number }
  /** Store a new object value without sending (e.g. a status that only answers reads). */
  | { readonly kind: "object.store"; readonly object: number; readonly value: unknown }
  /** Set (or replace) a named timer. */
  | {
      readonly kind: "timer.set";
      readonly name: string;
      readonly delayUs: number;
      readonly data?: unknown;
    }
  | { readonly kind: "timer.cancel"; readonly name: string }
  /** Send a message to the other members of a unit link this device belongs to. */
  | { readonly kind: "link.send"; readonly link: string; readonly message: unknown }
  /** Raise or clear a fault that this device itself detected. */
  | { readonly kind: "fault.raise"; readonly fault: FaultId; readonly text: string }
  | { readonly kind: "fault.clear"; readonly fault: FaultId }
  /** A line for the trace explaining why something happened. */
  | { readonly kind: "note"; readonly text: string }
  /**
   * This device's share of its room's heat balance from now on (replaces its
   * previous one; engine/room/lumped-room.ts). Ignored for a device in no room.
   */
  | ({ readonly kind: "room.drive" } & RoomDrive);

/** What a device knows about its surroundings when it transitions. */
export interface DeviceContext<P> {
  /** Virtual time now, integer microseconds since the start of the run. */
  readonly nowUs: number;
  readonly deviceId: string;
  /** Raw 16-bit individual address. */
  readonly individualAddress: number;
  readonly parameters: P;
  /** The unit links this device belongs to, by id. */
  readonly links: readonly string[];
  /** Current stored value of each of this device's group objects, by object number. */
  readonly objectValue: (object: number) => unknown;
  /** Seeded random number in [0, 1) from the run's generator. */
  readonly random: () => number;
  /**
   * Air temperature now of the room the device is in (the bench's room, else
   * its own room from `privateRoom`), °C; undefined when it is in no room.
   * Every device in one room reads the same value.
   */
  readonly roomTemperatureC: () => number | undefined;
  /** Outdoor temperature of the device's room, °C; undefined when it is in no room. */
  readonly roomOutdoorC: () => number | undefined;
}

/** The next state, the effects to apply, and the name of the transition for the trace. */
export interface TransitionResult<S> {
  readonly state: S;
  readonly effects: readonly DeviceEffect[];
  /** Names why the device did something, e.g. "setpoint.clamped"; omitted when nothing happened. */
  readonly transition?: string;
}

/** A device type registered in the catalogue (engine/devices/catalogue.ts). */
export interface DeviceType<P, S> {
  /** Catalogue id, kebab-case, e.g. "hvac-gateway". */
  readonly id: string;
  readonly label: string;
  readonly description: string;
  /** Whether the device sits on the KNX line (has an individual address) or only on a unit link. */
  readonly medium: "knx" | "unit-link";
  /** Zod schema of the parameters; defaults filled by parsing `{}`. */
  readonly parameters: z.ZodType<P>;
  /** The group objects that exist for these parameters; disabled objects are absent. */
  groupObjects(parameters: P): readonly GroupObjectSpec[];
  /** Local buttons a person can press in the live console. */
  buttons(parameters: P): readonly LocalButtonSpec[];
  /** The state at the start of a run. */
  initialState(parameters: P): S;
  /** Pure: same arguments, same result. */
  transition(state: S, event: DeviceEvent, context: DeviceContext<P>): TransitionResult<S>;
  /**
   * The room the device models on its own when the bench puts it in no room
   * (a bench without rooms): built from its parameters, as before rooms were
   * shared. Absent (or undefined) for devices that need no room.
   */
  privateRoom?(parameters: P): RoomSpec | undefined;
  /**
   * Seconds the device waits after bus power returns (and at first start)
   * before it sends its status objects and reads its read-on-init objects.
   * Absent: it sends no statuses at start-up and reads at once.
   */
  startupDelayS?(parameters: P): number;
  /**
   * What the live console charts of this device, read at whole virtual seconds;
   * undefined (or absent) when the device has nothing to chart. Lets a host
   * chart devices without naming their types.
   */
  roomSample?(state: S): RoomChartSample | undefined;
  /**
   * What the device sends on its own (cyclically, or on change paced by a minimum
   * interval), each condition at its configured worst case. The bench checks'
   * expected-load estimate reads this, so no check names a device type or guesses
   * from parameter names. Absent (or empty): the device sends only in answer to
   * telegrams, people or its unit link.
   */
  sendingConditions?(parameters: P): readonly SendingCondition[];
}

/** One condition under which a device sends by itself, for load planning. */
export interface SendingCondition {
  /** Parameter path that sets it ("statusCycleS", "roomTemperatureSending.minIntervalS"). */
  readonly parameter: string;
  /** Shortest time between two sends under this condition, seconds (> 0). */
  readonly periodS: number;
  /**
   * Group objects sent each time. Each one with the communication and transmit
   * flags and a sending address is one telegram; an object nobody linked sends nothing.
   */
  readonly objects: readonly number[];
  /** How the period follows from the parameters, for people ("cyclic every 600 s"). */
  readonly basis: string;
}

/** A room a device conditions, as the live console's temperature chart shows it. */
export interface RoomChartSample {
  /** Room temperature, °C. */
  readonly roomC: number;
  /** Setpoint the device works toward, °C. */
  readonly setpointC: number;
  /** Whether the device is switched on. */
  readonly power: boolean;
}

/** A device type with its parameter and state types erased, as stored in the catalogue. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type AnyDeviceType = DeviceType<any, any>;

/** Flags shorthand for device type authors. */
export function flags(spec: string): GroupObjectFlags {
  // "CRWTUI" letters: communication, read, write, transmit, update, read-on-init.
  return {
    communication: spec.includes("C"),
    read: spec.includes("R"),
    write: spec.includes("W"),
    transmit: spec.includes("T"),
    update: spec.includes("U"),
    readOnInit: spec.includes("I"),
  };
}
