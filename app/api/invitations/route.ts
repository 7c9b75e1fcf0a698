import { invitableRoles, scopeOf } from "@/app/_lib/capabilities";
import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { json, readJson, route } from "@/app/_lib/http";
import { inviteMember } from "@/app/_lib/invitations";
import { listInvitations } from "@/db/queries/invitations";
import { invitationJson } from "./invitation-json";
import { createInvitationBodySchema } from "./schema";

/** Invitations of the workspace (trainers see the apprentice ones they may manage). */
export const GET = route(async (request) => {
  const session = await verifyApiSession(request);
  authorize(session, "invitations.send");
  const rows = listInvitations({
    workspaceId: session.workspaceId,
    ...(scopeOf(session.role, "invitations.send") === "workspace"
      ? {}
      : { roles: invitableRoles(session.role) }),
  });
  return json({
    invitations: rows.map(({ invitation, invitedByName }) => ({
      ...invitationJson(invitation),
      invitedByName,
    })),
  });
});

/** Invite someone; the e-mail with the one-time link is sent before this answers. */
export const POST = route(async (request) => {
  const session = await verifyApiSession(request);
  authorize(session, "invitations.send");
  const body = await readJson(request, createInvitationBodySchema);
  const invitation = await inviteMember(session, body);
  return json({ invitation: invitationJson(invitation) }, { status: 201 });
});
