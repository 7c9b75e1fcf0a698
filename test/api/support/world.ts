import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import bcrypt from "bcryptjs";
import { closeDb, getDb } from "@/db/client";
import { duplicateBench } from "@/db/queries/bench-history";
import { createBench, findBench } from "@/db/queries/benches";
import { createAssignments, createLab, setAssignmentBench } from "@/db/queries/labs";
import { createMembership } from "@/db/queries/memberships";
import { createRun, finishRun } from "@/db/queries/runs";
import { createScenario } from "@/db/queries/scenarios";
import { createSuite } from "@/db/queries/suites";
import { replaceFloorPlan } from "@/db/queries/uploads";
import { createUser, findUserById } from "@/db/queries/users";
import { createWorkspace } from "@/db/queries/workspaces";
import { roles, type Role } from "@/db/schema";
import { sealSession } from "@/app/_lib/session";
import { benchBuilder } from "@/test/harness/bench-builder";

/**
 * A temporary database with two invented workspaces, one member per role in
 * the first, an admin and an apprentice in the second, and in each a bench,
 * scenario, suite, finished run, a bench with a floor plan, and a lab assigned
 * to the apprentice, who has opened it (a private copy). Route handlers are called directly with real Requests; the session
 * layer reads the cookie from the Request, so nothing of Next is mocked.
 */

export const appOrigin = "http://bench.test";
export const testPassword = "correct-horse-battery";

export interface WorkspaceFixture {
  readonly workspaceId: string;
  readonly benchId: string;
  readonly revisionId: string;
  readonly scenarioId: string;
  readonly suiteId: string;
  /** A finished run of the scenario, started by the workspace's admin. */
  readonly runId: string;
  /** A shared bench with an SVG floor plan (kept apart from benchId, whose plan tests change). */
  readonly floorPlanBenchId: string;
  /** A lab on the bench, graded by the scenario. */
  readonly labId: string;
  /** The lab's assignment to the workspace's apprentice, opened (its private copy exists). */
  readonly assignmentId: string;
}

export interface World {
  readonly a: WorkspaceFixture;
  readonly b: WorkspaceFixture;
  /** User ids in workspace A by role. */
  readonly users: Record<Role, { userId: string; email: string }>;
  readonly outsider: { userId: string; email: string };
  /** The apprentice's private sandbox bench in A. */
  readonly sandboxBenchId: string;
  readonly sandboxRevisionId: string;
  readonly dir: string;
}

/** A valid bench document: one switch actuator on one group address. */
export function benchDocument(name = "Test bench") {
  return {
    ...benchBuilder()
      .groupAddress("1/0/1", "1.001", "Light")
      .device("act", "switch-actuator", "1.1.2")
      .link("act", 0, "1/0/1")
      .build(),
    name,
  };
}

/** A valid scenario document for that bench. */
export function scenarioDocument(name = "Light answers") {
  return {
    format: 1,
    name,
    bench: { name: "Test bench" },
    steps: [
      { kind: "write", groupAddress: "1/0/1", value: true },
      { kind: "wait", for: "500ms" },
    ],
  };
}

/** A small inert SVG floor plan. */
export const floorPlanSvg =
  '<svg xmlns="http://www.w3.org/2000/svg" width="40" height="20"><rect width="40" height="20"/></svg>';

// A stored result as the run pool writes it (app/_lib/runs/stored-result.ts): both steps passed.
function passedResult(seed: number) {
  const steps = scenarioDocument().steps.map((step, index) => ({
    index,
    kind: step.kind,
    label: step.kind === "write" ? `write ${step.groupAddress}` : `wait ${step.for}`,
    status: "pass" as const,
    startUs: 0,
    endUs: index === 0 ? 0 : 500_000,
    trace: [],
  }));
  return {
    name: "Light answers",
    seed,
    expectedToFail: false,
    outcome: "passed",
    ok: true,
    steps,
    totals: { pass: steps.length, fail: 0, error: 0, skipped: 0 },
    virtualTimeUs: 500_000,
    wallMs: 1,
  };
}

let labCounter = 0;

/**
 * A lab on a workspace bench, graded by a scenario on it, assigned to one
 * apprentice; `opened` also makes the apprentice's private copy, as opening the
 * assignment does. Made through the queries, so no assignment e-mail is queued.
 */
export function labFixture(input: {
  workspaceId: string;
  benchId: string;
  scenarioId: string;
  trainerId: string;
  apprenticeId: string;
  opened: boolean;
}): { labId: string; assignmentId: string; privateBenchId: string | null } {
  const lab = createLab({
    values: {
      workspaceId: input.workspaceId,
      title: `Lab ${++labCounter}`,
      benchId: input.benchId,
      gradingScenarioId: input.scenarioId,
      createdBy: input.trainerId,
    },
  });
  const [assignment] = createAssignments({
    labId: lab.id,
    apprenticeIds: [input.apprenticeId],
    dueAt: null,
    assignedBy: input.trainerId,
  });
  if (!assignment) throw new Error("the assignment was not created");
  if (!input.opened) return { labId: lab.id, assignmentId: assignment.id, privateBenchId: null };
  const source = findBench({ workspaceId: input.workspaceId, benchId: input.benchId });
  if (!source) throw new Error(`no bench ${input.benchId}`);
  const copy = duplicateBench({
    source,
    document: JSON.stringify(benchDocument(`${lab.title} copy`)),
    name: `${lab.title} copy`,
    createdBy: input.apprenticeId,
    privateOwnerId: input.apprenticeId,
  });
  setAssignmentBench({ assignmentId: assignment.id, benchId: copy.bench.id });
  return { labId: lab.id, assignmentId: assignment.id, privateBenchId: copy.bench.id };
}

function workspaceFixture(slug: string, ownerId: string, apprenticeId: string): WorkspaceFixture {
  const workspace = createWorkspace({ values: { slug, name: `Workspace ${slug}` } });
  const { bench, revision } = createBench({
    values: { workspaceId: workspace.id, name: `Bench ${slug}`, createdBy: ownerId },
    document: JSON.stringify(benchDocument()),
  });
  const scenario = createScenario({
    values: {
      workspaceId: workspace.id,
      benchId: bench.id,
      name: `Scenario ${slug}`,
      document: JSON.stringify(scenarioDocument()),
      createdBy: ownerId,
    },
  });
  const suite = createSuite({
    values: { workspaceId: workspace.id, name: `Suite ${slug}`, createdBy: ownerId },
    scenarioIds: [scenario.id],
  });
  const run = createRun({
    values: {
      workspaceId: workspace.id,
      scenarioId: scenario.id,
      benchRevisionId: revision.id,
      seed: 1,
      startedBy: ownerId,
    },
  });
  const result = passedResult(run.seed);
  finishRun({
    runId: run.id,
    result: {
      verdict: "pass",
      stepsPassed: result.totals.pass,
      stepsFailed: 0,
      stepsTotal: result.steps.length,
      results: JSON.stringify(result),
      durationMs: result.wallMs,
    },
  });
  const planned = createBench({
    values: { workspaceId: workspace.id, name: `Planned bench ${slug}`, createdBy: ownerId },
    document: JSON.stringify(benchDocument()),
  });
  replaceFloorPlan({
    workspaceId: workspace.id,
    benchId: planned.bench.id,
    uploadedBy: ownerId,
    contentType: "image/svg+xml",
    content: Buffer.from(floorPlanSvg, "utf8"),
  });
  const lab = labFixture({
    workspaceId: workspace.id,
    benchId: bench.id,
    scenarioId: scenario.id,
    trainerId: ownerId,
    apprenticeId,
    opened: true,
  });
  return {
    workspaceId: workspace.id,
    benchId: bench.id,
    revisionId: revision.id,
    scenarioId: scenario.id,
    suiteId: suite.id,
    runId: run.id,
    floorPlanBenchId: planned.bench.id,
    labId: lab.labId,
    assignmentId: lab.assignmentId,
  };
}

/** Point the app at a fresh temporary database and fill it. Call in beforeAll. */
export function createWorld(): World {
  const dir = mkdtempSync(path.join(tmpdir(), "benchline-api-"));
  process.env.DATABASE_URL = path.join(dir, "api.db");
  process.env.SESSION_SECRET = "an-api-test-secret-that-is-long-enough-0123456789";
  process.env.SESSION_COOKIE_SECURE = "false";
  process.env.APP_URL = appOrigin;
  // Cost 4 keeps the suite quick; production never goes below 12 (app/_lib/config.ts).
  process.env.PASSWORD_HASH_COST = "4";
  delete process.env.SMTP_URL;
  closeDb();
  getDb();

  const passwordHash = bcrypt.hashSync(testPassword, 4);
  const makeUser = (email: string, name: string) =>
    createUser({ values: { email, name, passwordHash } });

  const users = {} as Record<Role, { userId: string; email: string }>;
  for (const role of roles) {
    const user = makeUser(`${role}@a.example`, role === "admin" ? "Avery Admin" : `Sam ${role}`);
    users[role] = { userId: user.id, email: user.email };
  }
  const a = workspaceFixture("a", users.admin.userId, users.apprentice.userId);
  for (const role of roles) {
    createMembership({ values: { userId: users[role].userId, workspaceId: a.workspaceId, role } });
  }
  const outsiderUser = makeUser("admin@b.example", "Blair Outsider");
  const apprenticeOfB = makeUser("apprentice@b.example", "Robin Outsider");
  const b = workspaceFixture("b", outsiderUser.id, apprenticeOfB.id);
  createMembership({
    values: { userId: outsiderUser.id, workspaceId: b.workspaceId, role: "admin" },
  });
  createMembership({
    values: { userId: apprenticeOfB.id, workspaceId: b.workspaceId, role: "apprentice" },
  });

  const sandbox = createBench({
    values: {
      workspaceId: a.workspaceId,
      name: "Sandbox",
      createdBy: users.apprentice.userId,
      privateOwnerId: users.apprentice.userId,
      // A sandbox is the apprentice's private copy of a workspace bench.
      copiedFromBenchId: a.benchId,
    },
    document: JSON.stringify(benchDocument("Sandbox")),
  });

  return {
    a,
    b,
    users,
    outsider: { userId: outsiderUser.id, email: outsiderUser.email },
    sandboxBenchId: sandbox.bench.id,
    sandboxRevisionId: sandbox.revision.id,
    dir,
  };
}

export function destroyWorld(world: World | undefined) {
  closeDb();
  if (world) rmSync(world.dir, { recursive: true, force: true });
}

/** A session cookie for a user in a workspace, sealed exactly as sign-in seals it. */
export async function cookieFor(userId: string, workspaceId: string): Promise<string> {
  const user = findUserById({ userId });
  if (!user) throw new Error(`no user ${userId}`);
  const value = await sealSession({
    userId,
    workspaceId,
    sessionVersion: user.sessionVersion,
    issuedAt: Date.now(),
  });
  return `benchline-session=${encodeURIComponent(value)}`;
}

/** The Cookie header value from a response's Set-Cookie. */
export function cookieFromResponse(response: Response): string {
  const setCookie = response.headers.get("set-cookie");
  if (!setCookie) throw new Error("no Set-Cookie in the response");
  return setCookie.split(";")[0]!;
}

type Handler = (
  request: Request,
  context: { params: Promise<Record<string, string>> },
) => Promise<Response>;

export interface CallOptions {
  readonly method: string;
  readonly path: string;
  readonly cookie?: string;
  /** JSON-encoded unless `rawBody` is given. */
  readonly body?: unknown;
  readonly rawBody?: string;
  readonly params?: Record<string, string>;
  readonly headers?: Record<string, string>;
  /** Origin header; the app's own unless given (null: none). */
  readonly origin?: string | null;
}

/** Call a route handler with a real Request, as Next would. */
export function call(handler: unknown, options: CallOptions): Promise<Response> {
  const headers = new Headers(options.headers);
  if (options.cookie) headers.set("cookie", options.cookie);
  const origin = options.origin === undefined ? appOrigin : options.origin;
  if (origin !== null && options.method !== "GET") headers.set("origin", origin);
  let body: string | undefined;
  if (options.rawBody !== undefined) body = options.rawBody;
  else if (options.body !== undefined) body = JSON.stringify(options.body);
  if (body !== undefined && !headers.has("content-type")) {
    headers.set("content-type", "application/json");
  }
  const request = new Request(`${appOrigin}${options.path}`, {
    method: options.method,
    headers,
    ...(body === undefined ? {} : { body }),
  });
  return (handler as Handler)(request, { params: Promise.resolve(options.params ?? {}) });
}

/** Every row of every table, as one string: equal before and after means nothing changed. */
export function databaseSnapshot(): string {
  const sqlite = getDb().$client;
  const tables = sqlite
    .prepare(
      "select name from sqlite_master where type = 'table' and name not like 'sqlite_%' and name not like '__drizzle%' order by name",
    )
    .all() as { name: string }[];
  return JSON.stringify(
    tables.map(({ name }) => [
      name,
      sqlite.prepare(`select * from "${name}" order by rowid`).all(),
    ]),
  );
}
