import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { json, route, type RouteParams } from "@/app/_lib/http";
import { resendInvitation } from "@/app/_lib/invitations";
import { resourceIdSchema } from "@/app/_lib/resources";
import { invitationJson } from "../../invitation-json";

type Params = RouteParams<{ invitationId: string }>;

/** Send the invitation again with a fresh link and a fresh 7 days; the old link stops working. */
export const POST = route(async (request, context: Params) => {
  const parsed = resourceIdSchema.safeParse((await context.params).invitationId);
  if (!parsed.success) throw new AppError("not_found", "no such invitation");
  const session = await verifyApiSession(request);
  authorize(session, "invitations.send");
  return json({ invitation: invitationJson(await resendInvitation(session, parsed.data)) });
});
