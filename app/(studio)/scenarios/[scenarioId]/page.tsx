import type { Metadata } from "next";
import Link from "next/link";
import { requireCapability } from "@/app/_lib/dal";
import { orNotFound } from "@/app/_lib/policy/for-page";
import { ownRunsFilter } from "@/app/_lib/policy/run";
import { loadScenario, scenarioCan } from "@/app/_lib/policy/scenario";
import { listRunHistory } from "@/db/queries/runs";
import { VerdictBadge } from "@/components/runs/verdict-badge";
import { ScenarioEditor } from "@/components/scenario-editor/scenario-editor";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { editorBench } from "../bench-facts";
import { Timestamp } from "@/components/ui/timestamp";

export const metadata: Metadata = { title: "Scenario" };

export default async function ScenarioPage({
  params,
}: {
  params: Promise<{ scenarioId: string }>;
}) {
  const { scenarioId } = await params;
  const session = await requireCapability("scenarios.read");
  const { scenario, bench } = orNotFound(() => loadScenario(session, scenarioId));
  const allowed = scenarioCan(session, scenario, bench);
  let document: unknown = null;
  try {
    document = JSON.parse(scenario.document);
  } catch {
    document = null;
  }
  const startedBy = ownRunsFilter(session);
  const history = listRunHistory({
    workspaceId: session.workspaceId,
    scenarioId: scenario.id,
    limit: 10,
    ...(startedBy ? { startedBy } : {}),
  });
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title={scenario.name}
        lead={
          <>
            On <span className="font-medium">{bench.name}</span>.{" "}
            <Link href="/scenarios" className="text-copper-deep underline">
              All scenarios
            </Link>
          </>
        }
      />
      <ScenarioEditor
        scenarioId={scenario.id}
        initialDocument={document}
        bench={editorBench(bench)}
        canEdit={allowed.edit}
        canRun={allowed.run}
      />
      <Panel title="Recent runs">
        {history.length === 0 ? (
          <p className="text-sm text-ink-soft">Not run yet.</p>
        ) : (
          <ul className="flex flex-col gap-2 text-sm">
            {history.map((run) => (
              <li key={run.id} className="flex flex-wrap items-center gap-3">
                <VerdictBadge verdict={run.verdict} status={run.status} />
                <Link href={`/runs/${run.id}`} className="text-copper-deep underline">
                  <Timestamp value={run.createdAt} relative />
                </Link>
                <span className="text-ink-soft">
                  rev. {run.revisionNumber}, seed {run.seed}, {run.startedByName ?? "former member"}
                </span>
              </li>
            ))}
          </ul>
        )}
      </Panel>
    </div>
  );
}
