import type { Metadata } from "next";
import Link from "next/link";
import { requireCapability } from "@/app/_lib/dal";
import { orNotFound } from "@/app/_lib/policy/for-page";
import { loadLab } from "@/app/_lib/policy/lab";
import { parseHiddenFaults } from "@/app/_lib/labs/hidden-faults";
import { parseStoredResult } from "@/app/_lib/runs/stored-result";
import { listAttempts, listLabAssignments } from "@/db/queries/labs";
import { listMembers } from "@/db/queries/memberships";
import { AssignLabForm } from "@/components/labs/assign-lab-form";
import { AttemptChecks } from "@/components/labs/attempt-checks";
import { VerdictBadge } from "@/components/runs/verdict-badge";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { Timestamp } from "@/components/ui/timestamp";

export const metadata: Metadata = { title: "Lab" };

/** A lab for its trainer: the set-up, assigning, and every attempt of every apprentice. */
export default async function LabPage({ params }: { params: Promise<{ labId: string }> }) {
  const { labId } = await params;
  const session = await requireCapability("labs.manage");
  const found = orNotFound(() => loadLab(session, labId));
  const { lab } = found;
  const assignments = listLabAssignments({ labId: lab.id });
  const attempts = listAttempts({ assignmentIds: assignments.map((a) => a.assignment.id) });
  const apprentices = listMembers({ workspaceId: session.workspaceId })
    .filter(({ membership }) => membership.role === "apprentice")
    .map(({ user }) => ({
      id: user.id,
      name: user.name,
      email: user.email,
      assigned: assignments.some((a) => a.assignment.apprenticeId === user.id),
    }));
  const faults = parseHiddenFaults(lab.hiddenFaults);
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title={lab.title}
        lead={`On ${found.benchName}, graded by “${found.gradingScenarioName}”.`}
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
      <Panel title="Hidden faults">
        {faults.length === 0 ? (
          <p className="text-sm text-ink-soft">None: apprentices get the bench as it is.</p>
        ) : (
          <ul className="list-disc pl-5 text-sm">
            {faults.map((fault, index) => (
              <li key={index}>
                {fault.kind === "relink"
                  ? `${fault.device} object ${fault.object}: ${fault.from} moved to ${fault.to}`
                  : fault.kind === "unlink"
                    ? `${fault.device} object ${fault.object}: link to ${fault.groupAddress} removed`
                    : fault.kind === "stale-filter-table"
                      ? `${fault.coupler}: ${fault.groupAddress} left out of its filter table`
                      : `${fault.device}: ${fault.parameter} set to ${JSON.stringify(fault.value)}`}
              </li>
            ))}
          </ul>
        )}
      </Panel>
      <Panel title="Assign">
        <AssignLabForm labId={lab.id} apprentices={apprentices} />
      </Panel>
      <Panel title="Attempts">
        {assignments.length === 0 ? (
          <p className="text-sm text-ink-soft">Not assigned yet.</p>
        ) : (
          <ul className="flex flex-col gap-4">
            {assignments.map(({ assignment, apprenticeName }) => {
              const own = attempts.filter((a) => a.attempt.assignmentId === assignment.id);
              return (
                <li
                  key={assignment.id}
                  aria-label={`Attempts of ${apprenticeName}`}
                  className="flex flex-col gap-2"
                >
                  <p className="text-sm">
                    <Link
                      href={`/labs/assignments/${assignment.id}`}
                      className="font-medium text-copper-deep underline"
                    >
                      {apprenticeName}
                    </Link>{" "}
                    <span className="text-ink-soft">
                      {assignment.dueAt ? (
                        <>
                          due <Timestamp value={assignment.dueAt} dateOnly relative />,{" "}
                        </>
                      ) : null}
                      {own.length} attempt{own.length === 1 ? "" : "s"}
                    </span>
                  </p>
                  {own.map((a) => {
                    const result = parseStoredResult(a.runResults);
                    return (
                      <div
                        key={a.attempt.id}
                        className="ml-4 flex flex-col gap-1 border-l-2 border-paper-line pl-3"
                      >
                        <span className="flex flex-wrap items-center gap-2 text-sm">
                          <VerdictBadge verdict={a.runVerdict} status={a.runStatus ?? undefined} />
                          <Timestamp value={a.attempt.submittedAt} relative />, revision{" "}
                          {a.revisionNumber}
                          {a.attempt.runId ? (
                            <Link
                              href={`/runs/${a.attempt.runId}`}
                              className="text-copper-deep underline"
                            >
                              report
                            </Link>
                          ) : null}
                        </span>
                        {result ? <AttemptChecks result={result} /> : null}
                      </div>
                    );
                  })}
                </li>
              );
            })}
          </ul>
        )}
      </Panel>
    </div>
  );
}
