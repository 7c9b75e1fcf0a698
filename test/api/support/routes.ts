import type { Capability } from "@/app/_lib/capabilities";
import { replaceFloorPlan } from "@/db/queries/uploads";
import { createInvitation } from "@/db/queries/invitations";
import { createLab } from "@/db/queries/labs";
import { createMembership } from "@/db/queries/memberships";
import { createBench } from "@/db/queries/benches";
import { createScenario } from "@/db/queries/scenarios";
import { createSuite } from "@/db/queries/suites";
import { createUser } from "@/db/queries/users";
import { benchDocument, floorPlanSvg, labFixture, scenarioDocument, type World } from "./world";

/**
 * Every JSON route of the app with the capability that guards it. The API
 * tests derive their role-by-route matrix from this list and the capability
 * table, and fail when a route.ts exports a method that is missing here.
 *
 * `reach`: "any" when holding the capability at all is enough for the case
 * (lists, creating one's own), "workspace" when the case touches someone
 * else's resource, so "own" scope must be refused, "owner" when the case acts
 * on the world's apprentice's own resource (a lab assignment) that only its
 * owner may act on: allowed for the apprentice alone, when the role holds the
 * capability, and refused to everyone else whatever their scope.
 */
export interface GuardedRoute {
  readonly method: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  /** Route pattern as in app/api, e.g. "/api/benches/[benchId]". */
  readonly route: string;
  readonly load: () => Promise<Record<string, unknown>>;
  readonly capability: Capability;
  readonly reach: "any" | "workspace" | "owner";
  /**
   * The route answers 404, not 403, when an "own"-scope member asks for someone
   * else's resource, so it does not reveal that the id exists (runs seen
   * through the run policy).
   */
  readonly hidesFromOwnScope?: boolean;
  /** A server-sent event stream: only the status is checked, then the stream is cancelled. */
  readonly stream?: boolean;
  /** Fresh params (and resources) for one call. */
  readonly params?: (world: World) => Record<string, string>;
  /** A valid body for one call. */
  readonly body?: (world: World) => unknown;
  /** A non-JSON body (an uploaded file) with its content type, instead of `body`. */
  readonly rawBody?: () => { readonly contentType: string; readonly text: string };
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

/**
 * Routes whose answer depends on who owns the row as well as on the role (a live
 * session: its owner or an admin controls it), with their own role-by-owner
 * matrix in the file named.
 */
export const ownerDecidedRoutes: readonly { method: string; route: string; testedIn: string }[] = [
  ["GET", "/api/live-sessions/[sessionId]"],
  ["DELETE", "/api/live-sessions/[sessionId]"],
  ["GET", "/api/live-sessions/[sessionId]/events"],
  ["POST", "/api/live-sessions/[sessionId]/commands"],
  ["POST", "/api/live-sessions/[sessionId]/endpoint"],
  ["DELETE", "/api/live-sessions/[sessionId]/endpoint"],
  ["DELETE", "/api/live-sessions/[sessionId]/endpoint/clients/[channelId]"],
].map(([method, route]) => ({
  method: method!,
  route: route!,
  testedIn: "test/api/live-sessions.test.ts",
}));

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

/** A throwaway shared bench in A with a floor plan. */
function freshPlannedBench(world: World) {
  const benchId = freshBench(world);
  replaceFloorPlan({
    workspaceId: world.a.workspaceId,
    benchId,
    uploadedBy: world.users.admin.userId,
    contentType: "image/svg+xml",
    content: Buffer.from(floorPlanSvg, "utf8"),
  });
  return benchId;
}

/** A fresh lab in A, assigned to no one yet. */
function freshLab(world: World) {
  return createLab({
    values: {
      workspaceId: world.a.workspaceId,
      title: unique("lab"),
      benchId: world.a.benchId,
      gradingScenarioId: world.a.scenarioId,
      createdBy: world.users.trainer.userId,
    },
  }).id;
}

/** A fresh lab in A assigned to A's apprentice, opened or not. */
function freshAssignment(world: World, opened: boolean) {
  return labFixture({
    workspaceId: world.a.workspaceId,
    benchId: world.a.benchId,
    scenarioId: world.a.scenarioId,
    trainerId: world.users.trainer.userId,
    apprenticeId: world.users.apprentice.userId,
    opened,
  });
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
  {
    method: "GET",
    route: "/api/benches/[benchId]/export",
    load: () => import("@/app/api/benches/[benchId]/export/route"),
    capability: "benches.read",
    reach: "any",
    params: (w) => ({ benchId: w.a.benchId }),
  },
  {
    method: "POST",
    route: "/api/benches/[benchId]/import",
    load: () => import("@/app/api/benches/[benchId]/import/route"),
    capability: "benches.edit",
    reach: "workspace",
    params: (w) => ({ benchId: freshBench(w) }),
    body: () => ({
      kind: "bench",
      fileName: "imported.bench.json",
      document: benchDocument("Imported"),
    }),
  },
  {
    // Importing a scenario file onto a bench is writing a scenario, not the bench.
    method: "POST",
    route: "/api/benches/[benchId]/import",
    load: () => import("@/app/api/benches/[benchId]/import/route"),
    capability: "scenarios.edit",
    reach: "workspace",
    params: (w) => ({ benchId: w.a.benchId }),
    body: () => ({
      kind: "scenario",
      fileName: "imported.scenario.json",
      document: scenarioDocument(unique("imported")),
    }),
  },
  {
    method: "GET",
    route: "/api/benches/[benchId]/floor-plan",
    load: () => import("@/app/api/benches/[benchId]/floor-plan/route"),
    capability: "benches.read",
    reach: "any",
    params: (w) => ({ benchId: w.a.floorPlanBenchId }),
  },
  {
    method: "PUT",
    route: "/api/benches/[benchId]/floor-plan",
    load: () => import("@/app/api/benches/[benchId]/floor-plan/route"),
    capability: "benches.edit",
    reach: "workspace",
    params: (w) => ({ benchId: freshBench(w) }),
    rawBody: () => ({ contentType: "image/svg+xml", text: floorPlanSvg }),
  },
  {
    method: "DELETE",
    route: "/api/benches/[benchId]/floor-plan",
    load: () => import("@/app/api/benches/[benchId]/floor-plan/route"),
    capability: "benches.edit",
    reach: "workspace",
    params: (w) => ({ benchId: freshPlannedBench(w) }),
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
    hidesFromOwnScope: true,
    params: (w) => ({ runId: w.a.runId }),
  },
  {
    method: "GET",
    route: "/api/runs/[runId]/events",
    load: () => import("@/app/api/runs/[runId]/events/route"),
    capability: "runs.read",
    reach: "workspace",
    hidesFromOwnScope: true,
    stream: true,
    params: (w) => ({ runId: w.a.runId }),
  },
  {
    method: "POST",
    route: "/api/runs/[runId]/share",
    load: () => import("@/app/api/runs/[runId]/share/route"),
    capability: "runs.read",
    reach: "workspace",
    hidesFromOwnScope: true,
    params: (w) => ({ runId: w.a.runId }),
    body: (w) => ({ to: w.users.engineer.email, note: "Have a look" }),
  },
  // live sessions: starting and listing follow the table; the per-session routes decide by
  // ownership too (owner or admin), so their matrix is in test/api/live-sessions.test.ts
  {
    method: "GET",
    route: "/api/live-sessions",
    load: () => import("@/app/api/live-sessions/route"),
    capability: "console.use",
    reach: "any",
  },
  {
    // A shared bench: "own" scope (apprentices) may run only their own copies.
    method: "POST",
    route: "/api/live-sessions",
    load: () => import("@/app/api/live-sessions/route"),
    capability: "console.use",
    reach: "workspace",
    body: (w) => ({ benchId: w.a.benchId }),
  },
  // labs
  {
    method: "GET",
    route: "/api/labs",
    load: () => import("@/app/api/labs/route"),
    capability: "labs.read",
    reach: "any",
  },
  {
    method: "POST",
    route: "/api/labs",
    load: () => import("@/app/api/labs/route"),
    capability: "labs.manage",
    reach: "any",
    body: (w) => ({
      title: unique("lab"),
      benchId: w.a.benchId,
      gradingScenarioId: w.a.scenarioId,
    }),
  },
  {
    method: "POST",
    route: "/api/labs/[labId]/assignments",
    load: () => import("@/app/api/labs/[labId]/assignments/route"),
    capability: "labs.manage",
    reach: "any",
    params: (w) => ({ labId: freshLab(w) }),
    body: (w) => ({ apprenticeIds: [w.users.apprentice.userId], dueAt: "2031-06-30" }),
  },
  {
    method: "POST",
    route: "/api/labs/assignments/[assignmentId]/open",
    load: () => import("@/app/api/labs/assignments/[assignmentId]/open/route"),
    capability: "labs.read",
    reach: "owner",
    params: (w) => ({ assignmentId: freshAssignment(w, false).assignmentId }),
  },
  {
    method: "POST",
    route: "/api/labs/assignments/[assignmentId]/submit",
    load: () => import("@/app/api/labs/assignments/[assignmentId]/submit/route"),
    capability: "labs.read",
    reach: "owner",
    params: (w) => ({ assignmentId: freshAssignment(w, true).assignmentId }),
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
