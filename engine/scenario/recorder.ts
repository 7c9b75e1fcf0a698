import { formatDuration } from "./duration";
import type { BenchReference, ScenarioDocument, Step } from "./scenario-schema";

/**
 * The recorder: a person pokes the bench from the live console, and what they
 * did, with what the bus showed in reply, becomes a scenario draft that replays
 * the same actions and expects the same replies. The draft is a starting point
 * to edit (tighten windows, drop incidental telegrams), not a verdict.
 */

/** Something a person did from the live console, at a virtual time (integer µs since the run started). */
export type ConsoleAction =
  | {
      readonly kind: "write";
      readonly atUs: number;
      readonly groupAddress: string;
      readonly value: unknown;
      readonly from?: string;
    }
  | {
      readonly kind: "read";
      readonly atUs: number;
      readonly groupAddress: string;
      readonly from?: string;
    }
  | {
      readonly kind: "press";
      readonly atUs: number;
      readonly device: string;
      readonly button: string;
      readonly action?: "press" | "release" | "long-press";
    }
  | {
      readonly kind: "set-input";
      readonly atUs: number;
      readonly device: string;
      readonly input: string;
      readonly value: unknown;
    }
  | {
      readonly kind: "set-parameter";
      readonly atUs: number;
      readonly device: string;
      readonly parameter: string;
      readonly value: unknown;
    }
  | {
      readonly kind: "inject-fault" | "clear-fault";
      readonly atUs: number;
      readonly device: string;
      readonly fault: string;
    };

/** A telegram seen on the bus after an action and before the next one. */
export interface ObservedTelegram {
  readonly atUs: number;
  readonly groupAddress: string;
  readonly service: "write" | "response" | "read";
  /** Decoded value; absent for a read. */
  readonly value?: unknown;
  /** Sending device id; absent when the test tool (the console itself) sent it. */
  readonly device?: string;
}

export interface RecordedAction {
  readonly action: ConsoleAction;
  readonly observed: readonly ObservedTelegram[];
}

export interface RecordOptions {
  readonly name: string;
  readonly description?: string;
  readonly bench: BenchReference;
  readonly seed?: number;
  /** Virtual time the console ran before the first action; becomes the scenario's settle time. */
  readonly settleUs?: number;
}

// Windows are rounded up to one of these, so drafts read like something a person wrote.
const NICE_WINDOWS_US = [
  100_000, 200_000, 500_000, 1_000_000, 2_000_000, 5_000_000, 10_000_000, 30_000_000, 60_000_000,
  120_000_000, 300_000_000, 600_000_000, 1_800_000_000, 3_600_000_000,
];

/** A window for a reply seen `delayUs` after its action: half as long again, rounded up to a readable duration, at least 500ms. */
export function replyWindowUs(delayUs: number): number {
  const wanted = Math.max(500_000, Math.ceil(delayUs * 1.5));
  return (
    NICE_WINDOWS_US.find((window) => window >= wanted) ??
    Math.ceil(wanted / 60_000_000) * 60_000_000
  );
}

function actionStep(action: ConsoleAction): Step {
  switch (action.kind) {
    case "write":
      return {
        kind: "write",
        groupAddress: action.groupAddress,
        value: action.value as never,
        ...(action.from ? { from: action.from } : {}),
      };
    case "read":
      return {
        kind: "read",
        groupAddress: action.groupAddress,
        ...(action.from ? { from: action.from } : {}),
      };
    case "press":
      return {
        kind: "press",
        device: action.device,
        button: action.button,
        ...(action.action ? { action: action.action } : {}),
      };
    case "set-input":
      return {
        kind: "set-input",
        device: action.device,
        input: action.input,
        value: action.value as never,
      };
    case "set-parameter":
      return {
        kind: "set-parameter",
        device: action.device,
        parameter: action.parameter,
        value: action.value as never,
      };
    case "inject-fault":
    case "clear-fault":
      return { kind: action.kind, device: action.device, fault: action.fault };
  }
}

/**
 * Expectations for what followed an action: the first reply from a device on
 * each address (a write or a response) with the value it carried. The test
 * tool's own telegrams are the action itself and are left out; reads are
 * requests, not replies.
 */
function expectationSteps(recorded: RecordedAction): Step[] {
  const seen = new Set<string>();
  const steps: Step[] = [];
  for (const telegram of recorded.observed) {
    if (telegram.device === undefined || telegram.service === "read") continue;
    const key = `${telegram.groupAddress}#${telegram.service}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const within = formatDuration(replyWindowUs(Math.max(0, telegram.atUs - recorded.action.atUs)));
    steps.push(
      telegram.service === "response"
        ? {
            kind: "expect-response",
            groupAddress: telegram.groupAddress,
            value: telegram.value as never,
            within,
          }
        : {
            kind: "expect-value",
            groupAddress: telegram.groupAddress,
            value: telegram.value as never,
            within,
          },
    );
  }
  return steps;
}

/** Turns recorded console actions, in time order, into a scenario draft. */
export function recordScenario(
  actions: readonly RecordedAction[],
  options: RecordOptions,
): ScenarioDocument {
  const steps: Step[] = [];
  const ordered = [...actions].sort((a, b) => a.action.atUs - b.action.atUs);
  const settleUs = options.settleUs ?? ordered[0]?.action.atUs ?? 0;
  let previousUs = settleUs;
  for (const recorded of ordered) {
    // A wait counts from the previous action (the anchor), whatever the expectations in between ran.
    const gapUs = recorded.action.atUs - previousUs;
    if (gapUs > 0) steps.push({ kind: "wait", for: formatDuration(gapUs) });
    previousUs = recorded.action.atUs;
    steps.push(actionStep(recorded.action));
    steps.push(...expectationSteps(recorded));
  }
  return {
    format: 1,
    name: options.name,
    ...(options.description ? { description: options.description } : {}),
    bench: options.bench,
    seed: options.seed ?? 1,
    settle: formatDuration(settleUs),
    steps,
  };
}
