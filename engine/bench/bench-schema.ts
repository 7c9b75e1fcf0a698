import { z } from "zod";
import { entityIdSchema } from "../core/ids";

/**
 * Benchline's own bench document, format 2 (format 1 plus topology: optional
 * `areas`, couplers as devices of type "coupler"). Addresses are stored as text
 * ("1/0/1", "1.1.10") so people can read and edit the file; `loadBench` turns
 * them into raw numbers and checks everything that needs more than one field.
 * The schema checks shapes only; cross-references are checked by the loader so
 * each error can name the device, object or address at fault.
 */

/** Current bench format. Older documents are migrated by bench-migrations.ts. */
export const BENCH_FORMAT = 2;

/**
 * Format 1 differs from 2 only in its number (the 1 -> 2 step in
 * bench-migrations.ts only renumbers), so the schema reads a format-1 document
 * as format 2: stored single-line benches and code that still writes 1 load
 * unchanged, and every parsed document says 2.
 */
const formatSchema = z
  .union([z.literal(1), z.literal(BENCH_FORMAT)])
  .transform((): typeof BENCH_FORMAT => BENCH_FORMAT);

/** Display name of an area; areas are otherwise derived from the line addresses. */
export const benchAreaSchema = z.object({
  number: z.number().int().min(0).max(15),
  name: z.string().min(1),
});

/** Canvas position in canvas units (not pixels); the canvas owns the scale. */
export const positionSchema = z.object({ x: z.number(), y: z.number() });

export const benchLineSchema = z.object({
  id: entityIdSchema,
  /** Line address "area.line", e.g. "1.1"; "a.0" is the main line of area a, "0.0" the backbone. */
  address: z.string().regex(/^\d{1,2}\.\d{1,2}$/, 'a line address is "area.line", e.g. "1.1"'),
  name: z.string().min(1),
});

export const benchGroupAddressSchema = z.object({
  address: z.string().min(1),
  name: z.string().min(1),
  /** DPT id of the value on this address, e.g. "9.001". */
  dpt: z.string().min(1),
  position: positionSchema.optional(),
});

/** Flags a bench overrides on one object; missing keys keep the type's default. */
export const objectFlagsOverrideSchema = z
  .object({
    communication: z.boolean(),
    read: z.boolean(),
    write: z.boolean(),
    transmit: z.boolean(),
    update: z.boolean(),
    readOnInit: z.boolean(),
  })
  .partial()
  .strict();

export const benchDeviceSchema = z.object({
  id: entityIdSchema,
  /** Device type id from the catalogue. */
  type: z.string().min(1),
  name: z.string().min(1),
  /** Line id; by default the line whose address matches the individual address, else the first line. */
  line: z.string().optional(),
  /** "area.line.device"; absent for devices that sit only on a unit link. */
  individualAddress: z.string().optional(),
  parameters: z.record(z.string(), z.unknown()).default({}),
  /** Flag overrides keyed by object number as text ("0", "1", ...). */
  objectFlags: z.record(z.string(), objectFlagsOverrideSchema).optional(),
  position: positionSchema.optional(),
  /** Room id (from `rooms`) the device reads and acts on; absent: a room of its own, if it needs one. */
  room: entityIdSchema.optional(),
});

/** A finite room figure in [min, max] whose messages say what it is, its range and its unit. */
function roomNumber(min: number, max: number, what: string, unit: string) {
  const range = `${what} is ${min} to ${max} ${unit}`;
  return z.number(`${what} is a number in ${unit}`).min(min, range).max(max, range);
}

/**
 * A room of the building, modelled once (engine/room): every device naming it
 * reads the same temperature. Thermal fields left out take engine/room's defaults.
 */
export const benchRoomSchema = z.object({
  id: entityIdSchema,
  name: z.string().regex(/\S/, "a room needs a name"),
  /** Room temperature at the start of a run, °C. */
  initialC: roomNumber(-30, 50, "the start temperature", "°C").optional(),
  /** Outdoor temperature the envelope loses heat to, °C. */
  outdoorC: roomNumber(-40, 50, "the outdoor temperature", "°C").optional(),
  /** Effective heat capacity of air, furnishings and inner surfaces, kJ/K (> 0: a room with none would jump). */
  heatCapacityKJPerK: roomNumber(10, 100_000, "the heat capacity", "kJ/K").optional(),
  /** Envelope heat loss to outdoors, W/K. */
  envelopeUaWPerK: roomNumber(1, 10_000, "the envelope loss", "W/K").optional(),
});

export const benchLinkSchema = z.object({
  device: z.string().min(1),
  object: z.number().int().min(0),
  groupAddress: z.string().min(1),
});

export const benchUnitLinkSchema = z.object({
  id: entityIdSchema,
  name: z.string().optional(),
  members: z.array(z.string().min(1)).min(2),
});

export const benchSchema = z.object({
  format: formatSchema,
  name: z.string().min(1),
  description: z.string().optional(),
  /** Display names of areas (optional); a line's area is the first number of its address. */
  areas: z.array(benchAreaSchema).optional(),
  lines: z.array(benchLineSchema).min(1),
  /** Individual address the test tool sends from, e.g. "1.1.250". */
  testToolAddress: z.string().min(1),
  groupAddresses: z.array(benchGroupAddressSchema).default([]),
  devices: z.array(benchDeviceSchema).default([]),
  /** The first link of an object in this array is its sending address; all its links are listened to. */
  links: z.array(benchLinkSchema).default([]),
  unitLinks: z.array(benchUnitLinkSchema).default([]),
  /** Rooms devices sit in; optional, and a bench without rooms gives each unit and sensor its own. */
  rooms: z.array(benchRoomSchema).optional(),
});

export type Position = z.infer<typeof positionSchema>;
export type BenchLine = z.infer<typeof benchLineSchema>;
export type BenchArea = z.infer<typeof benchAreaSchema>;
export type BenchGroupAddress = z.infer<typeof benchGroupAddressSchema>;
export type BenchDevice = z.infer<typeof benchDeviceSchema>;
export type BenchLink = z.infer<typeof benchLinkSchema>;
export type BenchUnitLink = z.infer<typeof benchUnitLinkSchema>;
export type BenchRoom = z.infer<typeof benchRoomSchema>;
export type ObjectFlagsOverride = z.infer<typeof objectFlagsOverrideSchema>;
/** A bench document as validated JSON (addresses still text). */
export type Bench = z.infer<typeof benchSchema>;
/** A bench document as written by hand: defaulted fields may be left out. */
export type BenchInput = z.input<typeof benchSchema>;
