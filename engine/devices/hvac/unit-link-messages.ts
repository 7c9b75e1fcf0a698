import { z } from "zod";
import { hvacModeSchema, systemDirectionSchema } from "./hvac-mode";

/**
 * The messages members of an HVAC unit link exchange (wired link between an
 * indoor unit, its controllers and, for multi-split, the shared outdoor unit).
 *
 * A device sends one with the `link.send` effect; the runtime delivers it to the
 * other members of that link as a `link.receive` event after a small delay.
 * Receivers validate with `unitLinkMessageSchema` and ignore anything else, so a
 * message from a foreign device type never breaks a transition.
 */

/** A controller's role on the unit link; exactly one primary per indoor unit. */
export const controllerRoleSchema = z.enum(["primary", "secondary"]);
export type ControllerRole = z.infer<typeof controllerRoleSchema>;

/** Fan level on the unit: 0 = automatic, 1..5 = fixed levels. */
export const fanLevelSchema = z.number().int().min(0).max(5);

/** A controller (gateway or wall controller) says it is on the link and in which role; repeated periodically. */
export const controllerAnnounceSchema = z.object({
  kind: z.literal("controller.announce"),
  role: controllerRoleSchema,
  controller: z.enum(["gateway", "wall-controller"]),
});
export type ControllerAnnounce = z.infer<typeof controllerAnnounceSchema>;

/** A controller asks the indoor unit to change; absent fields stay as they are. */
export const unitCommandSchema = z.object({
  kind: z.literal("unit.command"),
  power: z.boolean().optional(),
  mode: hvacModeSchema.optional(),
  fanLevel: fanLevelSchema.optional(),
  louvrePercent: z.number().min(0).max(100).optional(),
  setpointC: z.number().optional(),
  /**
   * Room temperature from a KNX sensor; only the primary gateway may send it.
   * null hands control back to the unit's own sensor (the KNX value stopped arriving).
   */
  externalRoomC: z.number().nullable().optional(),
  /**
   * The gateway locks (true) or releases the local keys of the wall
   * controllers on the unit; commands from KNX are not affected.
   */
  localLock: z.boolean().optional(),
  /** The filter was cleaned or changed: restart the filter's running-time count. */
  filterReset: z.literal(true).optional(),
});
export type UnitCommand = z.infer<typeof unitCommandSchema>;

/** Why the indoor unit did not do all of what a command asked. */
export const unitRefusalSchema = z.object({
  /** Transition name, e.g. "system.mode-refused", "link.command-refused". */
  transition: z.string(),
  /** The controller whose command was refused. */
  controller: z.string(),
  text: z.string(),
});
export type UnitRefusal = z.infer<typeof unitRefusalSchema>;

/** What the indoor unit really runs; sent after every change and every model step that moves the room. */
export const unitStatusSchema = z.object({
  kind: z.literal("unit.status"),
  power: z.boolean(),
  mode: hvacModeSchema,
  /** The direction auto mode resolved to (or the mode's own direction). */
  direction: systemDirectionSchema,
  fanLevel: fanLevelSchema,
  louvrePercent: z.number(),
  setpointC: z.number(),
  /** The temperature the unit controls on (external when a primary gateway supplies one); null when unreadable. */
  roomC: z.number().nullable(),
  /** Active faults, descriptive ids (see fault-ids.ts). */
  faults: z.array(z.string()),
  /** Multi-split only: this unit holds mode authority for the shared outdoor unit. */
  modeAuthority: z.boolean(),
  /**
   * Multi-split only: the direction the shared outdoor unit imposes on this
   * unit ("none" while it holds mode authority itself or nobody does). A
   * controller reports it as the heat/cool in force when the unit only moves air.
   */
  systemDirection: systemDirectionSchema.optional(),
  /** What the unit's outdoor sensor reads, °C (the outdoor temperature the room model uses). */
  outdoorC: z.number().optional(),
  /** The wall controllers' keys are locked from KNX. */
  localLocked: z.boolean().optional(),
  /** The fan has run long enough that the filter is due for cleaning. */
  filterAlarm: z.boolean().optional(),
  /** The unit heats to hold its frost-protection minimum, whatever it was set to. */
  frostProtection: z.boolean().optional(),
  /** Why the fan is held off while heating: the coil warming up, or a defrost cycle; null when it runs. */
  fanHeld: z.enum(["hot-start", "defrost"]).nullable().optional(),
  refusal: unitRefusalSchema.optional(),
});
export type UnitStatus = z.infer<typeof unitStatusSchema>;

/** The outdoor unit tells its indoor units which member holds mode authority and which way the system runs. */
export const systemStateSchema = z.object({
  kind: z.literal("system.state"),
  direction: systemDirectionSchema,
  /** Device id of the indoor unit holding mode authority, or null. */
  authority: z.string().nullable(),
});
export type SystemState = z.infer<typeof systemStateSchema>;

/**
 * The indoor unit's sign of life, repeated every `UNIT_ALIVE_PERIOD_US`, so a
 * controller notices a broken link even while nothing changes.
 */
export const unitAliveSchema = z.object({ kind: z.literal("unit.alive") });
export type UnitAlive = z.infer<typeof unitAliveSchema>;

/** Any message on a unit link. */
export const unitLinkMessageSchema = z.discriminatedUnion("kind", [
  controllerAnnounceSchema,
  unitCommandSchema,
  unitStatusSchema,
  systemStateSchema,
  unitAliveSchema,
]);
export type UnitLinkMessage = z.infer<typeof unitLinkMessageSchema>;

const unitLinkMessageKinds: ReadonlySet<unknown> = new Set<UnitLinkMessage["kind"]>([
  "controller.announce",
  "unit.command",
  "unit.status",
  "system.state",
  "unit.alive",
]);

/**
 * Recognises a received message; undefined for anything that is not a unit-link message.
 *
 * Unit-link messages are built by typed engine code, never read from outside,
 * so the kind alone identifies them: running the zod schema on every delivery
 * cost about a tenth of a scenario replay. The schemas stay the documentation
 * and are used at the edges (tests, tools that accept messages as JSON).
 */
export function parseUnitLinkMessage(message: unknown): UnitLinkMessage | undefined {
  if (typeof message !== "object" || message === null) return undefined;
  return unitLinkMessageKinds.has((message as { kind?: unknown }).kind)
    ? (message as UnitLinkMessage)
    : undefined;
}

/** How often controllers repeat their announcement, so the unit notices role changes and lost controllers (virtual µs). */
export const CONTROLLER_ANNOUNCE_PERIOD_US = 10_000_000;

/** A controller not heard for this long is treated as gone (three missed announcements). */
export const CONTROLLER_TIMEOUT_US = 3 * CONTROLLER_ANNOUNCE_PERIOD_US + 1_000_000;

/**
 * Grace after the unit starts before it judges the primary count: one full
 * announcement period and a second, so a unit restarted alone (a parameter
 * download) hears every controller before it could report a missing primary.
 */
export const LINK_SUPERVISION_GRACE_US = CONTROLLER_ANNOUNCE_PERIOD_US + 1_000_000;

/** How often an indoor unit says it is alive on its links (virtual µs); the same period as controllers announce. */
export const UNIT_ALIVE_PERIOD_US = CONTROLLER_ANNOUNCE_PERIOD_US;
