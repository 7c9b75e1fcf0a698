import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requireCapability } from "@/app/_lib/dal";
import { orNotFound } from "@/app/_lib/policy/for-page";
import { loadRun } from "@/app/_lib/policy/run";
import { parseStoredResult } from "@/app/_lib/runs/stored-result";
import { findRunReport } from "@/db/queries/runs";
import { RunDiff, type DiffSide } from "@/components/runs/run-diff";
import { PageHeader } from "@/components/ui/page-header";

export const metadata: Metadata = { title: "Compare runs" };

/** /runs/diff?a=<runId>&b=<runId>: two runs of the same scenario, step by step. */
export default async function RunDiffPage({
  searchParams,
}: {
  searchParams: Promise<{ a?: string; b?: string }>;
}) {
  const { a, b } = await searchParams;
  const session = await requireCapability("runs.read");
  if (!a || !b) notFound();
  const load = (runId: string): DiffSide => {
    const run = orNotFound(() => loadRun(session, runId));
    const report = findRunReport({ workspaceId: session.workspaceId, runId: run.id });
    if (!report) notFound();
    return {
      id: report.run.id,
      title: report.run.scenarioName,
      benchName: report.benchName,
      revisionNumber: report.revisionNumber,
      seed: report.run.seed,
      createdAt: report.run.createdAt.toISOString(),
      verdict: report.run.verdict,
      result: parseStoredResult(report.run.results),
    };
  };
  const left = load(a);
  const right = load(b);
  const sameScenario =
    findRunReport({ workspaceId: session.workspaceId, runId: a })?.run.scenarioId ===
    findRunReport({ workspaceId: session.workspaceId, runId: b })?.run.scenarioId;
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title="Compare runs"
        lead={
          sameScenario
            ? left.title
            : "These runs are of different scenarios; steps are compared by position."
        }
        actions={
          <Link
            href="/runs"
            className="rounded-md border border-paper-line px-3.5 py-2 text-sm hover:bg-paper-deep"
          >
            Run history
          </Link>
        }
      />
      <RunDiff a={left} b={right} />
    </div>
  );
}
