import { z } from "zod";
import { emailSchema, newPasswordSchema } from "@/app/_lib/auth";
import { invitationTokenSchema } from "../../invitations/accept/schema";

/** POST /api/session/password-reset: ask for a reset link. */
export const requestResetBodySchema = z.strictObject({ email: emailSchema });

/** POST /api/session/password-reset/complete: set a new password with the link's token. */
export const completeResetBodySchema = z.strictObject({
  token: invitationTokenSchema,
  password: newPasswordSchema,
});
