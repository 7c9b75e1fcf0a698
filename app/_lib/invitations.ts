import { createHash, randomBytes } from "node:crypto";
import { type Db, getDb } from "@/db/client";
import {
  createInvitation,
  findInvitation,
  findInvitationByTokenHash,
  findOpenInvitationForEmail,
  markInvitationAccepted,
  renewInvitation,
  revokeInvitation,
  type Invitation,
} from "@/db/queries/invitations";
import { createMembership, findMembership } from "@/db/queries/memberships";
import {
  consumePasswordReset,
  createPasswordReset,
  endOutstandingPasswordResets,
} from "@/db/queries/password-resets";
import { createUser, findUserByEmail, findUserById, setPasswordHash } from "@/db/queries/users";
import { findWorkspaceById } from "@/db/queries/workspaces";
import type { Role } from "@/db/schema";
import { invitableRoles } from "./capabilities";
import { appUrl } from "./config";
import type { VerifiedSession } from "./dal";
import { AppError } from "./errors";
import { deliverPendingMail, queueMail } from "./mailer";
import { hashPassword, verifyPassword } from "./auth";
import { formatDateTime } from "@/components/ui/format-date";

/**
 * Invitations and password resets: one-time tokens sent by e-mail. Only the
 * SHA-256 of a token is stored, so a database copy cannot be turned into links.
 */

/** A transaction runs every query a connection does; the query functions take a Db. */
const asDb = (tx: unknown) => tx as Db;

/** An invitation link works for 7 days. */
export const invitationLifetimeMs = 7 * 24 * 60 * 60 * 1000;
/** A password-reset link works for 1 hour. */
export const passwordResetLifetimeMs = 60 * 60 * 1000;

export function newToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, tokenHash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

export function invitationLink(token: string): string {
  return `${appUrl()}/join/${token}`;
}

export function passwordResetLink(token: string): string {
  return `${appUrl()}/reset-password/${token}`;
}

function invitationMail(options: {
  to: string;
  workspaceName: string;
  inviterName: string;
  role: Role;
  link: string;
  expiresAt: Date;
}) {
  const article = /^[aeiou]/.test(options.role) ? "an" : "a";
  return {
    subject: `Join ${options.workspaceName} on Benchline`,
    text: [
      `${options.inviterName} invited you to join ${options.workspaceName} on Benchline as ${article} ${options.role}.`,
      "",
      "Set your password and join here:",
      options.link,
      "",
      `The link works once and expires on ${formatDateTime(options.expiresAt)}.`,
      "If you did not expect this invitation, ignore this message.",
    ].join("\n"),
  };
}

/** Throw 403 unless the session's role may invite someone into `role`. */
export function checkInvitableRole(session: Pick<VerifiedSession, "role">, role: Role): void {
  if (!invitableRoles(session.role).includes(role)) {
    throw new AppError("forbidden", `your role (${session.role}) may not invite a ${role}`, {
      field: "role",
    });
  }
}

/** Invite an e-mail address into the session's workspace; the mail is queued in the same transaction. */
export async function inviteMember(
  session: VerifiedSession,
  input: { email: string; role: Role },
  now = new Date(),
): Promise<Invitation> {
  checkInvitableRole(session, input.role);
  const workspace = findWorkspaceById({ workspaceId: session.workspaceId });
  if (!workspace) throw new AppError("not_found", "no such workspace");
  const existingUser = findUserByEmail({ email: input.email });
  if (existingUser && findMembership({ userId: existingUser.id, workspaceId: workspace.id })) {
    throw new AppError("conflict", `${input.email} is already a member`, { field: "email" });
  }
  if (findOpenInvitationForEmail({ workspaceId: workspace.id, email: input.email, now })) {
    throw new AppError("conflict", `${input.email} already has an open invitation; resend it`, {
      field: "email",
    });
  }
  const { token, tokenHash } = newToken();
  const expiresAt = new Date(now.getTime() + invitationLifetimeMs);
  const link = invitationLink(token);
  const invitation = getDb().transaction((tx) => {
    const created = createInvitation({
      db: asDb(tx),
      values: {
        workspaceId: workspace.id,
        email: input.email,
        role: input.role,
        tokenHash,
        invitedBy: session.userId,
        expiresAt,
      },
    });
    queueMail(
      {
        audience: "workspace",
        workspaceId: workspace.id,
        to: input.email,
        purpose: "invitation",
        ...invitationMail({
          to: input.email,
          workspaceName: workspace.name,
          inviterName: session.name,
          role: input.role,
          link,
          expiresAt,
        }),
      },
      asDb(tx),
    );
    return created;
  });
  await deliverPendingMail();
  return invitation;
}

/** An invitation of the workspace the session may manage (trainers: apprentice ones only). */
export function loadManagedInvitation(session: VerifiedSession, invitationId: string): Invitation {
  const invitation = findInvitation({ workspaceId: session.workspaceId, invitationId });
  if (!invitation) throw new AppError("not_found", "no such invitation");
  checkInvitableRole(session, invitation.role);
  return invitation;
}

/** New token, new 7-day expiry, new mail; the previous link stops working. */
export async function resendInvitation(
  session: VerifiedSession,
  invitationId: string,
  now = new Date(),
): Promise<Invitation> {
  const invitation = loadManagedInvitation(session, invitationId);
  if (invitation.acceptedAt) throw new AppError("conflict", "the invitation was already accepted");
  if (invitation.revokedAt) throw new AppError("conflict", "the invitation was revoked");
  const workspace = findWorkspaceById({ workspaceId: session.workspaceId });
  if (!workspace) throw new AppError("not_found", "no such workspace");
  const { token, tokenHash } = newToken();
  const expiresAt = new Date(now.getTime() + invitationLifetimeMs);
  const renewed = getDb().transaction((tx) => {
    const updated = renewInvitation({
      db: asDb(tx),
      invitationId: invitation.id,
      tokenHash,
      expiresAt,
    });
    queueMail(
      {
        audience: "workspace",
        workspaceId: workspace.id,
        to: invitation.email,
        purpose: "invitation",
        ...invitationMail({
          to: invitation.email,
          workspaceName: workspace.name,
          inviterName: session.name,
          role: invitation.role,
          link: invitationLink(token),
          expiresAt,
        }),
      },
      asDb(tx),
    );
    return updated;
  });
  await deliverPendingMail();
  if (!renewed) throw new AppError("not_found", "no such invitation");
  return renewed;
}

export function revokeManagedInvitation(
  session: VerifiedSession,
  invitationId: string,
): Invitation {
  const invitation = loadManagedInvitation(session, invitationId);
  if (invitation.acceptedAt) throw new AppError("conflict", "the invitation was already accepted");
  const revoked = revokeInvitation({ invitationId: invitation.id });
  if (!revoked) throw new AppError("not_found", "no such invitation");
  return revoked;
}

/** What the invitation page shows before accepting; any unusable token is "not found". */
export function describeInvitation(token: string, now = new Date()) {
  const found = findInvitationByTokenHash({ tokenHash: hashToken(token) });
  if (
    !found ||
    found.invitation.acceptedAt !== null ||
    found.invitation.revokedAt !== null ||
    found.invitation.expiresAt <= now
  ) {
    throw new AppError("not_found", "this invitation link is not valid any more", {
      field: "token",
    });
  }
  return {
    email: found.invitation.email,
    role: found.invitation.role,
    workspaceName: found.workspace.name,
    accountExists: findUserByEmail({ email: found.invitation.email }) !== undefined,
    expiresAt: found.invitation.expiresAt,
  };
}

/**
 * Accept an invitation: a new account gets the name and password given; an
 * existing account proves itself with its current password and keeps it.
 * The token works once.
 */
export async function acceptInvitation(
  input: { token: string; name?: string | undefined; password: string },
  now = new Date(),
): Promise<{ email: string; workspaceId: string }> {
  const found = findInvitationByTokenHash({ tokenHash: hashToken(input.token) });
  describeInvitation(input.token, now);
  if (!found) throw new AppError("not_found", "this invitation link is not valid any more");
  const { invitation } = found;
  const existing = findUserByEmail({ email: invitation.email });
  let passwordHash: string | null = null;
  if (existing) {
    if (!(await verifyPassword(input.password, existing.passwordHash))) {
      throw new AppError("invalid_input", "password: that is not the password of this account", {
        field: "password",
      });
    }
  } else {
    if (!input.name) throw new AppError("invalid_input", "name: give your name", { field: "name" });
    passwordHash = await hashPassword(input.password);
  }
  getDb().transaction((tx) => {
    const accepted = markInvitationAccepted({ db: asDb(tx), invitationId: invitation.id, now });
    if (!accepted) throw new AppError("not_found", "this invitation link is not valid any more");
    const user =
      existing ??
      createUser({
        db: asDb(tx),
        values: { email: invitation.email, name: input.name!, passwordHash: passwordHash! },
      });
    if (!findMembership({ db: asDb(tx), userId: user.id, workspaceId: invitation.workspaceId })) {
      createMembership({
        db: asDb(tx),
        values: { userId: user.id, workspaceId: invitation.workspaceId, role: invitation.role },
      });
    }
  });
  return { email: invitation.email, workspaceId: invitation.workspaceId };
}

/**
 * Start a password reset. Answers the same whether or not the account exists;
 * only an active account gets a mail.
 */
export async function requestPasswordReset(email: string, now = new Date()): Promise<void> {
  const user = findUserByEmail({ email });
  if (!user || user.disabledAt !== null) return;
  // Account mail: filed under no workspace, so no workspace's admin can read
  // the link; without SMTP it goes to the server log (app/_lib/mailer.ts).
  const { token, tokenHash } = newToken();
  const expiresAt = new Date(now.getTime() + passwordResetLifetimeMs);
  const link = passwordResetLink(token);
  getDb().transaction((tx) => {
    createPasswordReset({ db: asDb(tx), userId: user.id, tokenHash, expiresAt });
    queueMail(
      {
        audience: "account",
        to: user.email,
        purpose: "password-reset",
        subject: "Reset your Benchline password",
        text: [
          `Someone asked to reset the password of ${user.email} on Benchline.`,
          "",
          "Choose a new password here:",
          link,
          "",
          "The link works once and expires in one hour. If it was not you, ignore this message: your password stays as it is.",
        ].join("\n"),
      },
      asDb(tx),
    );
  });
  // Delivered after the answer, not awaited: waiting for the mail server only
  // when the account exists would let the response time tell who has one.
  // A failed delivery stays in the outbox and is retried with the next mail.
  void deliverPendingMail().catch(() => undefined);
}

/** Finish a password reset: sets the password, ends every session and every other reset link of the account. */
export async function completePasswordReset(
  input: { token: string; password: string },
  now = new Date(),
): Promise<void> {
  const passwordHash = await hashPassword(input.password);
  getDb().transaction((tx) => {
    const reset = consumePasswordReset({ db: asDb(tx), tokenHash: hashToken(input.token), now });
    if (!reset) {
      throw new AppError("not_found", "this reset link is not valid any more; ask for a new one", {
        field: "token",
      });
    }
    const user = findUserById({ db: asDb(tx), userId: reset.userId });
    if (!user) throw new AppError("not_found", "the account no longer exists");
    // Using one link ends every other open link of the account.
    endOutstandingPasswordResets({ db: asDb(tx), userId: user.id, now });
    setPasswordHash({ db: asDb(tx), userId: user.id, passwordHash });
  });
}
