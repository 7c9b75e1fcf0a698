import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { json, readJson, readQuery, route } from "@/app/_lib/http";
import { revisionForScenario } from "@/app/_lib/runs/run-access";
import { startScenarioRun, startSuiteRun } from "@/app/_lib/runs/run-service";
import { listRuns } from "@/db/queries/runs";
import { findScenario } from "@/db/queries/scenarios";
import { findSuite, listSuiteScenarios } from "@/db/queries/suites";
import { runJson } from "./run-json";
import { listRunsQuerySchema, startRunBodySchema } from "./schema";

/** Run history: the whole workspace, or only the member's own runs (apprentices). */
export const GET = route(async (request) => {
  const query = readQuery(request, listRunsQuerySchema);
  const session = await verifyApiSession(request);
  const scope = authorize(session, "runs.read");
  const runs = listRuns({
    workspaceId: session.workspaceId,
    ...(scope === "own" ? { startedBy: session.userId } : {}),
    ...(query.limit === undefined ? {} : { limit: query.limit }),
  });
  return json({ runs: runs.map((run) => runJson(run)) });
});

/**
 * POST /api/runs — replay a scenario or a suite on the server. Answers
 * 202 at once with the run id and its event stream; the replay runs in the
 * run pool, outside this request.
 */
export const POST = route(async (request) => {
  const session = await verifyApiSession(request);
  const body = await readJson(request, startRunBodySchema);

  if (body.scenarioId !== undefined) {
    const scenario = findScenario({
      workspaceId: session.workspaceId,
      scenarioId: body.scenarioId,
    });
    if (!scenario) throw new AppError("not_found", "scenario not found", { field: "scenarioId" });
    const { bench, revision } = revisionForScenario(
      session,
      scenario.benchId,
      body.benchRevisionId,
    );
    const scope = authorize(session, "runs.start");
    // "own" scope (apprentices): only on their own private copies.
    if (scope !== "workspace" && bench.privateOwnerId !== session.userId) {
      throw new AppError(
        "forbidden",
        `your role (${session.role}) may replay scenarios only on your own copies`,
      );
    }
    const { run } = startScenarioRun({
      workspaceId: session.workspaceId,
      startedBy: session.userId,
      scenario,
      revision,
      seed: body.seed,
    });
    return json(
      {
        kind: "scenario",
        runId: run.id,
        status: run.status,
        seed: run.seed,
        benchRevisionId: revision.id,
        eventsUrl: `/api/runs/${run.id}/events`,
      },
      { status: 202 },
    );
  }

  const suite = findSuite({ workspaceId: session.workspaceId, suiteId: body.suiteId! });
  if (!suite) throw new AppError("not_found", "suite not found", { field: "suiteId" });
  const members = listSuiteScenarios({ suiteId: suite.id });
  if (members.length === 0) {
    throw new AppError("conflict", `suite "${suite.name}" has no scenarios`, { field: "suiteId" });
  }
  const entries = members.map(({ scenario }) => ({
    scenario,
    revision: revisionForScenario(session, scenario.benchId, body.benchRevisionId).revision,
  }));
  if (authorize(session, "runs.start") !== "workspace") {
    throw new AppError("forbidden", `your role (${session.role}) may not replay suites`);
  }
  const { suiteRun, runs } = startSuiteRun({
    workspaceId: session.workspaceId,
    startedBy: session.userId,
    suite,
    entries,
    benchRevisionId: body.benchRevisionId,
    seed: body.seed,
  });
  return json(
    {
      kind: "suite",
      suiteRunId: suiteRun.id,
      runIds: runs.map((run) => run.id),
      status: suiteRun.status,
      eventsUrl: `/api/runs/${suiteRun.id}/events`,
    },
    { status: 202 },
  );
});
