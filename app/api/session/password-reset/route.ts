import { json, readJson, route } from "@/app/_lib/http";
import { requestPasswordReset } from "@/app/_lib/invitations";
import { requestResetBodySchema } from "./schema";

/** Always 202 with the same body, whether or not the account exists. */
export const POST = route(async (request) => {
  const body = await readJson(request, requestResetBodySchema);
  await requestPasswordReset(body.email);
  return json(
    { ok: true, message: "if that address has an account, a reset link is on its way" },
    { status: 202 },
  );
});
