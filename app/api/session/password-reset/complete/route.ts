import { json, readJson, route } from "@/app/_lib/http";
import { completePasswordReset } from "@/app/_lib/invitations";
import { completeResetBodySchema } from "../schema";

/** Set a new password with a reset token; every session of the account ends. */
export const POST = route(async (request) => {
  const body = await readJson(request, completeResetBodySchema);
  await completePasswordReset(body);
  return json({ ok: true });
});
