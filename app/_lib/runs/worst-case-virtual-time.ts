import { parseDuration } from "@/engine";
import type { Scenario, Step } from "@/engine";

function us(text: string): number {
  const parsed = parseDuration(text);
  // The scenario schema has checked every duration; a bad one here is a bug.
  if (!parsed.ok) throw new Error(`unchecked duration ${text}`);
  return parsed.value;
}

/** The window an expectation may wait through, from the anchor; 0 for an instant check. */
function expectationWindowUs(step: Extract<Step, { kind: `expect-${string}` }>): number {
  switch (step.kind) {
    case "expect-value":
    case "expect-response":
    case "expect-count":
      return us(step.within);
    case "expect-state":
      return step.within === undefined ? 0 : us(step.within);
    case "expect-bus-load":
      return us(step.over);
    case "expect-silence":
      return us(step.for);
  }
}

/**
 * The furthest virtual time a scenario can reach, in microseconds, when no
 * expectation is ever met early: the server's virtual-time cap is checked
 * against this before a replay starts, so a run over the cap costs nothing.
 *
 * It follows the anchor rule of the scenario document (engine/scenario/
 * scenario-schema.ts): the bench settles first; actions happen at the current
 * time and move the anchor there; `wait` moves the anchor to anchor + for;
 * expectations wait at most their window from the anchor and never move it.
 */
export function worstCaseVirtualTimeUs(scenario: Scenario): number {
  let nowUs = us(scenario.settle);
  let anchorUs = nowUs;
  for (const step of scenario.steps) {
    switch (step.kind) {
      case "write":
      case "read":
      case "press":
      case "set-input":
      case "set-parameter":
      case "inject-fault":
      case "clear-fault":
        anchorUs = nowUs;
        break;
      case "wait":
        anchorUs += us(step.for);
        nowUs = Math.max(nowUs, anchorUs);
        break;
      default:
        nowUs = Math.max(nowUs, anchorUs + expectationWindowUs(step));
    }
  }
  return nowUs;
}
