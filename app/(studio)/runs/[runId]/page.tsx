import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requireCapability } from "@/app/_lib/dal";
import { orNotFound } from "@/app/_lib/policy/for-page";
import { loadRunOrSuiteRun } from "@/app/_lib/policy/run";
import { parseStoredResult } from "@/app/_lib/runs/stored-result";
import { findRevisionInWorkspace } from "@/db/queries/bench-history";
import { findRunReport, listRunHistory, listSuiteRunRuns } from "@/db/queries/runs";
import { EmailReportForm } from "@/components/runs/email-report-form";
import { PrintButton } from "@/components/runs/print-button";
import { RunReport } from "@/components/runs/run-report";
import { SuiteRunView } from "@/components/runs/suite-run-view";
import { addressesOfBench, linesOfBench } from "@/components/runs/trace-view";
import { SimulatorCaution } from "@/components/runs/simulator-caution";
import { PrintStyles } from "../print-styles";

export const metadata: Metadata = { title: "Run report" };

function benchDocument(text: string | undefined): unknown {
  if (!text) return null;
  try {
    return JSON.parse(text);
  } catch {
    return null;
  }
}

export default async function RunPage({ params }: { params: Promise<{ runId: string }> }) {
  const { runId } = await params;
  const session = await requireCapability("runs.read");
  const visible = orNotFound(() => loadRunOrSuiteRun(session, runId));

  const report =
    visible.kind === "scenario"
      ? findRunReport({ workspaceId: session.workspaceId, runId: visible.run.id })
      : undefined;
  if (report) {
    const revision = findRevisionInWorkspace({
      workspaceId: session.workspaceId,
      revisionId: report.run.benchRevisionId,
    });
    const { run } = report;
    return (
      <div className="mx-auto flex max-w-4xl flex-col gap-6 px-6 py-8 md:px-10 print:max-w-none print:p-0">
        <PrintStyles />
        <nav
          data-print="hide"
          className="flex flex-wrap items-center justify-between gap-3 text-sm"
        >
          <span className="flex gap-3">
            <Link href="/runs" className="text-copper-deep underline">
              Run history
            </Link>
            {run.suiteRunId ? (
              <Link href={`/runs/${run.suiteRunId}`} className="text-copper-deep underline">
                Suite run
              </Link>
            ) : null}
            {run.scenarioId ? (
              <Link href={`/scenarios/${run.scenarioId}`} className="text-copper-deep underline">
                Scenario
              </Link>
            ) : null}
          </span>
          <PrintButton />
        </nav>
        <RunReport
          facts={{
            runId: run.id,
            scenarioName: run.scenarioName,
            benchName: report.benchName,
            revisionNumber: report.revisionNumber,
            seed: run.seed,
            startedByName: report.startedByName,
            createdAt: run.createdAt.toISOString(),
            durationMs: run.durationMs,
            status: run.status,
            verdict: run.verdict,
            errorMessage: run.errorMessage,
          }}
          result={parseStoredResult(run.results)}
          addresses={addressesOfBench(benchDocument(revision?.revision.document))}
          lines={linesOfBench(benchDocument(revision?.revision.document))}
        />
        <div data-print="hide" className="rounded-lg border border-paper-line p-4">
          <EmailReportForm runId={run.id} />
        </div>
      </div>
    );
  }

  if (visible.kind !== "suite") notFound();
  const { suiteRun } = visible;
  const rows = listRunHistory({ workspaceId: session.workspaceId, suiteRunId: suiteRun.id });
  const outcomes = new Map(
    listSuiteRunRuns({ suiteRunId: suiteRun.id }).map((run) => [
      run.id,
      parseStoredResult(run.results)?.outcome ?? null,
    ]),
  );
  return (
    <div className="mx-auto flex max-w-4xl flex-col gap-6 px-6 py-8 md:px-10 print:max-w-none print:p-0">
      <PrintStyles />
      <nav data-print="hide" className="flex items-center justify-between text-sm">
        <Link href="/runs" className="text-copper-deep underline">
          Run history
        </Link>
        <PrintButton />
      </nav>
      <SuiteRunView
        suiteRun={{
          id: suiteRun.id,
          suiteName: suiteRun.suiteName,
          status: suiteRun.status,
          verdict: suiteRun.verdict,
          scenariosTotal: suiteRun.scenariosTotal,
          scenariosDone: suiteRun.scenariosDone,
          scenariosOk: suiteRun.scenariosOk,
          createdAt: suiteRun.createdAt.toISOString(),
          durationMs: suiteRun.durationMs,
          seed: suiteRun.seed,
        }}
        runs={[...rows]
          .sort((a, b) => a.position - b.position)
          .map((row) => ({
            id: row.id,
            scenarioName: row.scenarioName,
            benchName: row.benchName,
            revisionNumber: row.revisionNumber,
            status: row.status,
            verdict: row.verdict,
            outcome: outcomes.get(row.id) ?? null,
            stepsPassed: row.stepsPassed,
            stepsTotal: row.stepsTotal,
            startedByName: row.startedByName,
          }))}
      />
      <SimulatorCaution />
      <div data-print="hide" className="rounded-lg border border-paper-line p-4">
        <EmailReportForm runId={suiteRun.id} />
      </div>
    </div>
  );
}
