import { notFound, redirect } from "next/navigation";
import { cache } from "react";
import { findMembership } from "@/db/queries/memberships";
import { findUserById } from "@/db/queries/users";
import type { Role } from "@/db/schema";
import { type Capability, type CapabilityScope, scopeOf } from "./capabilities";
import { AppError } from "./errors";
import { readSessionCookie, sessionCookieFromRequest, unsealSession } from "./session";

/**
 * The data access layer's one answer to "who is asking": checked against the
 * database on every request, never taken from the cookie alone.
 */
export interface VerifiedSession {
  readonly userId: string;
  readonly workspaceId: string;
  /** The role of the membership in the active workspace, read from the database. */
  readonly role: Role;
  readonly name: string;
  readonly email: string;
  readonly sessionVersion: number;
  /** When the user signed in, milliseconds since the epoch. */
  readonly issuedAt: number;
}

/**
 * Turn a raw cookie value into a verified session, or null. Refused when the
 * seal is bad or expired, the user is gone or disabled, the session version
 * moved on (password change, sign-out, removal), or the membership of the
 * active workspace no longer exists.
 */
export async function resolveSession(
  cookieValue: string | undefined,
): Promise<VerifiedSession | null> {
  const payload = await unsealSession(cookieValue);
  if (!payload) return null;
  const user = findUserById({ userId: payload.userId });
  if (!user || user.disabledAt !== null) return null;
  if (user.sessionVersion !== payload.sessionVersion) return null;
  const membership = findMembership({ userId: user.id, workspaceId: payload.workspaceId });
  if (!membership) return null;
  return {
    userId: user.id,
    workspaceId: membership.workspaceId,
    role: membership.role,
    name: user.name,
    email: user.email,
    sessionVersion: user.sessionVersion,
    issuedAt: payload.issuedAt,
  };
}

// ---------------------------------------------------------------- server components and actions

/**
 * The session of the current request, or null when signed out. Cached per
 * request (React cache), so a layout and its page share one database check.
 */
export const getSession = cache(async (): Promise<VerifiedSession | null> => {
  return resolveSession(await readSessionCookie());
});

/** The session of the current request; signed-out visitors are sent to /sign-in. */
export const verifySession = cache(async (): Promise<VerifiedSession> => {
  const session = await getSession();
  if (!session) redirect("/sign-in");
  return session;
});

/**
 * For pages: the session when the role holds the capability. A page the role
 * may not open answers 404, as if it did not exist (the navigation never links
 * to it). Pass `scope: "workspace"` when "own" scope is not enough.
 */
export async function requireCapability(
  capability: Capability,
  options: { scope?: "any" | "workspace" } = {},
): Promise<VerifiedSession & { scope: CapabilityScope }> {
  const session = await verifySession();
  const scope = scopeOf(session.role, capability);
  if (scope === "none" || (options.scope === "workspace" && scope !== "workspace")) notFound();
  return { ...session, scope };
}

// ---------------------------------------------------------------- route handlers

/** The session of a route handler's request; 401 when there is none. */
export async function verifyApiSession(request: Request): Promise<VerifiedSession> {
  const session = await resolveSession(sessionCookieFromRequest(request));
  if (!session) throw new AppError("unauthenticated", "sign in first");
  return session;
}

/**
 * Throw 403 unless the role holds the capability (with workspace scope when
 * asked); returns the scope so the caller can narrow what it loads.
 */
export function authorize(
  session: Pick<VerifiedSession, "role">,
  capability: Capability,
  options: { scope?: "any" | "workspace" } = {},
): CapabilityScope {
  const scope = scopeOf(session.role, capability);
  if (scope === "none" || (options.scope === "workspace" && scope !== "workspace")) {
    throw new AppError("forbidden", `your role (${session.role}) may not do this: ${capability}`);
  }
  return scope;
}

export { can } from "./capabilities";
