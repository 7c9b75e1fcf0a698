import type { Capability } from "@/app/_lib/capabilities";
import { createInvitation } from "@/db/queries/invitations";
import { createMembership } from "@/db/queries/memberships";
import { createBench } from "@/db/queries/benches";
import { createScenario } from "@/db/queries/scenarios";
import { createSuite } from "@/db/queries/suites";
import { createUser } from "@/db/queries/users";
import { benchDocument, scenarioDocument, type World } from "./world";

/**
 * Every JSON route of the app with the capability that guards it. The API
 * tests derive their role-by-route matrix from this list and the capability
 * table, and fail when a route.ts exports a method that is missing here.
 *
 * `reach`: "any" when holding the capability at all is enough for the case
 * (lists, creating one's own), "workspace" when the case touches someone
 * else's resource, so "own" scope must be refused.
 */
export interface GuardedRoute {
  readonly method: "GET" | "POST" | "PATCH" | "DELETE";
  /** Route pattern as in app/api, e.g. "/api/benches/[benchId]". */
  readonly route: string;
  readonly load: () => Promise<Record<string, unknown>>;
  readonly capability: Capability;
  readonly reach: "any" | "workspace";
  /** Fresh params (and resources) for one call. */
  readonly params?: (world: World) => Record<string, string>;
  /** A valid body for one call. */
  readonly body?: (world: World) => unknown;
}

/** Routes open without a session (sign-in, invitation links, password reset, health). */
export const publicRoutes: readonly { method: string; route: string }[] = [
  { method: "POST", route: "/api/session" },
  { method: "DELETE", route: "/api/session" },
  { method: "GET", route: "/api/invitations/accept" },
  { method: "POST", route: "/api/invitations/accept" },
  { method: "POST", route: "/api/session/password-reset" },
  { method: "POST", route: "/api/session/password-reset/complete" },
  { method: "GET", route: "/api/health" },
];

/** Routes that need only a session, no capability (who am I, switching workspace). */
export const sessionOnlyRoutes: readonly { method: string; route: string }[] = [
  { method: "GET", route: "/api/session" },
  { method: "PATCH", route: "/api/session" },
];

let counter = 0;
const unique = (prefix: string) => `${prefix}-${++counter}`;

/** A throwaway shared bench in A, made by the admin. */
function freshBench(world: World) {
  return createBench({
    values: {
      workspaceId: world.a.workspaceId,
      name: unique("bench"),
      createdBy: world.users.admin.userId,
    },
    document: JSON.stringify(benchDocument()),
  }).bench.id;
}

function freshScenario(world: World) {
  return createScenario({
    values: {
      workspaceId: world.a.workspaceId,
      benchId: world.a.benchId,
      name: unique("scenario"),
      document: JSON.stringify(scenarioDocument()),
      createdBy: world.users.admin.userId,
    },
  }).id;
}

function freshSuite(world: World) {
  return createSuite({
    values: {
      workspaceId: world.a.workspaceId,
      name: unique("suite"),
      createdBy: world.users.admin.userId,
    },
    scenarioIds: [world.a.scenarioId],
  }).id;
}

function freshMember(world: World) {
  const user = createUser({
    values: { email: `${unique("member")}@a.example`, name: "Temp member", passwordHash: "x" },
  });
  return createMembership({
    values: { userId: user.id, workspaceId: world.a.workspaceId, role: "engineer" },
  }).id;
}

function freshApprenticeInvitation(world: World) {
  return createInvitation({
    values: {
      workspaceId: world.a.workspaceId,
      email: `${unique("invitee")}@a.example`,
      role: "apprentice",
      tokenHash: unique("hash"),
      invitedBy: world.users.admin.userId,
      expiresAt: new Date(Date.now() + 86_400_000),
    },
  }).id;
}

export const guardedRoutes: readonly GuardedRoute[] = [
  // benches
  {
    method: "GET",
    route: "/api/benches",
    load: () => import("@/app/api/benches/route"),
    capability: "benches.read",
    reach: "any",
  },
  {
    method: "POST",
    route: "/api/benches",
    load: () => import("@/app/api/benches/route"),
    capability: "benches.edit",
    reach: "any",
    body: () => ({ document: benchDocument(unique("new")) }),
  },
  {
    method: "GET",
    route: "/api/benches/[benchId]",
    load: () => import("@/app/api/benches/[benchId]/route"),
    capability: "benches.read",
    reach: "any",
    params: (w) => ({ benchId: w.a.benchId }),
  },
  {
    method: "PATCH",
    route: "/api/benches/[benchId]",
    load: () => import("@/app/api/benches/[benchId]/route"),
    capability: "benches.edit",
    reach: "workspace",
    params: (w) => ({ benchId: freshBench(w) }),
    body: () => ({ document: benchDocument("Edited"), summary: "edit" }),
  },
  {
    method: "DELETE",
    route: "/api/benches/[benchId]",
    load: () => import("@/app/api/benches/[benchId]/route"),
    capability: "benches.edit",
    reach: "workspace",
    params: (w) => ({ benchId: freshBench(w) }),
  },
  {
    method: "GET",
    route: "/api/benches/[benchId]/revisions",
    load: () => import("@/app/api/benches/[benchId]/revisions/route"),
    capability: "benches.read",
    reach: "any",
    params: (w) => ({ benchId: w.a.benchId }),
  },
  {
    method: "GET",
    route: "/api/benches/[benchId]/revisions/[number]",
    load: () => import("@/app/api/benches/[benchId]/revisions/[number]/route"),
    capability: "benches.read",
    reach: "any",
    params: (w) => ({ benchId: w.a.benchId, number: "1" }),
  },
  {
    method: "POST",
    route: "/api/benches/[benchId]/duplicate",
    load: () => import("@/app/api/benches/[benchId]/duplicate/route"),
    capability: "benches.edit",
    reach: "any",
    params: (w) => ({ benchId: w.a.benchId }),
    body: () => ({}),
  },
  // scenarios
  {
    method: "GET",
    route: "/api/scenarios",
    load: () => import("@/app/api/scenarios/route"),
    capability: "scenarios.read",
    reach: "any",
  },
  {
    method: "POST",
    route: "/api/scenarios",
    load: () => import("@/app/api/scenarios/route"),
    capability: "scenarios.edit",
    reach: "workspace",
    body: (w) => ({ benchId: w.a.benchId, document: scenarioDocument(unique("new")) }),
  },
  {
    method: "GET",
    route: "/api/scenarios/[scenarioId]",
    load: () => import("@/app/api/scenarios/[scenarioId]/route"),
    capability: "scenarios.read",
    reach: "any",
    params: (w) => ({ scenarioId: w.a.scenarioId }),
  },
  {
    method: "PATCH",
    route: "/api/scenarios/[scenarioId]",
    load: () => import("@/app/api/scenarios/[scenarioId]/route"),
    capability: "scenarios.edit",
    reach: "workspace",
    params: (w) => ({ scenarioId: freshScenario(w) }),
    body: () => ({ name: "Renamed" }),
  },
  {
    method: "DELETE",
    route: "/api/scenarios/[scenarioId]",
    load: () => import("@/app/api/scenarios/[scenarioId]/route"),
    capability: "scenarios.edit",
    reach: "workspace",
    params: (w) => ({ scenarioId: freshScenario(w) }),
  },
  // suites
  {
    method: "GET",
    route: "/api/suites",
    load: () => import("@/app/api/suites/route"),
    capability: "scenarios.read",
    reach: "any",
  },
  {
    method: "POST",
    route: "/api/suites",
    load: () => import("@/app/api/suites/route"),
    capability: "suites.edit",
    reach: "any",
    body: (w) => ({ name: unique("suite"), scenarioIds: [w.a.scenarioId] }),
  },
  {
    method: "GET",
    route: "/api/suites/[suiteId]",
    load: () => import("@/app/api/suites/[suiteId]/route"),
    capability: "scenarios.read",
    reach: "any",
    params: (w) => ({ suiteId: w.a.suiteId }),
  },
  {
    method: "PATCH",
    route: "/api/suites/[suiteId]",
    load: () => import("@/app/api/suites/[suiteId]/route"),
    capability: "suites.edit",
    reach: "any",
    params: (w) => ({ suiteId: freshSuite(w) }),
    body: () => ({ name: "Renamed" }),
  },
  {
    method: "DELETE",
    route: "/api/suites/[suiteId]",
    load: () => import("@/app/api/suites/[suiteId]/route"),
    capability: "suites.edit",
    reach: "any",
    params: (w) => ({ suiteId: freshSuite(w) }),
  },
  // runs
  {
    method: "GET",
    route: "/api/runs",
    load: () => import("@/app/api/runs/route"),
    capability: "runs.read",
    reach: "any",
  },
  {
    method: "POST",
    route: "/api/runs",
    load: () => import("@/app/api/runs/route"),
    capability: "runs.start",
    reach: "workspace",
    body: (w) => ({ scenarioId: w.a.scenarioId, seed: 7 }),
  },
  {
    method: "GET",
    route: "/api/runs/[runId]",
    load: () => import("@/app/api/runs/[runId]/route"),
    capability: "runs.read",
    reach: "workspace",
    params: (w) => ({ runId: w.a.runId }),
  },
  // members
  {
    method: "GET",
    route: "/api/members",
    load: () => import("@/app/api/members/route"),
    capability: "members.read",
    reach: "any",
  },
  {
    method: "PATCH",
    route: "/api/members/[membershipId]",
    load: () => import("@/app/api/members/[membershipId]/route"),
    capability: "members.manage",
    reach: "any",
    params: (w) => ({ membershipId: freshMember(w) }),
    body: () => ({ role: "qa" }),
  },
  {
    method: "DELETE",
    route: "/api/members/[membershipId]",
    load: () => import("@/app/api/members/[membershipId]/route"),
    capability: "members.manage",
    reach: "any",
    params: (w) => ({ membershipId: freshMember(w) }),
  },
  // invitations
  {
    method: "GET",
    route: "/api/invitations",
    load: () => import("@/app/api/invitations/route"),
    capability: "invitations.send",
    reach: "any",
  },
  {
    method: "POST",
    route: "/api/invitations",
    load: () => import("@/app/api/invitations/route"),
    capability: "invitations.send",
    reach: "any",
    body: () => ({ email: `${unique("new")}@a.example`, role: "apprentice" }),
  },
  {
    method: "DELETE",
    route: "/api/invitations/[invitationId]",
    load: () => import("@/app/api/invitations/[invitationId]/route"),
    capability: "invitations.send",
    reach: "any",
    params: (w) => ({ invitationId: freshApprenticeInvitation(w) }),
  },
  {
    method: "POST",
    route: "/api/invitations/[invitationId]/resend",
    load: () => import("@/app/api/invitations/[invitationId]/resend/route"),
    capability: "invitations.send",
    reach: "any",
    params: (w) => ({ invitationId: freshApprenticeInvitation(w) }),
  },
];

/** "/api/benches/[benchId]" with params -> "/api/benches/abc". */
export function pathOf(route: string, params: Record<string, string> = {}): string {
  return route.replace(/\[(\w+)\]/g, (_match, name: string) =>
    encodeURIComponent(params[name] ?? name),
  );
}
