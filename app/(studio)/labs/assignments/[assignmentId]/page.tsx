import type { Metadata } from "next";
import Link from "next/link";
import { requireCapability } from "@/app/_lib/dal";
import { benchCan } from "@/app/_lib/policy/bench";
import { orNotFound } from "@/app/_lib/policy/for-page";
import { assignmentCan, loadAssignment } from "@/app/_lib/policy/lab";
import { parseStoredResult } from "@/app/_lib/runs/stored-result";
import { findBench, latestRevision } from "@/db/queries/benches";
import { listAttempts } from "@/db/queries/labs";
import { AttemptChecks } from "@/components/labs/attempt-checks";
import { LabWorkbench, type WorkbenchCopy } from "@/components/labs/lab-workbench";
import { RefreshWhenFinished } from "@/components/runs/refresh-when-finished";
import { VerdictBadge } from "@/components/runs/verdict-badge";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { Timestamp } from "@/components/ui/timestamp";

export const metadata: Metadata = { title: "Lab assignment" };

/** An assigned lab: the apprentice works and submits here; the trainer can look in. */
export default async function AssignmentPage({
  params,
}: {
  params: Promise<{ assignmentId: string }>;
}) {
  const { assignmentId } = await params;
  const session = await requireCapability("labs.read");
  const found = orNotFound(() => loadAssignment(session, assignmentId));
  const { assignment, lab } = found;
  const isApprentice = assignment.apprenticeId === session.userId;
  let copy: WorkbenchCopy | null = null;
  // The copy, if it was made and is still there; read through the bench policy.
  const stored = assignment.privateBenchId
    ? findBench({ workspaceId: session.workspaceId, benchId: assignment.privateBenchId })
    : undefined;
  const bench = stored && benchCan(session, stored).read ? stored : undefined;
  const revision = bench ? latestRevision({ benchId: bench.id }) : undefined;
  if (bench && revision) {
    copy = {
      benchId: bench.id,
      revisionNumber: revision.number,
      document: JSON.parse(revision.document) as WorkbenchCopy["document"],
    };
  }
  const attempts = listAttempts({ assignmentIds: [assignment.id] });
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title={lab.title}
        lead={
          <>
            {isApprentice ? "Your lab" : `${found.apprenticeName}'s lab`}
            {/* The lab's source bench is named only to those who manage labs. */}
            {found.benchName ? ` on ${found.benchName}` : bench ? ` on ${bench.name}` : ""}
            {assignment.dueAt ? (
              <>
                , due <Timestamp value={assignment.dueAt} dateOnly relative />
              </>
            ) : null}
            . Graded by “{found.gradingScenarioName}”.
          </>
        }
        actions={
          <Link
            href="/labs"
            className="rounded-md border border-paper-line px-3.5 py-2 text-sm hover:bg-paper-deep"
          >
            All labs
          </Link>
        }
      />
      {lab.brief ? <p className="max-w-prose whitespace-pre-wrap">{lab.brief}</p> : null}
      <Panel title="Workbench">
        <LabWorkbench
          key={copy ? `${copy.benchId}-${copy.revisionNumber}` : "none"}
          assignmentId={assignment.id}
          copy={copy}
          canWork={assignmentCan(session, assignment).run}
        />
      </Panel>
      <Panel title="Attempts">
        {attempts.length === 0 ? (
          <p className="text-sm text-ink-soft">Nothing submitted yet.</p>
        ) : (
          <ol className="flex flex-col gap-4" aria-label="Attempts">
            {attempts.map((a, index) => {
              const result = parseStoredResult(a.runResults);
              return (
                <li
                  key={a.attempt.id}
                  className="flex flex-col gap-2"
                  aria-label={`Attempt ${attempts.length - index}`}
                >
                  <span className="flex flex-wrap items-center gap-2 text-sm">
                    <span className="font-medium">Attempt {attempts.length - index}</span>
                    <VerdictBadge verdict={a.runVerdict} status={a.runStatus ?? undefined} />
                    <span className="text-ink-soft">
                      <Timestamp value={a.attempt.submittedAt} relative />, revision{" "}
                      {a.revisionNumber}
                      {a.runStatus === "finished"
                        ? `, ${a.stepsPassed} of ${a.stepsTotal} steps passed`
                        : ""}
                    </span>
                    {a.attempt.runId ? (
                      <Link
                        href={`/runs/${a.attempt.runId}`}
                        className="text-copper-deep underline"
                      >
                        report
                      </Link>
                    ) : null}
                    {a.attempt.runId && (a.runStatus === "queued" || a.runStatus === "running") ? (
                      <RefreshWhenFinished runId={a.attempt.runId} />
                    ) : null}
                  </span>
                  {result ? <AttemptChecks result={result} /> : null}
                </li>
              );
            })}
          </ol>
        )}
      </Panel>
    </div>
  );
}
