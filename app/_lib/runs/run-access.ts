import type { Db } from "@/db/client";
import { getDb } from "@/db/client";
import { findRevisionInWorkspace } from "@/db/queries/bench-history";
import { latestRevision } from "@/db/queries/benches";
import { findRun, findSuiteRun, type Run, type SuiteRun } from "@/db/queries/runs";
import { scopeOf } from "../capabilities";
import type { VerifiedSession } from "../dal";
import { AppError } from "../errors";
import { loadVisibleBench } from "../resources";

type Who = Pick<VerifiedSession, "userId" | "workspaceId" | "role">;

const notFound = (what: string) => new AppError("not_found", `${what} not found`);

/**
 * A run or suite run the member may see: workspace scope sees all of the
 * workspace's runs, "own" scope only runs they started. Anything else is 404,
 * never told apart from a run that does not exist.
 */
export function loadVisibleRunOrSuiteRun(
  who: Who,
  id: string,
  db: Db = getDb(),
): { kind: "scenario"; run: Run } | { kind: "suite"; suiteRun: SuiteRun } {
  const scope = scopeOf(who.role, "runs.read");
  if (scope === "none") throw new AppError("forbidden", `your role (${who.role}) may not see runs`);
  const run = findRun({ db, workspaceId: who.workspaceId, runId: id });
  if (run) {
    if (scope !== "workspace" && run.startedBy !== who.userId) throw notFound("run");
    return { kind: "scenario", run };
  }
  const suiteRun = findSuiteRun({ db, workspaceId: who.workspaceId, suiteRunId: id });
  if (suiteRun) {
    if (scope !== "workspace" && suiteRun.startedBy !== who.userId) throw notFound("run");
    return { kind: "suite", suiteRun };
  }
  throw notFound("run");
}

/**
 * The revision a scenario runs against: the one asked for, else the latest of
 * the scenario's bench. A revision asked for must be of the scenario's bench or
 * of a copy made from it (an apprentice's sandbox or lab copy), and the member
 * must be able to see that bench. Returns the bench the revision belongs to.
 */
export function revisionForScenario(
  who: Who,
  benchId: string,
  benchRevisionId: string | undefined,
  db: Db = getDb(),
) {
  const scenarioBench = loadVisibleBench(who, benchId);
  if (benchRevisionId === undefined) {
    const latest = latestRevision({ db, benchId });
    if (!latest) {
      throw new AppError("conflict", `bench "${scenarioBench.name}" has no saved revision`);
    }
    return { bench: scenarioBench, revision: latest };
  }
  const found = findRevisionInWorkspace({
    db,
    workspaceId: who.workspaceId,
    revisionId: benchRevisionId,
  });
  if (!found) {
    throw new AppError("not_found", "bench revision not found", { field: "benchRevisionId" });
  }
  const bench = loadVisibleBench(who, found.bench.id);
  if (bench.id !== scenarioBench.id && bench.copiedFromBenchId !== scenarioBench.id) {
    throw new AppError(
      "invalid_input",
      `benchRevisionId: revision ${found.revision.number} belongs to bench "${bench.name}", which is neither "${scenarioBench.name}" (the scenario's bench) nor a copy of it`,
      { field: "benchRevisionId" },
    );
  }
  return { bench, revision: found.revision };
}
