import { z } from "zod";
import { roleSchema } from "../schema";

/** PATCH /api/members/:membershipId: change the member's role. */
export const changeRoleBodySchema = z.strictObject({ role: roleSchema });
export type ChangeRoleBody = z.infer<typeof changeRoleBodySchema>;
