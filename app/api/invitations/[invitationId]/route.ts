import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { json, route, type RouteParams } from "@/app/_lib/http";
import { revokeManagedInvitation } from "@/app/_lib/invitations";
import { resourceIdSchema } from "@/app/_lib/resources";
import { invitationJson } from "../invitation-json";

type Params = RouteParams<{ invitationId: string }>;

/** Revoke an invitation: its link stops working. */
export const DELETE = route(async (request, context: Params) => {
  const parsed = resourceIdSchema.safeParse((await context.params).invitationId);
  if (!parsed.success) throw new AppError("not_found", "no such invitation");
  const session = await verifyApiSession(request);
  authorize(session, "invitations.send");
  return json({ invitation: invitationJson(revokeManagedInvitation(session, parsed.data)) });
});
