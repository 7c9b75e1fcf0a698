import { formatGroupAddress, parseGroupAddress, parseIndividualAddress } from "../address";
import { formatLineAddress } from "../topology/line-address";
import { benchCouplers } from "../topology/bench-topology";
import type { Bench, BenchInput, LoadedBench } from "../bench";
import { eventTouchesDevice, type TraceEvent } from "../core/trace";
import { getDpt, type DptCodec } from "../dpt";
import { fromHex, telegramOccupancyUs, type GroupService } from "../frame";
import { BenchLoadFailure, createSimulation, type Simulation } from "../sim";
import { formatVirtualTime } from "../core/virtual-time";
import { forkSettledRun, keepSettledRun } from "./settled-runs";
import { addressTable, checkedStepValue, durationUs, keptLabel } from "./step-cache";
import {
  outcomeIsOk,
  scenarioOutcome,
  stepTotals,
  type ScenarioResult,
  type StepResult,
} from "./scenario-result";
import type { Receipt, SimError, SimInput } from "../sim";

type JsonValue = Extract<SimInput, { kind: "write" }>["value"];
import type { Result } from "../core/result";
import { stepInput, type Scenario, type Step } from "./scenario-schema";
import { formatValue, valueAtPath, valuesMatch } from "./value-match";

/** How a scenario run is set up by its caller. */
export interface RunScenarioOptions {
  /** Overrides the scenario's own seed (the CLI's --seed). */
  readonly seed?: number;
  /**
   * Wall clock in milliseconds, injected by the caller (the CLI passes
   * performance.now); the engine never reads a clock itself. Without it there is
   * no wall-clock budget and wallMs is 0.
   */
  readonly now?: () => number;
  /** Wall-clock budget for the whole scenario, milliseconds; default 10 000 when `now` is given. */
  readonly budgetMs?: number;
  /** Where the scenario came from, copied into the result (file path). */
  readonly source?: string;
  /**
   * Reuse bench-only work across runs (see SimulationOptions.reuse), and start
   * from a fork of a run of the same loaded bench that already settled
   * (settled-runs.ts); true by default.
   */
  readonly reuse?: boolean;
  /** Handed the run's whole trace when it ends (golden-trace tests, debugging). */
  readonly onTrace?: (trace: readonly TraceEvent[]) => void;
}

/** Default wall-clock budget per scenario, milliseconds. */
export const DEFAULT_SCENARIO_BUDGET_MS = 10_000;

/** Most trace events kept per step verdict; the rest are counted in a note. */
export const TRACE_SLICE_LIMIT = 200;

// Transmissions each line keeps for its own statistics; the runner does not read them.
const LINE_HISTORY_CAPACITY = 256;

// The wall clock is read once per this many trace events, so a zero-time event storm is still caught.
const BUDGET_CHECK_EVERY_EVENTS = 512;

class BudgetExceeded extends Error {}

const SERVICE_OF: Readonly<Record<GroupService, "write" | "response" | "read">> = {
  GroupValue_Write: "write",
  GroupValue_Response: "response",
  GroupValue_Read: "read",
};

interface AddressInfo {
  readonly raw: number;
  readonly text: string;
  readonly name: string;
  readonly codec: DptCodec<unknown>;
  /** Devices with an object on this address; their transitions explain what happened on it. */
  readonly devices: ReadonlySet<string>;
}

type StepOutcome = Pick<StepResult, "status" | "expected" | "actual" | "message"> & {
  readonly trace: readonly TraceEvent[];
};

/** A step could not run: the reason names the field, like a parse error does. */
class StepError extends Error {}

/** "write 2/0/2 = 23.5", "expect-value 2/1/2 = 23.5 within 500ms" — a label when the step has none. */
export function stepLabel(step: Step): string {
  if (step.label) return step.label;
  const value = (v: unknown) => JSON.stringify(v);
  switch (step.kind) {
    case "write":
      return `write ${step.groupAddress} = ${value(step.value)}${step.from ? ` from ${step.from}` : ""}`;
    case "read":
      return `read ${step.groupAddress}${step.from ? ` from ${step.from}` : ""}`;
    case "press":
      return `press ${step.device} ${step.button}${step.action && step.action !== "press" ? ` (${step.action})` : ""}`;
    case "set-input":
      return `set-input ${step.device} ${step.input} = ${value(step.value)}`;
    case "wait":
      return `wait ${step.for}`;
    case "set-parameter":
      return `set-parameter ${step.device} ${step.parameter} = ${value(step.value)}`;
    case "inject-fault":
    case "clear-fault":
      return `${step.kind} ${step.fault} on ${step.device}`;
    case "expect-value":
      return `expect-value ${step.groupAddress} = ${value(step.value)}${step.source ? ` from ${step.source}` : ""} within ${step.within}`;
    case "expect-response":
      return `expect-response ${step.groupAddress}${step.value === undefined ? "" : ` = ${value(step.value)}`} within ${step.within}`;
    case "expect-state":
      return `expect-state ${step.device} ${step.path} = ${value(step.value)}${step.within ? ` within ${step.within}` : ""}`;
    case "expect-count": {
      const bound =
        step.count !== undefined ? `${step.count}` : `${step.min ?? 0}..${step.max ?? "∞"}`;
      return `expect-count ${step.groupAddress} ${bound}${step.source ? ` from ${step.source}` : ""}${step.line === undefined ? "" : ` on line ${step.line}`} within ${step.within}`;
    }
    case "expect-bus-load":
      return `expect-bus-load below ${step.belowPercent} %${step.line === undefined ? "" : ` on line ${step.line}`} over ${step.over}`;
    case "expect-silence":
      return `expect-silence ${step.groupAddress ?? "(all addresses)"} for ${step.for}`;
  }
}

function lowerBound(events: readonly TraceEvent[], timeUs: number): number {
  let lo = 0;
  let hi = events.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (events[mid]!.timeUs < timeUs) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

function capped(events: readonly TraceEvent[]): readonly TraceEvent[] {
  return events.length <= TRACE_SLICE_LIMIT ? events : events.slice(0, TRACE_SLICE_LIMIT);
}

/** One scenario run: the simulation, the anchor and the helpers steps share. */
class ScenarioRun {
  anchorUs: number;

  constructor(
    readonly sim: Simulation,
    private readonly checkBudget: () => void,
    private readonly budgeted: boolean,
  ) {
    this.anchorUs = sim.nowUs;
  }

  get bench(): LoadedBench {
    return this.sim.bench;
  }

  /** An address a step names, resolved once per bench (see step-cache.ts). */
  address(text: string, field = "groupAddress"): AddressInfo {
    const addresses = addressTable<AddressInfo>(this.bench);
    const cached = addresses.get(text);
    if (cached) return cached;
    const parsed = parseGroupAddress(text);
    if (!parsed.ok) throw new StepError(`${field}: ${parsed.error.message}`);
    const declared = this.bench.groupAddresses.get(parsed.value);
    if (declared === undefined)
      throw new StepError(
        `${field}: group address ${text} is not on the bench "${this.bench.bench.name}"`,
      );
    const codec = getDpt(declared.dpt);
    if (codec === undefined)
      throw new StepError(
        `${field}: group address ${text} has DPT ${declared.dpt}, which Benchline cannot decode`,
      );
    const devices = new Set<string>();
    for (const device of this.bench.devices) {
      if (device.objects.some((object) => object.groupAddresses.includes(parsed.value)))
        devices.add(device.id);
    }
    const info: AddressInfo = {
      raw: parsed.value,
      text: formatGroupAddress(parsed.value),
      name: declared.name,
      codec,
      devices,
    };
    addresses.set(text, info);
    return info;
  }

  /**
   * Which telegram events a step with an optional `line` ("1.2") counts:
   * those on that line; without one, those as their senders sent them (a
   * coupler's copies on other lines are left out). Undefined when every
   * telegram counts (no line given, no couplers on the bench).
   */
  lineMatcher(
    line: string | undefined,
  ): ((event: { readonly line: string; readonly deviceId?: string }) => boolean) | undefined {
    const bench = this.bench;
    if (line !== undefined) {
      const found = bench.lines.find((l) => formatLineAddress(l.lineAddress) === line);
      if (found === undefined)
        throw new StepError(`line: no line ${line} on the bench "${bench.bench.name}"`);
      const id = found.id;
      return (event) => event.line === id;
    }
    const couplers = new Set(benchCouplers(bench).map((c) => c.id));
    if (couplers.size === 0) return undefined;
    return (event) => event.deviceId === undefined || !couplers.has(event.deviceId);
  }

  /** The expected value as it would travel: validated by the DPT and put through encode/decode. */
  expectedValue(address: AddressInfo, value: unknown, field = "value"): unknown {
    const checked = address.codec.valueSchema.safeParse(value);
    if (!checked.success) {
      throw new StepError(
        `${field}: ${JSON.stringify(value)} is not a ${address.codec.id} value (${checked.error.issues[0]?.message ?? "wrong type"})`,
      );
    }
    const encoded = address.codec.encode(checked.data);
    if (!encoded.ok) throw new StepError(`${field}: ${encoded.error.message}`);
    const decoded = address.codec.decode(encoded.value);
    return decoded.ok ? decoded.value : checked.data;
  }

  decode(address: AddressInfo, payloadHex: string): unknown {
    const bytes = fromHex(payloadHex);
    if (bytes === undefined) return undefined;
    const decoded = address.codec.decode(bytes);
    return decoded.ok ? decoded.value : undefined;
  }

  /**
   * Runs the simulation toward `untilUs`. With a `done` condition it runs in
   * slices and stops after the first slice where the condition holds; the stop
   * time depends only on virtual time, so runs stay deterministic. Without one it
   * runs straight through, in a few slices when a wall-clock budget is being
   * kept (an event storm is caught by the trace listener either way).
   */
  advance(untilUs: number, done?: () => boolean): void {
    const spanUs = untilUs - this.sim.nowUs;
    if (spanUs <= 0) return;
    if (done === undefined && !this.budgeted) {
      this.sim.runUntil(untilUs);
      return;
    }
    const sliceUs =
      done === undefined
        ? Math.max(1_000_000, Math.ceil(spanUs / 10))
        : Math.max(10_000, Math.ceil(spanUs / 50));
    while (!(done?.() ?? false) && this.sim.nowUs < untilUs) {
      this.checkBudget();
      let endUs = Math.min(untilUs, this.sim.nowUs + sliceUs);
      // A slice in which nothing is due changes nothing a condition reads, so the run
      // goes straight to the end of the slice holding the next event (same stop time).
      // With a wall-clock budget every slice stays, as each is a budget check.
      const nextUs = this.sim.nextEventUs;
      if (!this.budgeted && nextUs > endUs)
        endUs = Math.min(
          untilUs,
          endUs + Math.ceil((Math.min(nextUs, untilUs) - endUs) / sliceUs) * sliceUs,
        );
      this.sim.runUntil(endUs);
    }
  }

  /** First-transmission telegrams with fromUs <= timeUs <= toUs, optionally to one address and matching a line. */
  telegrams(
    fromUs: number,
    toUs: number,
    raw?: number,
    onLine?: (event: { readonly line: string; readonly deviceId?: string }) => boolean,
  ): TraceEvent[] {
    const events = this.sim.trace;
    const found: TraceEvent[] = [];
    for (let i = lowerBound(events, fromUs); i < events.length; i++) {
      const event = events[i]!;
      if (event.timeUs > toUs) break;
      if (event.kind !== "telegram.sent" || event.attempt !== 0) continue;
      if (raw !== undefined && event.destination !== raw) continue;
      if (onLine !== undefined && !onLine(event)) continue;
      found.push(event);
    }
    return found;
  }

  /** Trace events that explain what happened on an address in a window: its telegrams, objects and devices. */
  addressSlice(
    address: AddressInfo | undefined,
    fromUs: number,
    toUs: number,
  ): readonly TraceEvent[] {
    const events = this.sim.trace;
    const slice: TraceEvent[] = [];
    for (
      let i = lowerBound(events, fromUs);
      i < events.length && slice.length < TRACE_SLICE_LIMIT;
      i++
    ) {
      const event = events[i]!;
      if (event.timeUs > toUs) break;
      if (address === undefined) {
        if (event.kind === "telegram.sent" || event.kind === "user.action") slice.push(event);
        continue;
      }
      switch (event.kind) {
        case "telegram.sent":
        case "telegram.repeated":
        case "telegram.lost":
          if (event.destination === address.raw) slice.push(event);
          break;
        case "object.changed":
        case "user.action":
          if (event.groupAddress === address.raw) slice.push(event);
          break;
        case "device.transition":
        case "device.note":
        case "fault.raised":
        case "fault.cleared":
          if (event.deviceId !== undefined && address.devices.has(event.deviceId))
            slice.push(event);
          break;
        default:
          break;
      }
    }
    return slice;
  }

  /** Events about a device with fromUs <= timeUs <= toUs, at most TRACE_SLICE_LIMIT (no copy of the range first). */
  deviceSlice(deviceId: string, fromUs: number, toUs: number): readonly TraceEvent[] {
    const events = this.sim.trace;
    const slice: TraceEvent[] = [];
    const end = lowerBound(events, toUs + 1);
    for (let i = lowerBound(events, fromUs); i < end && slice.length < TRACE_SLICE_LIMIT; i++) {
      if (eventTouchesDevice(events[i]!, deviceId)) slice.push(events[i]!);
    }
    return slice;
  }
}

function pass(trace: readonly TraceEvent[]): StepOutcome {
  return { status: "pass", trace };
}

function fail(expected: string, actual: string, trace: readonly TraceEvent[]): StepOutcome {
  return { status: "fail", expected, actual, trace };
}

function simFailure(result: Result<Receipt, SimError>): void {
  if (result.ok) return;
  const { field, message } = result.error;
  // A refused parameter change already names its bench path at the start of the message.
  throw new StepError(message.startsWith(field) ? message : `${field}: ${message}`);
}

function describeAddress(address: AddressInfo): string {
  return `${address.text} "${address.name}"`;
}

function runAction(
  run: ScenarioRun,
  step: Exclude<Step, { kind: `expect-${string}` }>,
): StepOutcome {
  const sim = run.sim;
  const before = sim.trace.length;
  switch (step.kind) {
    case "write": {
      const address = run.address(step.groupAddress);
      const value = checkedStepValue(step, address.codec, () => {
        const checked = address.codec.valueSchema.safeParse(step.value);
        if (!checked.success)
          throw new StepError(
            `value: ${JSON.stringify(step.value)} is not a ${address.codec.id} value`,
          );
        return checked.data;
      });
      simFailure(
        sim.apply({
          kind: "write",
          groupAddress: address.raw,
          value: value as JsonValue,
          from: step.from,
          priority: step.priority,
        }),
      );
      break;
    }
    case "read":
      simFailure(
        sim.apply({
          kind: "read",
          groupAddress: run.address(step.groupAddress).raw,
          from: step.from,
        }),
      );
      break;
    case "press":
    case "set-input":
    case "set-parameter":
    case "inject-fault":
    case "clear-fault":
      simFailure(sim.apply(stepInput(step)));
      break;
    case "wait": {
      // A wait counts from the anchor (the last action), not from wherever expectations left the clock.
      const untilUs = run.anchorUs + durationUs(step.for);
      if (untilUs > sim.nowUs) run.advance(untilUs);
      run.anchorUs = untilUs;
      return pass([]);
    }
  }
  run.anchorUs = sim.nowUs;
  return pass(capped(sim.trace.slice(before)));
}

/** Telegrams to one address in a window, scanned as the run advances, and the first that matches. */
class TelegramWatch {
  // By trace position, not by time: an event appended later may carry a time already scanned.
  private cursor: number;
  matchUs: number | undefined;
  readonly seen: { timeUs: number; value: unknown; service: string }[] = [];

  constructor(
    private readonly run: ScenarioRun,
    private readonly address: AddressInfo,
    private readonly services: readonly string[],
    private readonly expected: unknown,
    private readonly tolerance: number,
    fromUs: number,
    private readonly toUs: number,
    private readonly onLine:
      ((event: { readonly line: string; readonly deviceId?: string }) => boolean) | undefined,
    /** Raw individual address the sender must have; undefined for any sender. */
    private readonly source: number | undefined,
  ) {
    this.cursor = lowerBound(run.sim.trace, fromUs);
  }

  /** Reads the events appended since the last scan; true once a telegram matched. */
  scan(): boolean {
    const events = this.run.sim.trace;
    for (; this.cursor < events.length; this.cursor++) {
      const event = events[this.cursor]!;
      if (event.timeUs > this.toUs) break;
      if (
        event.kind !== "telegram.sent" ||
        event.attempt !== 0 ||
        event.destination !== this.address.raw ||
        (this.onLine !== undefined && !this.onLine(event)) ||
        (this.source !== undefined && event.source !== this.source)
      )
        continue;
      const service = SERVICE_OF[event.service];
      if (!this.services.includes(service)) continue;
      const value = this.run.decode(this.address, event.payloadHex);
      this.seen.push({ timeUs: event.timeUs, value, service });
      if (
        this.matchUs === undefined &&
        (this.expected === undefined || valuesMatch(this.expected, value, this.tolerance))
      )
        this.matchUs = event.timeUs;
    }
    return this.matchUs !== undefined;
  }
}

function expectTelegramValue(
  run: ScenarioRun,
  step: Extract<Step, { kind: "expect-value" | "expect-response" }>,
): StepOutcome {
  const address = run.address(step.groupAddress);
  const expected =
    step.value === undefined
      ? undefined
      : checkedStepValue(step, address.codec, () => run.expectedValue(address, step.value));
  const tolerance = step.tolerance ?? 0;
  const services: readonly string[] =
    step.kind === "expect-response"
      ? ["response"]
      : step.service === undefined || step.service === "any"
        ? ["write", "response"]
        : [step.service];
  const fromUs = run.anchorUs;
  const toUs = fromUs + durationUs(step.within);
  const source = step.kind === "expect-value" ? sourceOf(step) : undefined;
  const watch = new TelegramWatch(
    run,
    address,
    services,
    expected,
    tolerance,
    fromUs,
    toUs,
    run.lineMatcher(step.line),
    source,
  );
  if (!watch.scan()) run.advance(toUs, () => watch.scan());
  const { matchUs, seen } = watch;
  const slice = run.addressSlice(address, fromUs, Math.min(toUs, run.sim.nowUs));
  if (matchUs !== undefined) return pass(slice);
  // Verdict text only for a failure: formatting values through their DPT is not free.
  const what =
    step.kind === "expect-response"
      ? "GroupValue_Response"
      : services.length === 2
        ? "write or response"
        : String(services[0]);
  const sender = step.kind === "expect-value" && step.source ? ` from ${step.source}` : "";
  const expectedText = `a ${what}${sender} to ${describeAddress(address)}${expected === undefined ? "" : ` carrying ${formatValue(expected, address.codec)}${tolerance > 0 ? ` ± ${tolerance}` : ""}`} within ${step.within}`;
  if (seen.length === 0) {
    const last = run.sim.groupValue(address.raw);
    return fail(
      expectedText,
      `no ${what}${sender} to ${address.text} in the window${last === undefined ? "" : `; the last value seen on it is ${formatValue(last, address.codec)}`}`,
      slice,
    );
  }
  const values = seen
    .slice(0, 3)
    .map(
      (s) =>
        `${formatValue(s.value, address.codec)} (${s.service} at ${formatVirtualTime(s.timeUs)})`,
    );
  return fail(
    expectedText,
    `${address.text} carried ${values.join(", ")}${seen.length > 3 ? ` and ${seen.length - 3} more` : ""}`,
    slice,
  );
}

/** The raw sender address an expectation filters on (the schema has checked its text). */
function sourceOf(step: { readonly source?: string | undefined }): number | undefined {
  if (step.source === undefined) return undefined;
  const parsed = parseIndividualAddress(step.source);
  return parsed.ok ? parsed.value : undefined;
}

function expectState(run: ScenarioRun, step: Extract<Step, { kind: "expect-state" }>): StepOutcome {
  if (run.sim.deviceState(step.device) === undefined && !run.bench.deviceById.has(step.device)) {
    throw new StepError(
      `device: no device "${step.device}" on the bench "${run.bench.bench.name}"`,
    );
  }
  const tolerance = step.tolerance ?? 0;
  const fromUs = run.anchorUs;
  if (step.within !== undefined)
    run.advance(fromUs + durationUs(step.within), () => {
      const current = valueAtPath(run.sim.deviceState(step.device), step.path);
      return current.found && valuesMatch(step.value, current.value, tolerance);
    });
  const current = valueAtPath(run.sim.deviceState(step.device), step.path);
  const slice = run.deviceSlice(step.device, fromUs, run.sim.nowUs);
  if (current.found && valuesMatch(step.value, current.value, tolerance)) return pass(slice);
  const expected = `${step.device} ${step.path} = ${JSON.stringify(step.value)}${tolerance > 0 ? ` ± ${tolerance}` : ""}${step.within ? ` within ${step.within}` : ""}`;
  if (!current.found) return fail(expected, `${step.device} has no state at "${step.path}"`, slice);
  return fail(
    expected,
    `${step.path} is ${JSON.stringify(current.value)} at ${formatVirtualTime(run.sim.nowUs)}`,
    slice,
  );
}

function expectCount(run: ScenarioRun, step: Extract<Step, { kind: "expect-count" }>): StepOutcome {
  const address = run.address(step.groupAddress);
  const fromUs = run.anchorUs;
  const toUs = fromUs + durationUs(step.within);
  run.advance(toUs);
  const service = step.service ?? "any";
  const source = sourceOf(step);
  const counted = run
    .telegrams(fromUs, toUs, address.raw, run.lineMatcher(step.line))
    .filter(
      (event) =>
        event.kind === "telegram.sent" &&
        (service === "any" || SERVICE_OF[event.service] === service) &&
        (source === undefined || event.source === source),
    );
  const min = step.count ?? step.min ?? 0;
  const max = step.count ?? step.max ?? Infinity;
  const slice = run.addressSlice(address, fromUs, toUs);
  if (counted.length >= min && counted.length <= max) return pass(slice);
  const bound =
    step.count !== undefined
      ? `exactly ${step.count}`
      : max === Infinity
        ? `at least ${min}`
        : `${min} to ${max}`;
  const expected = `${bound} ${service === "any" ? "" : `${service} `}telegram(s)${step.source ? ` from ${step.source}` : ""} to ${describeAddress(address)}${step.line === undefined ? "" : ` on line ${step.line}`} within ${step.within}`;
  return fail(expected, `${counted.length} telegram(s)`, slice);
}

function expectBusLoad(
  run: ScenarioRun,
  step: Extract<Step, { kind: "expect-bus-load" }>,
): StepOutcome {
  const fromUs = run.anchorUs;
  const windowUs = durationUs(step.over);
  const toUs = fromUs + windowUs;
  const onLine = step.line === undefined ? undefined : run.lineMatcher(step.line);
  run.advance(toUs);
  // Basic course accounting, as the bench check uses: each transmission (repetitions too)
  // holds the line for idle 50 + 13 per octet + gap 15 + ack 11 bit times.
  const occupiedUs = new Map<string, number>();
  const events = run.sim.trace;
  for (let i = lowerBound(events, fromUs); i < events.length; i++) {
    const event = events[i]!;
    if (event.timeUs >= toUs) break;
    if (event.kind !== "telegram.sent") continue;
    if (onLine !== undefined && !onLine(event)) continue;
    occupiedUs.set(
      event.line,
      (occupiedUs.get(event.line) ?? 0) + telegramOccupancyUs(event.octets),
    );
  }
  let worstLine =
    run.bench.lines.find((l) => formatLineAddress(l.lineAddress) === step.line)?.id ??
    run.bench.lines[0]?.id ??
    "";
  let worstPercent = 0;
  for (const [line, us] of occupiedUs) {
    const percent = windowUs === 0 ? 0 : (us / windowUs) * 100;
    if (percent > worstPercent) {
      worstPercent = percent;
      worstLine = line;
    }
  }
  const slice = run.addressSlice(undefined, fromUs, toUs);
  const worst = run.bench.lines.find((l) => l.id === worstLine);
  // Named as the step names lines: by address ("1.3"), the bench's id beside it.
  const actual = `${worstPercent.toFixed(1)} % on line ${worst === undefined ? worstLine : `${formatLineAddress(worst.lineAddress)} (${worst.id})`}`;
  if (worstPercent < step.belowPercent) return pass(slice);
  return fail(
    `bus load below ${step.belowPercent} %${step.line === undefined ? "" : ` on line ${step.line}`} over ${step.over}`,
    actual,
    slice,
  );
}

function expectSilence(
  run: ScenarioRun,
  step: Extract<Step, { kind: "expect-silence" }>,
): StepOutcome {
  const address = step.groupAddress === undefined ? undefined : run.address(step.groupAddress);
  const fromUs = run.anchorUs;
  const toUs = fromUs + durationUs(step.for);
  const onLine = run.lineMatcher(step.line);
  run.advance(
    toUs,
    () => run.telegrams(fromUs, Math.min(toUs, run.sim.nowUs), address?.raw, onLine).length > 0,
  );
  const found = run.telegrams(fromUs, Math.min(toUs, run.sim.nowUs), address?.raw, onLine);
  const slice = run.addressSlice(address, fromUs, Math.min(toUs, run.sim.nowUs));
  const target = address === undefined ? "any address" : describeAddress(address);
  if (found.length === 0) return pass(slice);
  const first = found[0]!;
  const from = first.kind === "telegram.sent" ? (first.deviceId ?? "the test tool") : "?";
  return fail(
    `no telegram to ${target} for ${step.for}`,
    `${from} sent to ${first.kind === "telegram.sent" ? formatGroupAddress(first.destination) : "?"} at ${formatVirtualTime(first.timeUs)}`,
    slice,
  );
}

function runStep(run: ScenarioRun, step: Step): StepOutcome {
  switch (step.kind) {
    case "expect-value":
    case "expect-response":
      return expectTelegramValue(run, step);
    case "expect-state":
      return expectState(run, step);
    case "expect-count":
      return expectCount(run, step);
    case "expect-bus-load":
      return expectBusLoad(run, step);
    case "expect-silence":
      return expectSilence(run, step);
    default:
      return runAction(run, step);
  }
}

function benchError(
  scenario: Scenario,
  seed: number,
  message: string,
  options: RunScenarioOptions,
  wallMs: number,
): ScenarioResult {
  return {
    name: scenario.name,
    ...(options.source ? { source: options.source } : {}),
    seed,
    expectedToFail: scenario.expectedToFail,
    outcome: "error",
    ok: false,
    steps: [],
    totals: { pass: 0, fail: 0, error: 0, skipped: 0 },
    virtualTimeUs: 0,
    wallMs,
    message,
  };
}

/**
 * Replays a scenario on a fresh simulation of the bench and returns a verdict
 * per step, with the trace slice that explains it, and the scenario's outcome.
 * Deterministic: the same scenario, bench and seed give the same result (wall
 * time aside). A step that cannot run is an error and stops the scenario; a
 * failed expectation does not, so one run shows every failing expectation.
 */
export function runScenario(
  scenario: Scenario,
  bench: LoadedBench | Bench | BenchInput,
  options: RunScenarioOptions = {},
): ScenarioResult {
  const now = options.now;
  const startMs = now ? now() : 0;
  const elapsedMs = () => (now ? now() - startMs : 0);
  const budgetMs = options.budgetMs ?? DEFAULT_SCENARIO_BUDGET_MS;
  const seed = options.seed ?? scenario.seed;
  const reuse = options.reuse ?? true;
  const settleUs = durationUs(scenario.settle);
  // Runs of an already loaded bench start from a settled template when one is kept (settled-runs.ts).
  const template = reuse && "deviceById" in bench ? (bench as LoadedBench) : undefined;
  const settled = template && forkSettledRun(template, seed, settleUs);

  let sim: Simulation;
  try {
    // Bus load verdicts are computed from the trace, so the line's own statistics history stays small.
    sim =
      settled ?? createSimulation(bench, { seed, historyCapacity: LINE_HISTORY_CAPACITY, reuse });
  } catch (cause) {
    if (cause instanceof BenchLoadFailure)
      return benchError(scenario, seed, cause.message, options, elapsedMs());
    throw cause;
  }

  const checkBudget = () => {
    if (now && now() - startMs > budgetMs) throw new BudgetExceeded();
  };
  let eventsSinceCheck = 0;
  const unsubscribe = now
    ? sim.subscribe(() => {
        if (++eventsSinceCheck < BUDGET_CHECK_EVERY_EVENTS) return;
        eventsSinceCheck = 0;
        checkBudget();
      })
    : () => {};

  const steps: StepResult[] = [];
  let stopped = false;
  let settleMessage: string | undefined;
  try {
    const run = new ScenarioRun(sim, checkBudget, now !== undefined);
    try {
      if (settled === undefined) {
        run.advance(settleUs);
        run.anchorUs = sim.nowUs;
        if (template !== undefined) keepSettledRun(template, seed, settleUs, sim);
      }
    } catch (cause) {
      if (!(cause instanceof BudgetExceeded)) throw cause;
      stopped = true;
      settleMessage = `wall-clock budget of ${budgetMs} ms ran out while the bench settled (virtual time ${formatVirtualTime(sim.nowUs)})`;
    }
    scenario.steps.forEach((step, index) => {
      const label = keptLabel(step, stepLabel);
      const startUs = sim.nowUs;
      if (stopped) {
        steps.push({
          index,
          kind: step.kind,
          label,
          status: "skipped",
          startUs,
          endUs: startUs,
          trace: [],
        });
        return;
      }
      try {
        const outcome = runStep(run, step);
        steps.push({ index, kind: step.kind, label, startUs, endUs: sim.nowUs, ...outcome });
      } catch (cause) {
        let message: string;
        if (cause instanceof BudgetExceeded) {
          message = `wall-clock budget of ${budgetMs} ms ran out at virtual time ${formatVirtualTime(sim.nowUs)}; the scenario was stopped`;
        } else if (cause instanceof StepError) {
          message = `steps[${index}].${cause.message}`;
        } else throw cause;
        stopped = true;
        steps.push({
          index,
          kind: step.kind,
          label,
          status: "error",
          startUs,
          endUs: sim.nowUs,
          message,
          trace: capped(sim.traceStore.slice(startUs, sim.nowUs + 1)),
        });
      }
    });
  } finally {
    unsubscribe();
  }
  options.onTrace?.(sim.trace);

  const outcome =
    settleMessage === undefined ? scenarioOutcome(steps, scenario.expectedToFail) : "error";
  return {
    name: scenario.name,
    ...(options.source ? { source: options.source } : {}),
    seed,
    expectedToFail: scenario.expectedToFail,
    outcome,
    ok: outcomeIsOk(outcome),
    steps,
    totals: stepTotals(steps),
    virtualTimeUs: sim.nowUs,
    wallMs: elapsedMs(),
    ...(settleMessage === undefined ? {} : { message: settleMessage }),
  };
}
