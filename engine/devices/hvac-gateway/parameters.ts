import { z } from "zod";
import { startupDelaySchema } from "../startup-delay";
import { hvacModeSchema } from "../hvac/hvac-mode";
import { roomTemperatureSendingSchema } from "../hvac/room-temperature-sending";
import { controllerRoleSchema, fanLevelSchema } from "../hvac/unit-link-messages";
import { refineSetpointLimits } from "../wall-controller/parameters";
import { fanEncodingSchema } from "./fan-speed";

/** One scene slot: what a recall of `scene` (1..64, as people count, DPT 17.001) sets on the unit. */
export const sceneSlotSchema = z.object({
  scene: z
    .number()
    .int()
    .min(1, "scene must be 1..64 (DPT 17.001)")
    .max(64, "scene must be 1..64 (DPT 17.001)"),
  power: z.boolean().default(true),
  mode: hvacModeSchema.default("auto"),
  /** 0 = automatic fan, 1..fanLevels fixed. */
  fanLevel: fanLevelSchema.default(0),
  setpointC: z.number().min(5).max(40).default(21),
});
export type SceneSlot = z.infer<typeof sceneSlotSchema>;

/** Setpoint limits for one direction of the unit, °C. */
export const setpointLimitsSchema = z
  .object({ setpointMinC: z.number().min(5).max(40), setpointMaxC: z.number().min(5).max(40) })
  .superRefine(refineSetpointLimits);
export type SetpointLimits = z.infer<typeof setpointLimitsSchema>;

/** Parameters of an HVAC gateway (KNX on one side, an indoor unit's wired link on the other). */
export const hvacGatewayParametersSchema = z
  .object({
    /** The gateway's role among the controllers on the unit link; exactly one primary per indoor unit. */
    role: controllerRoleSchema.default("primary"),
    /** Delay after bus power returns before statuses are sent and read-on-init objects read, s. */
    startupDelayS: startupDelaySchema,
    /** Multi-split adds the mode-authority status object. */
    systemType: z.enum(["single-split", "multi-split"]).default("single-split"),
    /** Full: mode objects on DPT 20.105. Simplified: heat/cool objects on DPT 1.100 (0 cooling, 1 heating). */
    modeControl: z.enum(["full", "simplified"]).default("full"),
    /** How the fan speed travels on KNX: DPT 5.100 level, 5.010 level counter or 5.001 percentage (fan-speed.ts). */
    fanEncoding: fanEncodingSchema.default("level"),
    /**
     * A separate 1-bit object for the automatic fan (DPT 1.001, 1 = automatic),
     * with its status. With it, automatic is chosen there only and a fan value
     * of 0 is refused.
     */
    fanAutoObject: z.boolean().default(false),
    /** Fixed fan levels the unit offers (1..fanLevels). */
    fanLevels: z
      .number()
      .int()
      .min(2, "fanLevels must be 2..5")
      .max(5, "fanLevels must be 2..5")
      .default(3),
    /** Whether the unit offers the automatic fan (fan value 0, or the automatic-fan object). */
    fanAuto: z.boolean().default(true),
    /** Louvre position objects (DPT 5.001). */
    louvre: z.boolean().default(false),
    setpointMinC: z.number().min(5).max(40).default(16),
    setpointMaxC: z.number().min(5).max(40).default(30),
    /**
     * Narrower limits while the unit heats or cools (e.g. heating 16..24 °C,
     * cooling 22..30 °C, a common energy-saving setting; common practice, no
     * published source). Without them the general limits apply.
     */
    heatingLimits: setpointLimitsSchema.optional(),
    /**
     * Setpoint shift objects, as room operating units send them: "kelvin" on
     * DPT 9.002 (a temperature difference), "steps" on DPT 6.010 (a signed count
     * of setpointShiftStepK steps); "off" has none. The unit runs the last
     * absolute setpoint plus the shift, inside the limits; a new absolute
     * setpoint clears the shift (common practice, no published source).
     */
    setpointShift: z.enum(["off", "kelvin", "steps"]).default("off"),
    setpointShiftStepK: z.number().min(0.1).max(2).default(0.5),
    /** Largest shift either way, kelvin. */
    setpointShiftMaxK: z.number().min(0.5).max(10).default(3),
    coolingLimits: setpointLimitsSchema.optional(),
    /** The unit's own sensor, or an external KNX value (object 13); only a primary may use "external". */
    roomTemperatureSource: z.enum(["unit", "external"]).default("unit"),
    roomTemperatureSending: roomTemperatureSendingSchema.prefault({}),
    /** Scene slots; the scene objects exist only with at least one slot. */
    scenes: z.array(sceneSlotSchema).max(16).default([]),
    /** Window contact input (DPT 1.019): the unit stops while a window is open. */
    windowContact: z.boolean().default(false),
    /**
     * The window must stay open this long before the unit stops, so airing a
     * room for a moment or a door slammed by a draught does not cycle it
     * (common practice, no published source). 0 = at once.
     */
    windowContactDelayS: z
      .number()
      .int()
      .min(0, "windowContactDelayS must be 0..3600 s")
      .max(3600, "windowContactDelayS must be 0..3600 s")
      .default(0),
    /** For contacts that send 0 when open (normally closed wiring): 0 = open, 1 = closed. */
    windowContactInverted: z.boolean().default(false),
    /**
     * Operating mode input (DPT 20.102: 0 auto, 1 comfort, 2 standby, 3 economy,
     * 4 building protection) with its status, and a presence input (DPT 1.018).
     * The setpoint from KNX is the comfort setpoint; standby and economy set it
     * back (down while heating, up while cooling), building protection holds
     * the protection setpoints, and an unoccupied room in comfort or auto runs
     * standby (common practice, no published source).
     */
    operatingMode: z.boolean().default(false),
    standbySetbackK: z.number().min(0).max(10).default(2),
    economySetbackK: z.number().min(0).max(15).default(4),
    protectionHeatingC: z.number().min(5).max(15).default(7),
    protectionCoolingC: z.number().min(28).max(40).default(35),
    /** Status object (DPT 1.002): the fan is held off for a hot start or a defrost. */
    fanHeldStatus: z.boolean().default(false),
    /** Status object (DPT 1.002) showing that the unit heats for frost protection. */
    frostProtectionStatus: z.boolean().default(false),
    /** Filter alarm (DPT 1.005) and filter reset (DPT 1.015) objects. */
    filterAlarm: z.boolean().default(false),
    /** Outdoor temperature object (DPT 9.001) reporting the unit's outdoor sensor. */
    outdoorTemperature: z.boolean().default(false),
    /**
     * Every status object (and the room and outdoor temperature) is sent again
     * this often, so a visualisation or a supervising controller sees the
     * gateway alive and catches up after missing a telegram (common practice,
     * no published source). 0 = only on change.
     */
    statusCycleS: z
      .number()
      .int()
      .min(0, "statusCycleS must be 0 (off) or 60..86400 s")
      .max(86_400, "statusCycleS must be 0 (off) or 60..86400 s")
      .refine((s) => s === 0 || s >= 60, "statusCycleS must be 0 (off) or 60..86400 s")
      .default(0),
    /**
     * Local operation lock (DPT 1.001, 1 = locked) with its status: the wall
     * controllers' keys stop working while KNX commands still work.
     */
    localLock: z.boolean().default(false),
    /** Lock input (DPT 1.001, 1 = locked): KNX commands are refused while locked. */
    lock: z.boolean().default(false),
    /**
     * Supervision of the wired link: nothing heard from the indoor unit for this
     * long raises gateway.unit-lost on the fault objects; the next word from the
     * unit clears it. The unit says it is alive every 10 s, so 15 s is the least.
     */
    unitTimeoutS: z
      .number()
      .int()
      .min(15, "unitTimeoutS must be 15..600 s (the unit reports every 10 s)")
      .max(600, "unitTimeoutS must be 15..600 s (the unit reports every 10 s)")
      .default(30),
    /**
     * With an external room temperature: no value for this long hands control
     * back to the unit's own sensor and raises gateway.external-temperature-lost
     * until a value arrives again. 0 = never (the gateway keeps the last value).
     * Set it to two or three of the sensor's cycle times.
     */
    externalTemperatureTimeoutS: z
      .number()
      .int()
      .min(0, "externalTemperatureTimeoutS must be 0 (off) or 60..86400 s")
      .max(86_400, "externalTemperatureTimeoutS must be 0 (off) or 60..86400 s")
      .refine(
        (s) => s === 0 || s >= 60,
        "externalTemperatureTimeoutS must be 0 (off) or 60..86400 s",
      )
      .default(0),
  })
  .superRefine((value, context) => {
    refineSetpointLimits(value, context);
    const seen = new Set<number>();
    value.scenes.forEach((slot, index) => {
      if (seen.has(slot.scene))
        context.addIssue({
          code: "custom",
          path: ["scenes", index, "scene"],
          message: `scene ${slot.scene} has two slots`,
        });
      seen.add(slot.scene);
      if (slot.fanLevel > value.fanLevels) {
        context.addIssue({
          code: "custom",
          path: ["scenes", index, "fanLevel"],
          message: `fanLevel ${slot.fanLevel} is above fanLevels (${value.fanLevels})`,
        });
      }
      if (slot.fanLevel === 0 && !value.fanAuto) {
        context.addIssue({
          code: "custom",
          path: ["scenes", index, "fanLevel"],
          message: "fanLevel 0 (automatic) needs fanAuto",
        });
      }
    });
  });
export type HvacGatewayParameters = z.infer<typeof hvacGatewayParametersSchema>;
