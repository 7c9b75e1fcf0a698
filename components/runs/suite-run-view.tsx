"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useEffect } from "react";
import { RunProgressBar } from "./run-progress-bar";
import { useRunProgress } from "./use-run-progress";
import { VerdictBadge } from "./verdict-badge";

type Status = "queued" | "running" | "finished" | "errored";
type Verdict = "pass" | "fail" | "error" | null;
type Outcome = "passed" | "failed" | "expected-failure" | "unexpected-pass" | "error";

/** A suite run: its progress while it runs, then each scenario's verdict with a link to its report. */
export function SuiteRunView({
  suiteRun,
  runs,
}: {
  suiteRun: {
    id: string;
    suiteName: string;
    status: Status;
    verdict: Verdict;
    scenariosTotal: number;
    scenariosDone: number;
    scenariosOk: number;
    createdAt: string;
    durationMs: number | null;
    seed: number | null;
  };
  runs: {
    id: string;
    scenarioName: string;
    benchName: string;
    revisionNumber: number;
    status: Status;
    verdict: Verdict;
    outcome: Outcome | null;
    stepsPassed: number;
    stepsTotal: number;
    startedByName: string | null;
  }[];
}) {
  const router = useRouter();
  const live = suiteRun.status === "queued" || suiteRun.status === "running";
  const progress = useRunProgress(live ? `/api/runs/${suiteRun.id}/events` : null);
  const justFinished = live && progress.status === "finished";
  useEffect(() => {
    if (justFinished) router.refresh();
  }, [justFinished, router]);

  return (
    <article className="flex flex-col gap-4" aria-label="Suite run">
      <header className="flex flex-col gap-2 border-b border-paper-line pb-4">
        <p className="text-xs uppercase tracking-wide text-ink-soft">Benchline suite run</p>
        <h1 className="text-2xl font-semibold tracking-tight">{suiteRun.suiteName}</h1>
        <div className="flex flex-wrap items-center gap-3 text-sm">
          <VerdictBadge verdict={suiteRun.verdict} status={suiteRun.status} />
          <span className="text-ink-soft">
            {suiteRun.scenariosOk} of {suiteRun.scenariosTotal} scenarios ok
            {suiteRun.durationMs === null ? "" : ` in ${suiteRun.durationMs} ms`}
            {suiteRun.seed === null ? ", each with its own seed" : `, seed ${suiteRun.seed}`}
          </span>
        </div>
        {live ? <RunProgressBar progress={progress} label="Suite progress" /> : null}
      </header>
      <table className="w-full text-left text-sm">
        <thead>
          <tr className="border-b border-paper-line text-ink-soft">
            <th className="py-2 pr-3 font-medium">Scenario</th>
            <th className="py-2 pr-3 font-medium">Bench</th>
            <th className="py-2 pr-3 font-medium">Steps</th>
            <th className="py-2 font-medium">Verdict</th>
          </tr>
        </thead>
        <tbody>
          {runs.map((run) => {
            const finishedLive = progress.finished.find((f) => f.runId === run.id);
            return (
              <tr
                key={run.id}
                className="border-b border-paper-line/60"
                data-outcome={run.outcome ?? ""}
              >
                <td className="py-2 pr-3">
                  <Link href={`/runs/${run.id}`} className="text-copper-deep underline">
                    {run.scenarioName}
                  </Link>
                </td>
                <td className="py-2 pr-3">
                  {run.benchName} <span className="text-ink-soft">rev. {run.revisionNumber}</span>
                </td>
                <td className="py-2 pr-3">
                  {run.status === "finished" ? `${run.stepsPassed}/${run.stepsTotal}` : "—"}
                </td>
                <td className="py-2">
                  {finishedLive && run.status !== "finished" ? (
                    <VerdictBadge verdict={finishedLive.verdict as Verdict} />
                  ) : (
                    <VerdictBadge
                      verdict={run.verdict}
                      outcome={run.outcome ?? undefined}
                      status={run.status}
                    />
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </article>
  );
}
