import { StatusBadge, type StatusTone } from "@/components/ui/status-badge";

type Verdict = "pass" | "fail" | "error" | null;
type Outcome = "passed" | "failed" | "expected-failure" | "unexpected-pass" | "error";

const verdictText: Record<Exclude<Verdict, null>, [string, StatusTone]> = {
  pass: ["passed", "healthy"],
  fail: ["failed", "fault"],
  error: ["could not run", "fault"],
};

const outcomeText: Record<Outcome, [string, StatusTone]> = {
  passed: ["passed", "healthy"],
  failed: ["failed", "fault"],
  "expected-failure": ["failed as expected", "healthy"],
  "unexpected-pass": ["passed unexpectedly", "fault"],
  error: ["could not run", "fault"],
};

/** A run's verdict (or, more precisely, its outcome) in words and the house colours. */
export function VerdictBadge({
  verdict,
  outcome,
  status,
}: {
  verdict: Verdict;
  outcome?: Outcome;
  status?: "queued" | "running" | "finished" | "errored";
}) {
  if (status === "queued" || status === "running") {
    return <StatusBadge tone="accent">{status}</StatusBadge>;
  }
  const [text, tone] = outcome
    ? outcomeText[outcome]
    : verdict
      ? verdictText[verdict]
      : (["not run", "neutral"] as [string, StatusTone]);
  return <StatusBadge tone={tone}>{text}</StatusBadge>;
}

const stepText: Record<string, [string, StatusTone]> = {
  pass: ["pass", "healthy"],
  fail: ["fail", "fault"],
  error: ["error", "fault"],
  skipped: ["skipped", "neutral"],
};

export function StepStatusBadge({ status }: { status: string }) {
  const [text, tone] = stepText[status] ?? [status, "neutral"];
  return <StatusBadge tone={tone}>{text}</StatusBadge>;
}
