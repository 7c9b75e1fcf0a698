import { z } from "zod";
import { roomTemperatureSendingSchema } from "../hvac/room-temperature-sending";
import { startupDelaySchema } from "../startup-delay";

/** One point of a temperature profile: at `atS` seconds into the run (or into each repeat) the room is `valueC`. */
export const profilePointSchema = z.object({
  atS: z.number().min(0),
  valueC: z.number().min(-30).max(60),
});

/** Parameters of a KNX room temperature sensor. */
export const roomTemperatureSensorParametersSchema = z
  .object({
    sending: roomTemperatureSendingSchema.prefault({ mode: "on-change-and-cyclic" }),
    /** Where the measured value comes from: the room it is in, or a profile over time. */
    source: z.enum(["room-model", "profile"]).default("room-model"),
    /** Own room only (the bench puts the sensor in no room): its temperature at the start. */
    initialC: z.number().min(-30).max(60).default(21),
    /** Own room only: outdoor temperature the room drifts toward (Newton's law of cooling). */
    outdoorC: z.number().min(-40).max(50).default(21),
    startupDelayS: startupDelaySchema,
    timeConstantS: z.number().positive("timeConstantS must be above 0 s").default(7200),
    /** Points in time order, linearly interpolated; held flat after the last. */
    profile: z.array(profilePointSchema).max(1000).default([]),
    /** Repeat the profile with this period, seconds; 0 = no repeat. */
    profileRepeatS: z.number().min(0).default(0),
    /** How often the sensor measures, seconds. */
    sampleS: z.number().min(1).max(3600).default(10),
    /** Calibration offset added to what it measures, kelvin. */
    offsetK: z.number().min(-5).max(5).default(0),
  })
  .superRefine((value, context) => {
    if (value.source === "profile" && value.profile.length === 0) {
      context.addIssue({
        code: "custom",
        path: ["profile"],
        message: "profile needs at least one point when source is profile",
      });
    }
    value.profile.forEach((point, index) => {
      const before = value.profile[index - 1];
      if (before !== undefined && point.atS <= before.atS) {
        context.addIssue({
          code: "custom",
          path: ["profile", index, "atS"],
          message: `profile points must be in time order: ${point.atS} s follows ${before.atS} s`,
        });
      }
    });
  });
export type RoomTemperatureSensorParameters = z.infer<typeof roomTemperatureSensorParametersSchema>;
