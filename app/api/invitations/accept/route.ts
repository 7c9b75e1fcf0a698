import { newPasswordSchema } from "@/app/_lib/auth";
import { AppError, validationError } from "@/app/_lib/errors";
import { json, readJson, readQuery, route } from "@/app/_lib/http";
import { acceptInvitation, describeInvitation, hashToken } from "@/app/_lib/invitations";
import { findInvitationByTokenHash } from "@/db/queries/invitations";
import { findUserByEmail } from "@/db/queries/users";
import { acceptInvitationBodySchema, describeInvitationQuerySchema } from "./schema";

/** Signed-out: what the invitation link is for (workspace, role, whether the account exists). */
export const GET = route(async (request) => {
  const query = readQuery(request, describeInvitationQuerySchema);
  const invitation = describeInvitation(query.token);
  return json({ invitation: { ...invitation, expiresAt: invitation.expiresAt.toISOString() } });
});

/** Signed-out: accept with the token from the e-mail. */
export const POST = route(async (request) => {
  const body = await readJson(request, acceptInvitationBodySchema);
  const found = findInvitationByTokenHash({ tokenHash: hashToken(body.token) });
  // A new account must meet the password policy; an existing one just proves itself.
  if (found && !findUserByEmail({ email: found.invitation.email })) {
    const checked = newPasswordSchema.safeParse(body.password);
    if (!checked.success) throw validationError(checked.error, ["password"]);
    if (!body.name) throw new AppError("invalid_input", "name: give your name", { field: "name" });
  }
  const accepted = await acceptInvitation(body);
  return json({ accepted: true, email: accepted.email });
});
