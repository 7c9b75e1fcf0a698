import type { Metadata } from "next";
import Link from "next/link";
import { requireCapability } from "@/app/_lib/dal";
import { listReadableBenches } from "@/app/_lib/policy/bench";
import { ownRunsFilter } from "@/app/_lib/policy/run";
import { listReadableScenarios, mayAddScenarioTo } from "@/app/_lib/policy/scenario";
import { listReadableSuites, suiteCan } from "@/app/_lib/policy/suite";
import { latestRunsByScenario } from "@/db/queries/runs";
import { RunButton } from "@/components/runs/run-button";
import { VerdictBadge } from "@/components/runs/verdict-badge";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { Timestamp } from "@/components/ui/timestamp";

export const metadata: Metadata = { title: "Scenarios" };

function stepCount(document: string): number | null {
  try {
    const steps = (JSON.parse(document) as { steps?: unknown }).steps;
    return Array.isArray(steps) ? steps.length : null;
  } catch {
    return null;
  }
}

/** Scenarios per bench with each one's last result, and the workspace's suites. */
export default async function ScenariosPage() {
  const session = await requireCapability("scenarios.read");
  // Other members' private copies (which lab managers may read) stay on their pages, not here.
  const benches = listReadableBenches(session).filter(
    (bench) => bench.privateOwnerId === null || bench.privateOwnerId === session.userId,
  );
  const scenarios = listReadableScenarios(session);
  const startedBy = ownRunsFilter(session);
  const latest = latestRunsByScenario({
    workspaceId: session.workspaceId,
    scenarioIds: scenarios.map((s) => s.id),
    ...(startedBy ? { startedBy } : {}),
  });
  const suites = listReadableSuites(session);

  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title="Scenarios"
        lead="Telegram sequences in virtual time with the status feedback they expect, per bench."
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
                <span className="font-medium">{suite.name}</span>
                {suiteCan(session, suite).run ? (
                  <RunButton target={{ suiteId: suite.id }} label="Run suite" />
                ) : null}
              </li>
            ))}
          </ul>
        </Panel>
      ) : null}
      {benches.length === 0 ? (
        <p className="text-ink-soft">No benches in this workspace yet.</p>
      ) : null}
      {benches.map((bench) => {
        const ofBench = scenarios.filter((s) => s.benchId === bench.id);
        return (
          <section
            key={bench.id}
            aria-label={`Scenarios on ${bench.name}`}
            className="flex flex-col gap-3"
          >
            <div className="flex flex-wrap items-center justify-between gap-3">
              <h2 className="text-lg font-semibold">{bench.name}</h2>
              {mayAddScenarioTo(session, bench) ? (
                <Link
                  href={`/scenarios/new?benchId=${bench.id}`}
                  className="rounded-md border border-paper-line px-3 py-1.5 text-sm hover:bg-paper-deep"
                >
                  New scenario
                </Link>
              ) : null}
            </div>
            {ofBench.length === 0 ? (
              <p className="text-sm text-ink-soft">No scenarios on this bench yet.</p>
            ) : (
              <table className="w-full text-left text-sm">
                <thead>
                  <tr className="border-b border-paper-line text-ink-soft">
                    <th className="py-2 pr-3 font-medium">Scenario</th>
                    <th className="py-2 pr-3 font-medium">Steps</th>
                    <th className="py-2 font-medium">Last result</th>
                  </tr>
                </thead>
                <tbody>
                  {ofBench.map((scenario) => {
                    const last = latest.get(scenario.id);
                    return (
                      <tr key={scenario.id} className="border-b border-paper-line/60">
                        <td className="py-2 pr-3">
                          <Link
                            href={`/scenarios/${scenario.id}`}
                            className="text-copper-deep underline"
                          >
                            {scenario.name}
                          </Link>
                        </td>
                        <td className="py-2 pr-3">{stepCount(scenario.document) ?? "—"}</td>
                        <td className="py-2">
                          {last ? (
                            <span className="flex flex-wrap items-center gap-2">
                              <VerdictBadge verdict={last.verdict} status={last.status} />
                              <Link
                                href={`/runs/${last.id}`}
                                className="text-xs text-ink-soft underline"
                              >
                                <Timestamp value={last.createdAt} relative />
                              </Link>
                            </span>
                          ) : (
                            <span className="text-ink-soft">not run</span>
                          )}
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            )}
          </section>
        );
      })}
    </div>
  );
}
