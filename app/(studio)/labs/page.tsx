import type { Metadata } from "next";
import Link from "next/link";
import { requireCapability } from "@/app/_lib/dal";
import { listReadableBenches } from "@/app/_lib/policy/bench";
import { mayMakeLabFrom } from "@/app/_lib/policy/lab";
import type { Who } from "@/app/_lib/policy/policy";
import { latestRevision } from "@/db/queries/benches";
import { listAssignmentsOf, listAttempts, listLabs } from "@/db/queries/labs";
import { listScenarios } from "@/db/queries/scenarios";
import { type LabBenchChoice, NewLabForm } from "@/components/labs/new-lab-form";
import { VerdictBadge } from "@/components/runs/verdict-badge";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { Timestamp } from "@/components/ui/timestamp";

export const metadata: Metadata = { title: "Labs" };

/**
 * Benches a lab can be made from: shared ones and the trainer's own private
 * benches (a private lab bench keeps the fault-free original from apprentices).
 */
function labBenches(who: Who): LabBenchChoice[] {
  const scenarios = listScenarios({ workspaceId: who.workspaceId });
  return listReadableBenches(who)
    .filter((bench) => mayMakeLabFrom(who, bench))
    .map((bench) => {
      const revision = latestRevision({ benchId: bench.id });
      let document: {
        groupAddresses?: { address: string; name: string; dpt: string }[];
        devices?: { id: string; name: string; type?: string; individualAddress?: string }[];
        links?: { device: string; object: number; groupAddress: string }[];
      } = {};
      try {
        document = revision ? JSON.parse(revision.document) : {};
      } catch {
        document = {};
      }
      const names = new Map((document.devices ?? []).map((d) => [d.id, d.name]));
      return {
        id: bench.id,
        name: bench.name,
        scenarios: scenarios
          .filter((s) => s.benchId === bench.id)
          .map(({ id, name }) => ({ id, name })),
        groupAddresses: (document.groupAddresses ?? []).map(({ address, name, dpt }) => ({
          address,
          name,
          dpt,
        })),
        links: (document.links ?? []).map((l) => ({
          ...l,
          deviceName: names.get(l.device) ?? l.device,
        })),
        couplers: (document.devices ?? [])
          .filter((d) => d.type === "coupler")
          .map((d) => ({ id: d.id, name: d.name, address: d.individualAddress ?? "" })),
      };
    });
}

export default async function LabsPage() {
  const session = await requireCapability("labs.read");
  if (session.scope !== "workspace") {
    const assignments = listAssignmentsOf({
      workspaceId: session.workspaceId,
      apprenticeId: session.userId,
    });
    const attempts = listAttempts({ assignmentIds: assignments.map((a) => a.assignment.id) });
    return (
      <div className="mx-auto flex max-w-4xl flex-col gap-6 px-6 py-8 md:px-10">
        <PageHeader
          title="Labs"
          lead="Labs your trainer assigned to you. Find the fault, fix it on your copy, submit."
        />
        {assignments.length === 0 ? (
          <p className="text-ink-soft">No labs assigned to you yet.</p>
        ) : null}
        <ul className="flex flex-col gap-3">
          {assignments.map(({ assignment, lab }) => {
            const last = attempts.find((a) => a.attempt.assignmentId === assignment.id);
            return (
              <li
                key={assignment.id}
                className="flex flex-wrap items-center justify-between gap-3 rounded-md border border-paper-line p-3"
              >
                <span>
                  <Link
                    href={`/labs/assignments/${assignment.id}`}
                    className="font-medium text-copper-deep underline"
                  >
                    {lab.title}
                  </Link>
                  {/* The bench the lab was made from is not named to apprentices. */}
                  <span className="block text-sm text-ink-soft">
                    {assignment.dueAt ? (
                      <>
                        due <Timestamp value={assignment.dueAt} dateOnly relative />
                      </>
                    ) : (
                      "no due date"
                    )}
                  </span>
                </span>
                {last ? (
                  <VerdictBadge verdict={last.runVerdict} status={last.runStatus ?? undefined} />
                ) : (
                  <span className="text-sm text-ink-soft">not submitted</span>
                )}
              </li>
            );
          })}
        </ul>
      </div>
    );
  }

  const labs = listLabs({ workspaceId: session.workspaceId });
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title="Labs"
        lead="Training benches with faults to find, assigned to apprentices and graded by a scenario."
      />
      <Panel title="Labs">
        {labs.length === 0 ? (
          <p className="text-sm text-ink-soft">No labs yet.</p>
        ) : (
          <ul className="flex flex-col gap-2">
            {labs.map(({ lab, benchName, gradingScenarioName }) => (
              <li key={lab.id} className="text-sm">
                <Link href={`/labs/${lab.id}`} className="font-medium text-copper-deep underline">
                  {lab.title}
                </Link>{" "}
                <span className="text-ink-soft">
                  on {benchName}, graded by “{gradingScenarioName}”
                </span>
              </li>
            ))}
          </ul>
        )}
      </Panel>
      <Panel title="New lab">
        <NewLabForm benches={labBenches(session)} />
      </Panel>
    </div>
  );
}
