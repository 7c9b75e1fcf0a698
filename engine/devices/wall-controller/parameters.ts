import { z } from "zod";
import { controllerRoleSchema } from "../hvac/unit-link-messages";

/** Setpoint limits shared by HVAC controllers, °C; inverted limits are refused with a message naming both fields. */
export function refineSetpointLimits(
  value: { setpointMinC: number; setpointMaxC: number },
  context: z.RefinementCtx,
): void {
  if (value.setpointMinC >= value.setpointMaxC) {
    context.addIssue({
      code: "custom",
      path: ["setpointMinC"],
      message: `setpointMinC (${value.setpointMinC} °C) must be below setpointMaxC (${value.setpointMaxC} °C)`,
    });
  }
}

/** Parameters of a wired wall controller. */
export const wallControllerParametersSchema = z
  .object({
    /** Role on the unit link; exactly one controller per indoor unit is primary. */
    role: controllerRoleSchema.default("primary"),
    /** Change per press of the setpoint keys, kelvin. */
    setpointStepK: z.number().min(0.1).max(5).default(0.5),
    setpointMinC: z.number().min(5).max(40).default(16),
    setpointMaxC: z.number().min(5).max(40).default(30),
  })
  .superRefine(refineSetpointLimits);
export type WallControllerParameters = z.infer<typeof wallControllerParametersSchema>;
