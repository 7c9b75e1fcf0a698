import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { json, readJson, route, type RouteParams } from "@/app/_lib/http";
import { loadMembership } from "@/app/_lib/policy/member";
import { resourceIdSchema } from "@/app/_lib/resources";
import { getDb } from "@/db/client";
import { changeRole, countAdmins, deleteMembership } from "@/db/queries/memberships";
import { bumpSessionVersion } from "@/db/queries/users";
import { changeRoleBodySchema } from "./schema";

type Params = RouteParams<{ membershipId: string }>;

async function membershipIdOf(context: Params) {
  const parsed = resourceIdSchema.safeParse((await context.params).membershipId);
  if (!parsed.success) throw new AppError("not_found", "no such member");
  return parsed.data;
}

/** Change a member's role. The role is read from the database on each request, so it applies at once. */
export const PATCH = route(async (request, context: Params) => {
  const membershipId = await membershipIdOf(context);
  const session = await verifyApiSession(request);
  authorize(session, "members.manage");
  const body = await readJson(request, changeRoleBodySchema);
  const membership = loadMembership(session, membershipId, "edit");
  if (
    membership.role === "admin" &&
    body.role !== "admin" &&
    countAdmins({ workspaceId: session.workspaceId }) <= 1
  ) {
    throw new AppError("conflict", "the workspace needs at least one admin", { field: "role" });
  }
  const updated = changeRole({
    membershipId,
    workspaceId: session.workspaceId,
    role: body.role,
  });
  if (!updated) throw new AppError("not_found", "no such member");
  return json({ member: { membershipId: updated.id, role: updated.role } });
});

/** Remove a member from the workspace; every session of theirs ends at once. */
export const DELETE = route(async (request, context: Params) => {
  const membershipId = await membershipIdOf(context);
  const session = await verifyApiSession(request);
  const membership = loadMembership(session, membershipId, "delete");
  if (membership.role === "admin" && countAdmins({ workspaceId: session.workspaceId }) <= 1) {
    throw new AppError("conflict", "the workspace needs at least one admin");
  }
  getDb().transaction((tx) => {
    const db = tx as unknown as ReturnType<typeof getDb>;
    deleteMembership({ db, membershipId, workspaceId: session.workspaceId });
    bumpSessionVersion({ db, userId: membership.userId });
  });
  return new Response(null, { status: 204, headers: { "Cache-Control": "no-store" } });
});
