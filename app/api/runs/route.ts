import { randomInt } from "node:crypto";
import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { json, readJson, readQuery, route } from "@/app/_lib/http";
import { loadSuite, loadVisibleBench, loadVisibleScenario } from "@/app/_lib/resources";
import { latestRevision } from "@/db/queries/benches";
import { findRevisionInWorkspace } from "@/db/queries/bench-history";
import { createRun, listRuns } from "@/db/queries/runs";
import { listSuiteScenarios } from "@/db/queries/suites";
import { runJson } from "./run-json";
import { createRunBodySchema, listRunsQuerySchema } from "./schema";

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
 * Queue a run record. Executing it is the run worker's job; this only checks
 * that everything it names exists in the workspace and may be run by the member.
 */
export const POST = route(async (request) => {
  const body = await readJson(request, createRunBodySchema);
  const session = await verifyApiSession(request);
  const scope = authorize(session, "runs.start");

  let benchId: string;
  if (body.scenarioId !== undefined) {
    benchId = loadVisibleScenario(session, body.scenarioId).benchId;
  } else {
    const suite = loadSuite(session, body.suiteId!);
    const first = listSuiteScenarios({ suiteId: suite.id })[0];
    if (!first) throw new AppError("conflict", "the suite has no scenarios", { field: "suiteId" });
    benchId = first.scenario.benchId;
  }

  let revision;
  if (body.benchRevisionId !== undefined) {
    const found = findRevisionInWorkspace({
      workspaceId: session.workspaceId,
      revisionId: body.benchRevisionId,
    });
    if (!found) {
      throw new AppError("not_found", "benchRevisionId: no such bench revision", {
        field: "benchRevisionId",
      });
    }
    loadVisibleBench(session, found.bench.id);
    revision = found.revision;
    benchId = found.bench.id;
  } else {
    revision = latestRevision({ benchId });
    if (!revision) throw new AppError("conflict", "the bench has no revision to run");
  }

  // "own attempts": an apprentice replays only against a bench of their own.
  if (scope === "own") {
    const bench = loadVisibleBench(session, benchId);
    if (bench.privateOwnerId !== session.userId) {
      throw new AppError(
        "forbidden",
        `your role (${session.role}) may run scenarios only on your own benches`,
      );
    }
  }

  const run = createRun({
    values: {
      workspaceId: session.workspaceId,
      scenarioId: body.scenarioId ?? null,
      suiteId: body.suiteId ?? null,
      benchRevisionId: revision.id,
      seed: body.seed ?? randomInt(0, 2 ** 31 - 1),
      status: "queued",
      startedBy: session.userId,
    },
  });
  return json({ run: runJson(run) }, { status: 201 });
});
