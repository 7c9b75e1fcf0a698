import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { json, readJson, readQuery, route } from "@/app/_lib/http";
import { admitScenarioRun, admitSuiteRun, listReadableRuns } from "@/app/_lib/policy/run";
import { startScenarioRun, startSuiteRun } from "@/app/_lib/runs/run-service";
import { runJson } from "./run-json";
import { listRunsQuerySchema, startRunBodySchema } from "./schema";

/** Run history: the whole workspace, or only the member's own runs (apprentices). */
export const GET = route(async (request) => {
  const query = readQuery(request, listRunsQuerySchema);
  const session = await verifyApiSession(request);
  authorize(session, "runs.read");
  const runs = listReadableRuns(session, query.limit === undefined ? {} : { limit: query.limit });
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
    const { scenario, revision } = admitScenarioRun(session, {
      scenarioId: body.scenarioId,
      benchRevisionId: body.benchRevisionId,
    });
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

  const { suite, entries } = admitSuiteRun(session, {
    suiteId: body.suiteId!,
    benchRevisionId: body.benchRevisionId,
  });
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
