import { findMembership, findMembershipById, type Membership } from "@/db/queries/memberships";
import { findUserById, type User } from "@/db/queries/users";
import { can as roleCan } from "../capabilities";
import { AppError } from "../errors";
import {
  type Action,
  type Can,
  ensure,
  type IdSource,
  notFound,
  nothing,
  type Who,
} from "./policy";

/**
 * The member policy. Those who hold "members.read" see the workspace's
 * members; only "members.manage" changes roles or removes someone. A member id
 * or user id from another workspace is "not found".
 */

export function memberCan(who: Who, membership: Membership): Can {
  if (membership.workspaceId !== who.workspaceId || !roleCan(who.role, "members.read")) {
    return nothing;
  }
  const manage = roleCan(who.role, "members.manage");
  return { read: true, edit: manage, run: false, share: false, delete: manage };
}

export function loadMembership(
  who: Who,
  membershipId: string,
  action: Action = "read",
  source: IdSource = {},
): Membership {
  // Without "members.read" the route itself is forbidden, as the capability table says.
  if (
    !roleCan(who.role, "members.read") ||
    (action !== "read" && !roleCan(who.role, "members.manage"))
  ) {
    throw new AppError(
      "forbidden",
      `your role (${who.role}) may not do this: ${action === "read" ? "members.read" : "members.manage"}`,
    );
  }
  const membership = findMembershipById({ membershipId, workspaceId: who.workspaceId });
  if (!membership) throw notFound("member", source);
  ensure(memberCan(who, membership), action, "member", "your role may not manage members", source);
  return membership;
}

/**
 * User ids from a body that must each be an apprentice of the session's
 * workspace (lab assignments): anything else is refused naming its field,
 * without saying whether the id exists elsewhere.
 */
export function resolveApprentices(who: Who, userIds: readonly string[], field: string): User[] {
  return userIds.map((userId, index) => {
    const membership = findMembership({ userId, workspaceId: who.workspaceId });
    const user = membership ? findUserById({ userId }) : undefined;
    if (!membership || !user || membership.role !== "apprentice") {
      throw new AppError(
        "invalid_input",
        `${field}[${index}]: not an apprentice of this workspace`,
        { field: `${field}[${index}]` },
      );
    }
    return user;
  });
}
