import { signInWithPassword } from "@/app/_lib/auth";
import { clientAddressOf } from "@/app/_lib/client-address";
import { resolveSession, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { json, readJson, route } from "@/app/_lib/http";
import {
  clearedSessionSetCookie,
  sessionCookieFromRequest,
  sessionSetCookie,
} from "@/app/_lib/session";
import { findMembership } from "@/db/queries/memberships";
import { bumpSessionVersion } from "@/db/queries/users";
import { listWorkspacesForUser } from "@/db/queries/workspaces";
import { signInBodySchema, switchWorkspaceBodySchema } from "./schema";

function describeSession(userId: string, workspaceId: string, name: string, email: string) {
  const workspaces = listWorkspacesForUser({ userId }).map(({ workspace, role }) => ({
    id: workspace.id,
    slug: workspace.slug,
    name: workspace.name,
    role,
  }));
  return {
    user: { id: userId, name, email },
    workspace: workspaces.find((workspace) => workspace.id === workspaceId) ?? null,
    workspaces,
  };
}

/** Who is signed in, in which workspace and role, and which other workspaces they may switch to. */
export const GET = route(async (request) => {
  const session = await verifyApiSession(request);
  return json(describeSession(session.userId, session.workspaceId, session.name, session.email));
});

/** Sign in with e-mail and password; sets the session cookie. */
export const POST = route(async (request) => {
  const body = await readJson(request, signInBodySchema);
  const payload = await signInWithPassword({
    email: body.email,
    password: body.password,
    clientAddress: clientAddressOf(request),
  });
  const response = json({ ok: true, workspaceId: payload.workspaceId });
  response.headers.append("Set-Cookie", await sessionSetCookie(payload));
  return response;
});

/** Switch the active workspace to another one the user belongs to. */
export const PATCH = route(async (request) => {
  const session = await verifyApiSession(request);
  const body = await readJson(request, switchWorkspaceBodySchema);
  const membership = findMembership({ userId: session.userId, workspaceId: body.workspaceId });
  if (!membership) throw new AppError("not_found", "no such workspace", { field: "workspaceId" });
  const response = json(
    describeSession(session.userId, membership.workspaceId, session.name, session.email),
  );
  response.headers.append(
    "Set-Cookie",
    await sessionSetCookie({
      userId: session.userId,
      workspaceId: membership.workspaceId,
      sessionVersion: session.sessionVersion,
      issuedAt: session.issuedAt,
    }),
  );
  return response;
});

/**
 * Sign out: the session version moves on, so this cookie and every copy of it
 * (other tabs, other devices) stop working at once; the cookie is cleared.
 */
export const DELETE = route(async (request) => {
  const session = await resolveSession(sessionCookieFromRequest(request));
  if (session) bumpSessionVersion({ userId: session.userId });
  const response = new Response(null, { status: 204, headers: { "Cache-Control": "no-store" } });
  response.headers.append("Set-Cookie", clearedSessionSetCookie());
  return response;
});
