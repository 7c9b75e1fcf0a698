import { z } from "zod";
import { emailSchema } from "@/app/_lib/auth";
import { roleSchema } from "../members/schema";

/** POST /api/invitations: invite an e-mail address in a role (trainers: apprentices only). */
export const createInvitationBodySchema = z.strictObject({
  email: emailSchema,
  role: roleSchema,
});
export type CreateInvitationBody = z.infer<typeof createInvitationBodySchema>;
