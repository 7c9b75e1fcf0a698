import type { ScenarioResult } from "@/engine";
import { Mono } from "@/components/ui/mono";
import { StepStatusBadge } from "@/components/runs/verdict-badge";

/** Which checks of the grading scenario passed: the expectations only, with expected and actual. */
export function AttemptChecks({ result }: { result: ScenarioResult }) {
  const checks = result.steps.filter(
    (step) => step.kind.startsWith("expect-") || step.status !== "pass",
  );
  return (
    <ul className="flex flex-col gap-1 text-sm" aria-label="Checks">
      {checks.map((step) => (
        <li
          key={step.index}
          className="flex flex-wrap items-center gap-2"
          data-check-status={step.status}
        >
          <StepStatusBadge status={step.status} />
          <Mono>{step.label}</Mono>
          {step.status === "fail" ? (
            <span className="text-xs text-ink-soft">
              expected <Mono>{step.expected}</Mono>, got <Mono>{step.actual}</Mono>
            </span>
          ) : null}
          {step.message ? <span className="text-xs text-fault">{step.message}</span> : null}
        </li>
      ))}
    </ul>
  );
}
