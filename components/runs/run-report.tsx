import type { ScenarioResult } from "@/engine";
import { formatVirtualTime } from "@/engine";
import { formatDuration } from "@/engine";
import { Mono } from "@/components/ui/mono";
import { SimulatorCaution } from "./simulator-caution";
import { type AddressInfo, TraceView } from "./trace-view";
import { StepStatusBadge, VerdictBadge } from "./verdict-badge";
import { Timestamp } from "@/components/ui/timestamp";

export interface RunReportFacts {
  readonly runId: string;
  readonly scenarioName: string;
  readonly benchName: string;
  readonly revisionNumber: number;
  readonly seed: number;
  readonly startedByName: string | null;
  /** ISO time the run was created. */
  readonly createdAt: string;
  readonly durationMs: number | null;
  readonly status: "queued" | "running" | "finished" | "errored";
  readonly verdict: "pass" | "fail" | "error" | null;
  readonly errorMessage: string | null;
}

function Fact({ term, children }: { term: string; children: React.ReactNode }) {
  return (
    <div className="flex flex-col">
      <dt className="text-xs uppercase tracking-wide text-ink-soft">{term}</dt>
      <dd className="font-medium">{children}</dd>
    </div>
  );
}

/**
 * A run report: what ran (bench, revision, scenario, seed, who, when), the
 * verdict, each step with expected and actual, the telegrams behind each
 * failure, and the simulator caution. Plain markup that prints on paper.
 */
export function RunReport({
  facts,
  result,
  addresses,
  lines = {},
}: {
  facts: RunReportFacts;
  result: ScenarioResult | null;
  addresses: Readonly<Record<number, AddressInfo>>;
  /** Line address by line id, to name each telegram's line on a bench with several. */
  lines?: Readonly<Record<string, string>>;
}) {
  return (
    <article className="flex flex-col gap-6" aria-label="Run report">
      <header className="flex flex-col gap-3 border-b border-paper-line pb-4">
        <p className="text-xs uppercase tracking-wide text-ink-soft">Benchline run report</p>
        <h1 className="text-2xl font-semibold tracking-tight">{facts.scenarioName}</h1>
        <div className="flex items-center gap-2">
          <VerdictBadge verdict={facts.verdict} outcome={result?.outcome} status={facts.status} />
          {result ? (
            <span className="text-sm text-ink-soft">
              {result.totals.pass} of {result.steps.length} steps passed
              {result.totals.fail ? `, ${result.totals.fail} failed` : ""}
              {result.totals.error ? `, ${result.totals.error} could not run` : ""}
              {result.totals.skipped ? `, ${result.totals.skipped} skipped` : ""}
            </span>
          ) : null}
        </div>
        <dl className="grid grid-cols-2 gap-3 text-sm sm:grid-cols-3">
          <Fact term="Bench">{facts.benchName}</Fact>
          <Fact term="Revision">{facts.revisionNumber}</Fact>
          <Fact term="Seed">
            <Mono>{facts.seed}</Mono>
          </Fact>
          <Fact term="Run by">{facts.startedByName ?? "former member"}</Fact>
          <Fact term="When">
            <Timestamp value={facts.createdAt} relative />
          </Fact>
          <Fact term="Duration">
            {facts.durationMs === null ? "—" : `${facts.durationMs} ms`}
            {result ? ` (${formatDuration(result.virtualTimeUs)} simulated)` : ""}
          </Fact>
        </dl>
        {result?.expectedToFail ? (
          <p className="text-sm text-ink-soft">
            This scenario is marked as expected to fail (a fault-finding exercise): it counts as
            passing when an expectation fails.
          </p>
        ) : null}
      </header>

      {facts.errorMessage || result?.message ? (
        <p role="alert" className="rounded-md bg-fault-soft p-3 text-sm text-fault">
          {facts.errorMessage ?? result?.message}
        </p>
      ) : null}

      {result ? (
        <section aria-label="Steps" className="flex flex-col gap-3">
          <h2 className="text-lg font-semibold">Steps</h2>
          <ol className="flex flex-col gap-3">
            {result.steps.map((step) => (
              <li
                key={step.index}
                className="break-inside-avoid rounded-md border border-paper-line bg-white/40 p-3"
                data-step-status={step.status}
              >
                <div className="flex flex-wrap items-center justify-between gap-2">
                  <span className="text-sm">
                    <span className="text-ink-soft">#{step.index + 1}</span>{" "}
                    <Mono>{step.label}</Mono>
                  </span>
                  <span className="flex items-center gap-2">
                    <span className="text-xs text-ink-soft">
                      <Mono>{formatVirtualTime(step.startUs)}</Mono>
                    </span>
                    <StepStatusBadge status={step.status} />
                  </span>
                </div>
                {step.status === "fail" ? (
                  <dl className="mt-2 grid gap-1 text-sm sm:grid-cols-[6rem_1fr]">
                    <dt className="text-ink-soft">expected</dt>
                    <dd>
                      <Mono>{step.expected}</Mono>
                    </dd>
                    <dt className="text-ink-soft">actual</dt>
                    <dd>
                      <Mono>{step.actual}</Mono>
                    </dd>
                  </dl>
                ) : null}
                {step.message ? <p className="mt-2 text-sm text-fault">{step.message}</p> : null}
                {(step.status === "fail" || step.status === "error") && step.trace.length > 0 ? (
                  <div className="mt-3">
                    <TraceView
                      trace={step.trace}
                      addresses={addresses}
                      lines={lines}
                      caption={`Telegrams behind step ${step.index + 1}`}
                    />
                  </div>
                ) : null}
              </li>
            ))}
          </ol>
        </section>
      ) : facts.status === "queued" || facts.status === "running" ? (
        <p className="text-sm text-ink-soft">The run has not finished yet.</p>
      ) : null}

      <SimulatorCaution />
    </article>
  );
}
