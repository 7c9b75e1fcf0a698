import type { ScenarioResult } from "@/engine";
import { Mono } from "@/components/ui/mono";
import { StepStatusBadge, VerdictBadge } from "./verdict-badge";
import { Timestamp } from "@/components/ui/timestamp";

export interface DiffSide {
  readonly id: string;
  readonly title: string;
  readonly benchName: string;
  readonly revisionNumber: number;
  readonly seed: number;
  readonly createdAt: string;
  readonly verdict: "pass" | "fail" | "error" | null;
  readonly result: ScenarioResult | null;
}

/**
 * Two runs of one scenario side by side, step by step: what changed between
 * them (status, expected, actual) is marked; what did not is shown quietly.
 */
export function RunDiff({ a, b }: { a: DiffSide; b: DiffSide }) {
  const steps = Math.max(a.result?.steps.length ?? 0, b.result?.steps.length ?? 0);
  const rows = Array.from({ length: steps }, (_, index) => {
    const left = a.result?.steps[index];
    const right = b.result?.steps[index];
    const changed =
      left?.status !== right?.status ||
      left?.label !== right?.label ||
      left?.actual !== right?.actual ||
      left?.expected !== right?.expected;
    return { index, left, right, changed };
  });
  const changedCount = rows.filter((row) => row.changed).length;
  const sameInputs =
    a.revisionNumber === b.revisionNumber && a.seed === b.seed && a.benchName === b.benchName;

  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-4 sm:grid-cols-2">
        {[a, b].map((side, position) => (
          <div key={side.id} className="rounded-md border border-paper-line p-3 text-sm">
            <p className="text-xs uppercase tracking-wide text-ink-soft">
              {position === 0 ? "Run A" : "Run B"}
            </p>
            <p className="font-medium">{side.title}</p>
            <p className="text-ink-soft">
              {side.benchName} rev. {side.revisionNumber}, seed <Mono>{side.seed}</Mono>,{" "}
              <Timestamp value={side.createdAt} />
            </p>
            <div className="mt-1">
              <VerdictBadge verdict={side.verdict} outcome={side.result?.outcome} />
            </div>
          </div>
        ))}
      </div>
      <p className="text-sm" role="status">
        {changedCount === 0
          ? "The two runs agree on every step."
          : `${changedCount} of ${steps} steps differ.`}
        {sameInputs ? " Same revision and seed." : " The revision or seed differs."}
      </p>
      <table className="w-full text-left text-sm" aria-label="Step differences">
        <thead>
          <tr className="border-b border-paper-line text-ink-soft">
            <th className="py-2 pr-3 font-medium">#</th>
            <th className="py-2 pr-3 font-medium">Step</th>
            <th className="py-2 pr-3 font-medium">Run A</th>
            <th className="py-2 font-medium">Run B</th>
          </tr>
        </thead>
        <tbody>
          {rows.map(({ index, left, right, changed }) => (
            <tr
              key={index}
              className={
                changed
                  ? "border-b border-paper-line/60 bg-copper/10"
                  : "border-b border-paper-line/60 text-ink-soft"
              }
              data-changed={changed}
            >
              <td className="py-2 pr-3 align-top">{index + 1}</td>
              <td className="py-2 pr-3 align-top">
                <Mono>{left?.label ?? right?.label ?? ""}</Mono>
              </td>
              {[left, right].map((step, side) => (
                <td key={side} className="py-2 pr-3 align-top">
                  {step ? (
                    <div className="flex flex-col gap-1">
                      <StepStatusBadge status={step.status} />
                      {step.status === "fail" ? (
                        <span className="text-xs">
                          expected <Mono>{step.expected}</Mono>, got <Mono>{step.actual}</Mono>
                        </span>
                      ) : null}
                      {step.message ? (
                        <span className="text-xs text-fault">{step.message}</span>
                      ) : null}
                    </div>
                  ) : (
                    <span className="text-ink-soft">no such step</span>
                  )}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
