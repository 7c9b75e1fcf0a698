import { and, desc, eq, gt, isNull } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { invitations, type Role, users, workspaces } from "../schema";

export type Invitation = typeof invitations.$inferSelect;
export type NewInvitation = typeof invitations.$inferInsert;

/** A workspace's invitations, newest first, with who sent them; optionally only some roles. */
export function listInvitations({
  db = getDb(),
  workspaceId,
  roles,
}: {
  db?: Db;
  workspaceId: string;
  roles?: readonly Role[];
}) {
  const rows = db
    .select({ invitation: invitations, invitedByName: users.name })
    .from(invitations)
    .innerJoin(users, eq(invitations.invitedBy, users.id))
    .where(eq(invitations.workspaceId, workspaceId))
    .orderBy(desc(invitations.createdAt))
    .all();
  return roles ? rows.filter((row) => roles.includes(row.invitation.role)) : rows;
}

export function findInvitation({
  db = getDb(),
  workspaceId,
  invitationId,
}: {
  db?: Db;
  workspaceId: string;
  invitationId: string;
}) {
  return db
    .select()
    .from(invitations)
    .where(and(eq(invitations.id, invitationId), eq(invitations.workspaceId, workspaceId)))
    .get();
}

/** An open invitation (not accepted, revoked or expired) for an e-mail in a workspace. */
export function findOpenInvitationForEmail({
  db = getDb(),
  workspaceId,
  email,
  now = new Date(),
}: {
  db?: Db;
  workspaceId: string;
  email: string;
  now?: Date;
}) {
  return db
    .select()
    .from(invitations)
    .where(
      and(
        eq(invitations.workspaceId, workspaceId),
        eq(invitations.email, email),
        isNull(invitations.acceptedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, now),
      ),
    )
    .get();
}

/** The invitation a token (by its hash) stands for, with its workspace. */
export function findInvitationByTokenHash({
  db = getDb(),
  tokenHash,
}: {
  db?: Db;
  tokenHash: string;
}) {
  return db
    .select({ invitation: invitations, workspace: workspaces })
    .from(invitations)
    .innerJoin(workspaces, eq(invitations.workspaceId, workspaces.id))
    .where(eq(invitations.tokenHash, tokenHash))
    .get();
}

export function createInvitation({ db = getDb(), values }: { db?: Db; values: NewInvitation }) {
  return db.insert(invitations).values(values).returning().get();
}

/** Give an invitation a new token and expiry (resend): the old link stops working. */
export function renewInvitation({
  db = getDb(),
  invitationId,
  tokenHash,
  expiresAt,
}: {
  db?: Db;
  invitationId: string;
  tokenHash: string;
  expiresAt: Date;
}) {
  return db
    .update(invitations)
    .set({ tokenHash, expiresAt })
    .where(eq(invitations.id, invitationId))
    .returning()
    .get();
}

export function revokeInvitation({
  db = getDb(),
  invitationId,
}: {
  db?: Db;
  invitationId: string;
}) {
  return db
    .update(invitations)
    .set({ revokedAt: new Date() })
    .where(eq(invitations.id, invitationId))
    .returning()
    .get();
}

/** Mark accepted, only if still open; returns undefined when someone else got there first. */
export function markInvitationAccepted({
  db = getDb(),
  invitationId,
  now = new Date(),
}: {
  db?: Db;
  invitationId: string;
  now?: Date;
}) {
  return db
    .update(invitations)
    .set({ acceptedAt: now })
    .where(
      and(
        eq(invitations.id, invitationId),
        isNull(invitations.acceptedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, now),
      ),
    )
    .returning()
    .get();
}
