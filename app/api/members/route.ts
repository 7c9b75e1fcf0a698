import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { json, route } from "@/app/_lib/http";
import { listMembers } from "@/db/queries/memberships";

/** Members of the active workspace with their roles. */
export const GET = route(async (request) => {
  const session = await verifyApiSession(request);
  authorize(session, "members.read");
  const members = listMembers({ workspaceId: session.workspaceId }).map(({ membership, user }) => ({
    membershipId: membership.id,
    userId: user.id,
    name: user.name,
    email: user.email,
    role: membership.role,
    disabled: user.disabledAt !== null,
    joinedAt: membership.createdAt.toISOString(),
    isYou: user.id === session.userId,
  }));
  return json({ members });
});
