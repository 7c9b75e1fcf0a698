import { formatGroupAddress } from "../address";
import type { TraceEvent } from "../core/trace";
import { getDpt } from "../dpt";
import { fromHex } from "../frame";
import type { SimInput } from "../sim/sim-input";
import { formatDuration } from "./duration";
import type { BenchReference, ScenarioDocument, Step } from "./scenario-schema";

/**
 * The recorder: a person pokes the bench from the live console, and what they
 * did, with what the bus showed in reply, becomes a scenario draft that replays
 * the same actions and expects the same replies. The draft is a starting point
 * to edit (tighten windows, drop incidental telegrams), not a verdict.
 */

/**
 * Something a person did from the live console, at a virtual time (integer µs
 * since the run started): the simulation input as the trace's `user.action`
 * carries it, group address as text.
 */
export type ConsoleAction = SimInput & { readonly atUs: number };

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

/** The scenario step replaying an action; undefined for inputs a scenario has no step for (a response, a whole parameter set). */
function actionStep(action: ConsoleAction): Step | undefined {
  const { atUs, ...input } = action;
  void atUs; // the step happens at the anchor; its time is the wait before it
  switch (input.kind) {
    case "write":
    case "read":
      // Documents carry text addresses; the trace already gives text.
      return { ...input, groupAddress: String(input.groupAddress) } as Step;
    case "response":
    case "set-parameters":
      return undefined;
    default:
      return input;
  }
}

/**
 * Records from a run's trace: every `user.action` starts an action (its input
 * is the action), and every first transmission after it is observed, decoded
 * with its address's DPT. Feed it the events of the recording window in order.
 */
export class TraceRecorder {
  private readonly recorded: { action: ConsoleAction; observed: ObservedTelegram[] }[] = [];
  /** Copies couplers sent on other lines: the same telegram again, so not observed twice. */
  private readonly forwarded = new Set<number>();

  /** `dptOf` gives the DPT of a raw group address on the bench (undefined when it is not on it). */
  constructor(private readonly dptOf: (groupAddress: number) => string | undefined) {}

  /** Takes one trace event. */
  onEvent(event: TraceEvent): void {
    if (event.kind === "user.action") {
      this.recorded.push({ action: { ...event.input, atUs: event.timeUs }, observed: [] });
      return;
    }
    if (event.kind === "coupler.forward") {
      this.forwarded.add(event.forwardedTelegramId);
      return;
    }
    if (event.kind !== "telegram.sent" || event.attempt !== 0) return;
    if (this.forwarded.delete(event.telegramId)) return;
    const last = this.recorded[this.recorded.length - 1];
    if (last === undefined) return;
    const service =
      event.service === "GroupValue_Read"
        ? "read"
        : event.service === "GroupValue_Write"
          ? "write"
          : "response";
    let value: unknown;
    if (service !== "read") {
      const dpt = this.dptOf(event.destination);
      const codec = dpt === undefined ? undefined : getDpt(dpt);
      const decoded = codec?.decode(fromHex(event.payloadHex) ?? new Uint8Array(0));
      if (decoded?.ok) value = decoded.value;
    }
    last.observed.push({
      atUs: event.timeUs,
      groupAddress: formatGroupAddress(event.destination),
      service,
      ...(value === undefined ? {} : { value }),
      ...(event.deviceId === undefined ? {} : { device: event.deviceId }),
    });
  }

  /** What was recorded so far, in time order. */
  actions(): RecordedAction[] {
    return this.recorded;
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
    const step = actionStep(recorded.action);
    if (step !== undefined) steps.push(step);
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
