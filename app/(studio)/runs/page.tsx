import type { Metadata } from "next";
import Link from "next/link";
import { requireCapability } from "@/app/_lib/dal";
import { ownRunsFilter } from "@/app/_lib/policy/run";
import { listReadableSuites, suiteCan } from "@/app/_lib/policy/suite";
import { listRunHistory, listSuiteRuns } from "@/db/queries/runs";
import { RunButton } from "@/components/runs/run-button";
import { RunHistoryTable } from "@/components/runs/run-history-table";
import type { RunHistoryItem } from "@/components/runs/run-history-types";
import { VerdictBadge } from "@/components/runs/verdict-badge";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { Timestamp } from "@/components/ui/timestamp";

export const metadata: Metadata = { title: "Runs" };

export default async function RunsPage() {
  const session = await requireCapability("runs.read");
  const startedBy = ownRunsFilter(session);
  const own = startedBy !== undefined;
  const history: RunHistoryItem[] = listRunHistory({
    workspaceId: session.workspaceId,
    ...(startedBy ? { startedBy } : {}),
  }).map((row) => ({
    id: row.id,
    scenarioId: row.scenarioId,
    scenarioName: row.scenarioName,
    suiteRunId: row.suiteRunId,
    benchId: row.benchId,
    benchName: row.benchName,
    revisionNumber: row.revisionNumber,
    seed: row.seed,
    status: row.status,
    verdict: row.verdict,
    stepsPassed: row.stepsPassed,
    stepsTotal: row.stepsTotal,
    durationMs: row.durationMs,
    startedByName: row.startedByName,
    createdAt: row.createdAt.toISOString(),
  }));
  const suiteRuns = listSuiteRuns({
    workspaceId: session.workspaceId,
    ...(startedBy ? { startedBy } : {}),
    limit: 10,
  });
  const suites = listReadableSuites(session).filter((suite) => suiteCan(session, suite).run);

  return (
    <div className="mx-auto flex max-w-6xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title="Runs"
        lead={
          own
            ? "Your replays and graded attempts."
            : "Replays of scenarios and suites in this workspace, newest first."
        }
      />
      {suites.length > 0 ? (
        <Panel title="Suites">
          <ul className="flex flex-col gap-3">
            {suites.map((suite) => (
              <li
                key={suite.id}
                className="flex flex-wrap items-center justify-between gap-3"
                aria-label={`Suite ${suite.name}`}
              >
                <span>
                  <span className="font-medium">{suite.name}</span>
                  {suite.description ? (
                    <span className="block text-sm text-ink-soft">{suite.description}</span>
                  ) : null}
                </span>
                <RunButton target={{ suiteId: suite.id }} label="Run suite" />
              </li>
            ))}
          </ul>
        </Panel>
      ) : null}
      {suiteRuns.length > 0 ? (
        <Panel title="Recent suite runs">
          <ul className="flex flex-col gap-2 text-sm">
            {suiteRuns.map(({ suiteRun, startedByName }) => (
              <li key={suiteRun.id} className="flex flex-wrap items-center gap-3">
                <Link href={`/runs/${suiteRun.id}`} className="text-copper-deep underline">
                  {suiteRun.suiteName}
                </Link>
                <VerdictBadge verdict={suiteRun.verdict} status={suiteRun.status} />
                <span className="text-ink-soft">
                  {suiteRun.scenariosOk}/{suiteRun.scenariosTotal} ok,{" "}
                  {startedByName ?? "former member"},{" "}
                  <Timestamp value={suiteRun.createdAt} relative />
                </span>
              </li>
            ))}
          </ul>
        </Panel>
      ) : null}
      <Panel title="Run history">
        <RunHistoryTable runs={history} />
      </Panel>
    </div>
  );
}
