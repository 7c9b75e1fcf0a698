import type { Invitation } from "@/db/queries/invitations";

/** An invitation as the API returns it; the token hash never leaves the server. */
export function invitationJson(invitation: Invitation, now = new Date()) {
  const state = invitation.acceptedAt
    ? "accepted"
    : invitation.revokedAt
      ? "revoked"
      : invitation.expiresAt <= now
        ? "expired"
        : "open";
  return {
    id: invitation.id,
    email: invitation.email,
    role: invitation.role,
    state,
    invitedBy: invitation.invitedBy,
    expiresAt: invitation.expiresAt.toISOString(),
    createdAt: invitation.createdAt.toISOString(),
  };
}
