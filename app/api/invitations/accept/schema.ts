import { z } from "zod";
import { nameSchema } from "@/app/_lib/names";
import { passwordInputSchema } from "@/app/_lib/auth";

export const invitationTokenSchema = z
  .string({ error: "the link has no token" })
  .min(20, "the link's token is incomplete")
  .max(200, "the link's token is too long");

/** GET /api/invitations/accept?token=...: what the invitation is for. */
export const describeInvitationQuerySchema = z.strictObject({ token: invitationTokenSchema });

/**
 * POST /api/invitations/accept: a new account sets its name and password; an
 * existing account gives its current password instead (and `name` is ignored).
 */
export const acceptInvitationBodySchema = z.strictObject({
  token: invitationTokenSchema,
  name: nameSchema("a name", "give your name").optional(),
  password: passwordInputSchema,
});
export type AcceptInvitationBody = z.infer<typeof acceptInvitationBodySchema>;
