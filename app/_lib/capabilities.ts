import type { Role } from "@/db/schema";

/**
 * How far a role's capability reaches inside its workspace:
 * - "workspace": everything in the workspace;
 * - "own": only what the member made or was assigned (an apprentice's sandbox
 *   copies, own scenarios, own attempts and runs);
 * - "apprentices": only people in the apprentice role (a trainer inviting a class);
 * - "none": not at all (403).
 */
export type CapabilityScope = "workspace" | "own" | "apprentices" | "none";

/**
 * The one capability table: product.md's roles table, row by row. Every route
 * handler, server action and the navigation ask this table (through `can` and
 * `scopeOf`), and the resource policies (app/_lib/policy/) build on it to
 * decide per row; nothing else decides who may do what. The API tests generate
 * their role-by-route matrix from it.
 */
export const capabilityTable = {
  // "manage members and roles": admin yes, trainer invites apprentices.
  "members.read": {
    admin: "workspace",
    trainer: "workspace",
    engineer: "none",
    qa: "none",
    apprentice: "none",
  },
  "members.manage": {
    admin: "workspace",
    trainer: "none",
    engineer: "none",
    qa: "none",
    apprentice: "none",
  },
  "invitations.send": {
    admin: "workspace",
    trainer: "apprentices",
    engineer: "none",
    qa: "none",
    apprentice: "none",
  },
  // Mail the app sent on the workspace's behalf: part of managing the workspace.
  "outbox.read": {
    admin: "workspace",
    trainer: "none",
    engineer: "none",
    qa: "none",
    apprentice: "none",
  },
  // Everyone works from the workspace's benches; private copies are filtered separately.
  "benches.read": {
    admin: "workspace",
    trainer: "workspace",
    engineer: "workspace",
    qa: "workspace",
    apprentice: "workspace",
  },
  // "create and edit benches and scenarios": qa scenarios only, apprentice own sandbox copies.
  "benches.edit": {
    admin: "workspace",
    trainer: "workspace",
    engineer: "workspace",
    qa: "none",
    apprentice: "own",
  },
  "scenarios.read": {
    admin: "workspace",
    trainer: "workspace",
    engineer: "workspace",
    qa: "workspace",
    apprentice: "workspace",
  },
  "scenarios.edit": {
    admin: "workspace",
    trainer: "workspace",
    engineer: "workspace",
    qa: "workspace",
    apprentice: "own",
  },
  // A suite groups the workspace's scenarios; apprentices work on single attempts.
  "suites.edit": {
    admin: "workspace",
    trainer: "workspace",
    engineer: "workspace",
    qa: "workspace",
    apprentice: "none",
  },
  // "live console": apprentice on assigned labs and sandboxes.
  "console.use": {
    admin: "workspace",
    trainer: "workspace",
    engineer: "workspace",
    qa: "workspace",
    apprentice: "own",
  },
  // "replay scenarios and suites": apprentice own attempts.
  "runs.start": {
    admin: "workspace",
    trainer: "workspace",
    engineer: "workspace",
    qa: "workspace",
    apprentice: "own",
  },
  // "see runs": workspace, apprentice own.
  "runs.read": {
    admin: "workspace",
    trainer: "workspace",
    engineer: "workspace",
    qa: "workspace",
    apprentice: "own",
  },
  // "assign labs, review attempts" (includes seeing apprentices' private copies).
  "labs.manage": {
    admin: "workspace",
    trainer: "workspace",
    engineer: "none",
    qa: "none",
    apprentice: "none",
  },
  // Opening labs: trainers and admins all of them, apprentices the ones assigned to them.
  "labs.read": {
    admin: "workspace",
    trainer: "workspace",
    engineer: "none",
    qa: "none",
    apprentice: "own",
  },
} as const satisfies Record<string, Record<Role, CapabilityScope>>;

export type Capability = keyof typeof capabilityTable;

export const capabilities = Object.keys(capabilityTable) as Capability[];

/** The reach of a role's capability. */
export function scopeOf(role: Role, capability: Capability): CapabilityScope {
  return capabilityTable[capability][role];
}

/**
 * Whether the role holds the capability at all. Pass `scope: "workspace"` to ask
 * whether it holds it over the whole workspace (e.g. editing someone else's bench).
 */
export function can(
  role: Role,
  capability: Capability,
  options: { scope?: "any" | "workspace" } = {},
): boolean {
  const scope = scopeOf(role, capability);
  if (options.scope === "workspace") return scope === "workspace";
  return scope !== "none";
}

/**
 * Whether a member may act on one resource: workspace-wide scope always, "own"
 * scope only on what `ownerId` says is theirs.
 */
export function canOn(
  session: { readonly role: Role; readonly userId: string },
  capability: Capability,
  ownerId: string | null | undefined,
): boolean {
  const scope = scopeOf(session.role, capability);
  if (scope === "workspace") return true;
  if (scope === "own")
    return ownerId !== null && ownerId !== undefined && ownerId === session.userId;
  return false;
}

/** Roles this role may invite: admin any, trainer apprentices, others none. */
export function invitableRoles(role: Role): readonly Role[] {
  const scope = scopeOf(role, "invitations.send");
  if (scope === "workspace") return ["admin", "trainer", "engineer", "qa", "apprentice"];
  if (scope === "apprentices") return ["apprentice"];
  return [];
}

/** Which capability shows each studio page in the navigation. */
export const navCapabilities: Readonly<Record<string, Capability>> = {
  "/benches": "benches.read",
  "/console": "console.use",
  "/scenarios": "scenarios.read",
  "/runs": "runs.read",
  "/labs": "labs.read",
  "/members": "members.read",
  "/outbox": "outbox.read",
};

/** Filter navigation items to those the role may open; unknown routes stay hidden. */
export function navItemsFor<T extends { readonly href: string }>(
  role: Role,
  items: readonly T[],
): T[] {
  return items.filter((item) => {
    const capability = navCapabilities[item.href];
    return capability !== undefined && can(role, capability);
  });
}
