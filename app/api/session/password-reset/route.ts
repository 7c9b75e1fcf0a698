import { admitPasswordResetRequest, passwordResetAcceptedMessage } from "@/app/_lib/auth";
import { clientAddressOf } from "@/app/_lib/client-address";
import { json, readJson, route } from "@/app/_lib/http";
import { requestPasswordReset } from "@/app/_lib/invitations";
import { requestResetBodySchema } from "./schema";

/**
 * Always 202 with the same body, whether or not the account exists; 429 with
 * one message when the e-mail address or the client address asked too often
 * (counted alike for addresses with and without an account).
 */
export const POST = route(async (request) => {
  const body = await readJson(request, requestResetBodySchema);
  admitPasswordResetRequest({ email: body.email, clientAddress: clientAddressOf(request) });
  await requestPasswordReset(body.email);
  return json({ ok: true, message: passwordResetAcceptedMessage }, { status: 202 });
});
