import { createScenario } from "@/db/queries/scenarios";
import { createSuite } from "@/db/queries/suites";
import { createUser } from "@/db/queries/users";
import { createMembership } from "@/db/queries/memberships";
import type { Role } from "@/db/schema";
import { scenarioDocument, type World } from "./world";

/**
 * Every id a request body (or query) names, with a body that names it. The
 * capability test sends each one as a member of workspace A with an id from
 * workspace B ("foreign") and, where one exists, with an id of another member's
 * private row in A that the member may not use ("private"): each must be
 * refused with 404 or 400 naming the field, reveal no name, and change nothing.
 * Another test checks that every id-like field of every body and query schema
 * under app/api appears here.
 */
export interface BodyIdCase {
  /** The schema file and the key in it that carries the id. */
  readonly schema: string;
  readonly key: string;
  /** The field the error must name (an array entry names its index). */
  readonly field: string;
  readonly method: "GET" | "POST" | "PATCH";
  readonly route: string;
  readonly load: () => Promise<Record<string, unknown>>;
  /** Who asks: a role that holds the route's capability. */
  readonly as: Role;
  readonly params?: (world: World) => Record<string, string>;
  /** The body (or, for GET, the query string) naming `id`. */
  readonly body?: (world: World, id: string) => unknown;
  readonly query?: (id: string) => string;
  readonly foreign: (world: World) => string;
  readonly private?: (world: World) => string;
}

/** Names that must never appear in a refusal. */
export const secretNames = [
  "Secret sandbox scenario",
  "Sandbox",
  "Bench b",
  "Scenario b",
  "Suite b",
];

let made: { scenarioId: string } | undefined;

/** A scenario on the apprentice's private sandbox: the engineer may not read it. */
export function privateScenario(world: World): string {
  made ??= {
    scenarioId: createScenario({
      values: {
        workspaceId: world.a.workspaceId,
        benchId: world.sandboxBenchId,
        name: "Secret sandbox scenario",
        document: JSON.stringify(scenarioDocument("Secret sandbox scenario")),
        createdBy: world.users.apprentice.userId,
      },
    }).id,
  };
  return made.scenarioId;
}

let counter = 0;
const unique = (prefix: string) => `${prefix}-ids-${++counter}`;

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

function freshLab(world: World) {
  return import("@/db/queries/labs").then(
    ({ createLab }) =>
      createLab({
        values: {
          workspaceId: world.a.workspaceId,
          title: unique("lab"),
          benchId: world.a.benchId,
          gradingScenarioId: world.a.scenarioId,
          createdBy: world.users.trainer.userId,
        },
      }).id,
  );
}

/** B's apprentice (a user of another workspace). */
function foreignApprentice(world: World) {
  return createMembership({
    values: {
      userId: createUser({
        values: {
          email: `${unique("b-apprentice")}@b.example`,
          name: "B apprentice",
          passwordHash: "x",
        },
      }).id,
      workspaceId: world.b.workspaceId,
      role: "apprentice",
    },
  }).userId;
}

const labIds = new Map<World, string>();

export const bodyIdCases: readonly BodyIdCase[] = [
  {
    schema: "app/api/scenarios/schema.ts",
    key: "benchId",
    field: "benchId",
    method: "POST",
    route: "/api/scenarios",
    load: () => import("@/app/api/scenarios/route"),
    as: "engineer",
    body: (_w, id) => ({ benchId: id, document: scenarioDocument(unique("scenario")) }),
    foreign: (w) => w.b.benchId,
    private: (w) => w.sandboxBenchId,
  },
  {
    schema: "app/api/scenarios/schema.ts",
    key: "benchId",
    field: "benchId",
    method: "GET",
    route: "/api/scenarios",
    load: () => import("@/app/api/scenarios/route"),
    as: "engineer",
    query: (id) => `?benchId=${encodeURIComponent(id)}`,
    foreign: (w) => w.b.benchId,
    private: (w) => w.sandboxBenchId,
  },
  {
    schema: "app/api/suites/schema.ts",
    key: "scenarioIds",
    field: "scenarioIds[1]",
    method: "POST",
    route: "/api/suites",
    load: () => import("@/app/api/suites/route"),
    as: "engineer",
    body: (w, id) => ({ name: unique("suite"), scenarioIds: [w.a.scenarioId, id] }),
    foreign: (w) => w.b.scenarioId,
    private: privateScenario,
  },
  {
    schema: "app/api/suites/[suiteId]/schema.ts",
    key: "scenarioIds",
    field: "scenarioIds[0]",
    method: "PATCH",
    route: "/api/suites/[suiteId]",
    load: () => import("@/app/api/suites/[suiteId]/route"),
    as: "engineer",
    params: (w) => ({ suiteId: freshSuite(w) }),
    body: (_w, id) => ({ scenarioIds: [id] }),
    foreign: (w) => w.b.scenarioId,
    private: privateScenario,
  },
  {
    schema: "app/api/runs/schema.ts",
    key: "scenarioId",
    field: "scenarioId",
    method: "POST",
    route: "/api/runs",
    load: () => import("@/app/api/runs/route"),
    as: "engineer",
    body: (_w, id) => ({ scenarioId: id }),
    foreign: (w) => w.b.scenarioId,
    private: privateScenario,
  },
  {
    schema: "app/api/runs/schema.ts",
    key: "suiteId",
    field: "suiteId",
    method: "POST",
    route: "/api/runs",
    load: () => import("@/app/api/runs/route"),
    as: "engineer",
    body: (_w, id) => ({ suiteId: id }),
    foreign: (w) => w.b.suiteId,
  },
  {
    schema: "app/api/runs/schema.ts",
    key: "benchRevisionId",
    field: "benchRevisionId",
    method: "POST",
    route: "/api/runs",
    load: () => import("@/app/api/runs/route"),
    as: "engineer",
    body: (w, id) => ({ scenarioId: w.a.scenarioId, benchRevisionId: id }),
    foreign: (w) => w.b.revisionId,
    // The apprentice's sandbox is a copy of A's bench, but not the engineer's to read.
    private: (w) => w.sandboxRevisionId,
  },
  {
    schema: "app/api/live-sessions/schema.ts",
    key: "benchId",
    field: "benchId",
    method: "POST",
    route: "/api/live-sessions",
    load: () => import("@/app/api/live-sessions/route"),
    as: "engineer",
    body: (_w, id) => ({ benchId: id }),
    foreign: (w) => w.b.benchId,
    private: (w) => w.sandboxBenchId,
  },
  {
    schema: "app/api/labs/schema.ts",
    key: "benchId",
    field: "benchId",
    method: "POST",
    route: "/api/labs",
    load: () => import("@/app/api/labs/route"),
    as: "trainer",
    body: (w, id) => ({ title: unique("lab"), benchId: id, gradingScenarioId: w.a.scenarioId }),
    foreign: (w) => w.b.benchId,
    // A trainer may read the apprentice's sandbox, but a lab is not made from someone else's copy.
    private: (w) => w.sandboxBenchId,
  },
  {
    schema: "app/api/labs/schema.ts",
    key: "gradingScenarioId",
    field: "gradingScenarioId",
    method: "POST",
    route: "/api/labs",
    load: () => import("@/app/api/labs/route"),
    as: "trainer",
    body: (w, id) => ({ title: unique("lab"), benchId: w.a.benchId, gradingScenarioId: id }),
    foreign: (w) => w.b.scenarioId,
    private: privateScenario,
  },
  {
    schema: "app/api/labs/[labId]/assignments/schema.ts",
    key: "apprenticeIds",
    field: "apprenticeIds[0]",
    method: "POST",
    route: "/api/labs/[labId]/assignments",
    load: () => import("@/app/api/labs/[labId]/assignments/route"),
    as: "trainer",
    params: (w) => ({ labId: labIds.get(w)! }),
    body: (_w, id) => ({ apprenticeIds: [id] }),
    foreign: foreignApprentice,
    // A member of A who is not an apprentice.
    private: (w) => w.users.engineer.userId,
  },
  {
    schema: "app/api/session/schema.ts",
    key: "workspaceId",
    field: "workspaceId",
    method: "PATCH",
    route: "/api/session",
    load: () => import("@/app/api/session/route"),
    as: "engineer",
    body: (_w, id) => ({ workspaceId: id }),
    foreign: (w) => w.b.workspaceId,
  },
];

/** Make the rows the cases act on (a lab to assign). */
export async function prepareBodyIdCases(world: World) {
  labIds.set(world, await freshLab(world));
}
