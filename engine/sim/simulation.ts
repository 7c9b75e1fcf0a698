import { formatGroupAddress, parseGroupAddress } from "../address";
import { loadBench, type BenchError, type LoadedBench } from "../bench";
import type { Bench, BenchInput } from "../bench/bench-schema";
import { SequentialIds } from "../core/ids";
import { err, ok, type Result } from "../core/result";
import { createRng } from "../core/rng";
import { Scheduler } from "../core/scheduler";
import { Trace, type TraceEvent, type TraceListener } from "../core/trace";
import { getDpt } from "../dpt";
import { ACK_OCTET, type GroupService, type Priority } from "../frame";
import { Tp1Line, Tp1Sender, type BusStats } from "../bus";
import { DeviceRunner, type DeviceRuntime } from "./device-runtime";
import { BUS_FAULTS, FaultRegistry, UNIT_LINK_BROKEN } from "./fault-registry";
import {
  DEFAULT_GROUP_PRIORITY,
  GroupObjectLayer,
  groupFrame,
  type LineRuntime,
} from "./group-objects";
import { reloadedBench } from "./prepared-bench";
import type { SimError } from "./sim-error";
import type { Receipt, SimInput } from "./sim-input";
import { TraceEmitter, type FaultSource } from "./trace-emitter";
import { UNIT_LINK_DELAY_US, UnitLinkMedium } from "./unit-link-medium";

export { BUS_FAULTS, UNIT_LINK_BROKEN } from "./fault-registry";
export { DEFAULT_GROUP_PRIORITY } from "./group-objects";
export { UNIT_LINK_DELAY_US } from "./unit-link-medium";

type JsonValue = Extract<SimInput, { kind: "write" }>["value"];

/**
 * The simulation facade the UI, the scenario runner and the CLI all use: the
 * virtual clock, the trace, state queries and `apply`, the one entry point for
 * inputs from outside. The work is done by its parts:
 *
 * - DeviceRunner (device-runtime.ts): transitions, effects, timers.
 * - GroupObjectLayer (group-objects.ts): flags, sending, listening, values.
 * - UnitLinkMedium (unit-link-medium.ts): messages between unit-link members.
 * - FaultRegistry (fault-registry.ts): active faults and who raised them.
 * - TraceEmitter (trace-emitter.ts): every event the runtime records.
 *
 * Each bench line is its own medium; couplers are not modelled yet, so a
 * telegram reaches only devices on its sender's line. The test tool sits on the
 * line matching its individual address (else the first line).
 *
 * Faults the runtime itself interprets on a device (`BUS_FAULTS`): "bus.busy"
 * and "bus.nak" make the device answer BUSY / NAK and not take the frame;
 * "bus.silent" disconnects it (no acknowledgement, no reception, nothing sent).
 * On a unit link, "link.broken" stops its messages. Every fault injected into a
 * device is also handed to the device as a `fault.inject` event.
 *
 * A parameter change acts like a download to a real device: the bench is
 * re-checked with the new parameters, the device's group objects are derived
 * again (links to objects that no longer exist are dropped), and the device
 * restarts: initial state, empty object values, its timers and the faults it
 * raised itself cleared (faults injected from outside stay), then `start` and
 * its read-on-init reads.
 */

/** Key for the test tool in per-sender counts. */
export const TEST_TOOL_SENDER = "test-tool";

export interface SimulationOptions {
  /** Seed of the run's random generator; same bench, seed and inputs give the same trace. */
  readonly seed: number;
  /** Trace events kept: unlimited by default; a number keeps the latest in a ring; 0 keeps none (benchmarks). */
  readonly traceCapacity?: number;
  /** Delay of unit-link messages, µs; `UNIT_LINK_DELAY_US` by default. */
  readonly unitLinkDelayUs?: number;
  /** Transmissions kept per line for windowed bus statistics. */
  readonly historyCapacity?: number;
  /**
   * Reuse work that depends only on the bench (object specs, the benches a
   * parameter change leads to) across runs; true by default. False redoes it
   * every run, as before templates existed (the replay benchmark's baseline).
   */
  readonly reuse?: boolean;
}

export interface SendOptions {
  /** Device id to send from; the test tool's address when absent. */
  readonly from?: string;
  readonly priority?: Priority;
}

/** Thrown by `createSimulation` when handed a bench that does not load; `tryCreateSimulation` returns the errors instead. */
export class BenchLoadFailure extends Error {
  constructor(readonly errors: readonly BenchError[]) {
    super(`bench does not load: ${errors.map((e) => e.message).join("; ")}`);
  }
}

/** Loads a bench document and starts a simulation; every problem comes back as a typed error. */
export function tryCreateSimulation(
  document: unknown,
  options: SimulationOptions,
): Result<Simulation, readonly BenchError[]> {
  const loaded = loadBench(document);
  if (!loaded.ok) return loaded;
  return ok(new Simulation(loaded.value, options));
}

/**
 * Starts a simulation of a bench (a loaded bench, or a document that must load:
 * a bad one throws `BenchLoadFailure`). Devices get their `start` event and
 * read-on-init reads are queued at virtual time 0.
 */
export function createSimulation(
  bench: LoadedBench | Bench | BenchInput,
  options: SimulationOptions,
): Simulation {
  if (isLoadedBench(bench)) return new Simulation(bench, options);
  const loaded = loadBench(bench);
  if (!loaded.ok) throw new BenchLoadFailure(loaded.error);
  return new Simulation(loaded.value, options);
}

function isLoadedBench(value: unknown): value is LoadedBench {
  return typeof value === "object" && value !== null && "deviceById" in value && "bench" in value;
}

export class Simulation {
  // Starts small and grows: a replay usually holds a few dozen pending events, and a fresh run should cost little.
  private readonly scheduler = new Scheduler(64);
  private readonly traceLog: Trace;
  private readonly emitter: TraceEmitter;
  private readonly faults: FaultRegistry;
  private readonly objects: GroupObjectLayer;
  private readonly runner: DeviceRunner;
  private readonly unitLinks: UnitLinkMedium<DeviceRuntime>;
  private readonly telegramIds = new SequentialIds();
  private readonly reuse: boolean;

  private loadedBench: LoadedBench;
  private readonly lines = new Map<string, LineRuntime>();
  private readonly devices: DeviceRuntime[] = [];
  private readonly deviceById = new Map<string, DeviceRuntime>();
  private readonly testToolSender: Tp1Sender;
  private readonly testToolLine: LineRuntime;

  constructor(bench: LoadedBench, options: SimulationOptions) {
    this.loadedBench = bench;
    this.reuse = options.reuse ?? true;
    this.traceLog = new Trace({ capacity: options.traceCapacity });
    this.emitter = new TraceEmitter(this.traceLog, this.scheduler);
    this.faults = new FaultRegistry(
      this.emitter,
      bench.devices.map((d) => d.id),
    );
    const benchNow = () => this.loadedBench;
    this.objects = new GroupObjectLayer(this.emitter, this.telegramIds, benchNow, (device, event) =>
      this.runner.transition(device as DeviceRuntime, event),
    );
    this.runner = new DeviceRunner(
      this.scheduler,
      createRng(options.seed),
      this.emitter,
      this.faults,
      this.objects,
      () => this.unitLinks,
      this.reuse,
    );
    this.unitLinks = new UnitLinkMedium<DeviceRuntime>(
      this.scheduler,
      this.emitter,
      this.faults,
      benchNow,
      (id) => this.deviceById.get(id)!,
      options.unitLinkDelayUs ?? UNIT_LINK_DELAY_US,
      (to, link, from, message) =>
        this.runner.transition(to, { kind: "link.receive", link, from, message }),
    );

    for (const line of bench.lines) {
      const runtime: LineRuntime = {
        id: line.id,
        line: undefined as unknown as Tp1Line,
        listeners: new Map(),
      };
      runtime.line = new Tp1Line(
        line.id,
        this.scheduler,
        this.traceLog,
        { receiveFrame: (t, r) => this.objects.receiveFrame(runtime, t, r) },
        { historyCapacity: options.historyCapacity },
      );
      this.lines.set(line.id, runtime);
    }
    this.testToolLine = this.lines.get(bench.testToolLine)!;
    this.testToolSender = new Tp1Sender(bench.testToolAddress, undefined, TEST_TOOL_SENDER);

    bench.devices.forEach((loaded, index) => {
      const line = loaded.line === undefined ? undefined : this.lines.get(loaded.line);
      const sender =
        line === undefined || loaded.individualAddress === undefined
          ? undefined
          : new Tp1Sender(loaded.individualAddress, loaded.id, loaded.id);
      const device = this.runner.create(index, loaded, line, sender, ACK_OCTET);
      this.devices.push(device);
      this.deviceById.set(device.id, device);
    });
    this.objects.rebuildListeners(this.lines.values(), this.devices);
    for (const device of this.devices) this.runner.start(device);
  }

  // ---------------------------------------------------------------- clock

  /** Virtual time now, integer µs since the start of the run. */
  get nowUs(): number {
    return this.scheduler.nowUs;
  }

  /** Runs every event due up to `timeUs` (absolute, µs) and leaves the clock there. */
  runUntil(timeUs: number): void {
    if (!Number.isSafeInteger(timeUs) || timeUs < this.scheduler.nowUs) {
      throw new RangeError(
        `runUntil: timeUs ${timeUs} is not an integer at or after now (${this.scheduler.nowUs})`,
      );
    }
    this.scheduler.run(timeUs);
    this.scheduler.advanceTo(timeUs);
  }

  /** Runs for `durationUs` of virtual time from now. */
  runFor(durationUs: number): void {
    this.runUntil(this.scheduler.nowUs + durationUs);
  }

  /**
   * Runs until nothing is scheduled or `maxUs` of virtual time has passed
   * (60 s by default). Returns true when the run went quiet; devices with
   * periodic timers never do, and the clock then ends at the limit.
   */
  runUntilIdle(maxUs = 60_000_000): boolean {
    const limitUs = this.scheduler.nowUs + maxUs;
    this.scheduler.run(limitUs);
    if (this.scheduler.pending === 0) return true;
    this.scheduler.advanceTo(limitUs);
    return false;
  }

  /** Runs the next single event; false when nothing is scheduled. */
  step(): boolean {
    return this.scheduler.runOne();
  }

  // ---------------------------------------------------------------- trace

  /** Every kept trace event in order (a ring keeps only the latest; see `traceCapacity`). */
  get trace(): readonly TraceEvent[] {
    return this.traceLog.events();
  }

  /** The trace store, for slicing and filtering. */
  get traceStore(): Trace {
    return this.traceLog;
  }

  /** Calls `listener` for each trace event from now on; returns the unsubscribe function. */
  subscribe(listener: TraceListener): () => void {
    return this.traceLog.subscribe(listener);
  }

  // ---------------------------------------------------------------- reading state

  /** The loaded bench as it stands (parameter changes included). */
  get bench(): LoadedBench {
    return this.loadedBench;
  }

  /** Group-telegram deliveries so far: a write reaching an object with the write flag, or a response one with the update flag. */
  get deliveries(): number {
    return this.objects.deliveries;
  }

  /** A device's state-machine state, or undefined for an unknown id. */
  deviceState(deviceId: string): unknown {
    return this.deviceById.get(deviceId)?.state;
  }

  /** Stored value of a device's group object (undefined before it has one). */
  objectValue(deviceId: string, object: number): unknown {
    return this.deviceById.get(deviceId)?.objects.get(object)?.value;
  }

  /** Active faults of a device, or of a unit link, by id. */
  activeFaults(target: string): readonly string[] {
    return this.faults.active(target);
  }

  /** Who raised an active fault of a device or unit link: the device itself or a person; undefined when not active. */
  faultRaisedBy(target: string, fault: string): FaultSource | undefined {
    return this.faults.raisedBy(target, fault);
  }

  /** Last value written or answered on a group address, decoded with the address's DPT; undefined if none yet. */
  groupValue(groupAddress: number | string): unknown {
    const raw = typeof groupAddress === "number" ? groupAddress : parseGroupAddress(groupAddress);
    if (typeof raw === "number") return this.objects.groupValues.get(raw);
    return raw.ok ? this.objects.groupValues.get(raw.value) : undefined;
  }

  /** Bus load and counts over the last `windowUs` µs on a line (the test tool's line by default). */
  busStats(windowUs: number, lineId?: string): BusStats {
    return this.line(lineId, "busStats").stats(windowUs);
  }

  /** Telegram totals since the start, per destination group address and per sender (device id or "test-tool"). */
  telegramCounts(lineId?: string): {
    readonly byGroupAddress: ReadonlyMap<number, number>;
    readonly bySender: ReadonlyMap<string, number>;
  } {
    const line = this.line(lineId, "telegramCounts");
    return { byGroupAddress: line.telegramsByGroupAddress, bySender: line.telegramsBySender };
  }

  /** The TP1 line model by id (the test tool's line by default), for totals and tests. */
  line(lineId?: string, caller = "line"): Tp1Line {
    const line = lineId === undefined ? this.testToolLine : this.lines.get(lineId);
    if (line === undefined) throw new RangeError(`${caller}: no line "${lineId}"`);
    return line.line;
  }

  // ---------------------------------------------------------------- acting from outside

  /**
   * Applies one input from outside (console, scenario step, test): the one
   * dispatch for everything done to a running bench. A refused input changes
   * nothing and comes back as a `SimError` naming the input's field.
   */
  apply(input: SimInput): Result<Receipt, SimError> {
    const atUs = this.nowUs;
    switch (input.kind) {
      case "write":
      case "read":
      case "response": {
        const sent = this.sendFromOutside(input);
        return sent.ok ? ok({ atUs, telegramId: sent.value }) : sent;
      }
      case "press": {
        const device = this.deviceById.get(input.device);
        if (device === undefined) return unknownDevice(input.device);
        const buttons = device.type.buttons(device.loaded.parameters);
        if (!buttons.some((b) => b.id === input.button)) {
          return err({
            kind: "sim.button-unknown",
            field: "button",
            message: `device "${input.device}" has no button "${input.button}" (it has ${buttons.map((b) => `"${b.id}"`).join(", ") || "none"})`,
          });
        }
        const action = input.action ?? "press";
        this.emitter.userAction(
          { action: "button", deviceId: input.device, detail: `${action} ${input.button}` },
          input,
        );
        this.runner.transition(device, { kind: "button", button: input.button, action });
        return ok({ atUs });
      }
      case "set-input": {
        const device = this.deviceById.get(input.device);
        if (device === undefined) return unknownDevice(input.device);
        this.emitter.userAction(
          {
            action: "input",
            deviceId: input.device,
            detail: `${input.input} = ${JSON.stringify(input.value)}`,
          },
          input,
        );
        this.runner.transition(device, { kind: "input", input: input.input, value: input.value });
        return ok({ atUs });
      }
      case "set-parameter": {
        const device = this.deviceById.get(input.device);
        if (device === undefined) return unknownDevice(input.device);
        const current = this.loadedBench.bench.devices.find((d) => d.id === input.device)!;
        const parameters = { ...current.parameters, [input.parameter]: input.value };
        return this.reloadDevice(device, parameters, input, atUs);
      }
      case "set-parameters": {
        const device = this.deviceById.get(input.device);
        if (device === undefined) return unknownDevice(input.device);
        return this.reloadDevice(device, input.parameters, input, atUs);
      }
      case "inject-fault":
      case "clear-fault": {
        const result = this.setFault(input);
        return result.ok ? ok({ atUs }) : result;
      }
    }
  }

  /** Sends a GroupValue_Write from the test tool (or a named device). Returns the telegram id. */
  sendGroupWrite(
    groupAddress: number | string,
    value: unknown,
    options: SendOptions = {},
  ): Result<number, SimError> {
    return telegramIdOf(
      this.apply({
        kind: "write",
        groupAddress,
        value: value as JsonValue,
        ...sendFields(options),
      }),
    );
  }

  /** Sends a GroupValue_Read from the test tool (or a named device). Returns the telegram id. */
  sendGroupRead(
    groupAddress: number | string,
    options: SendOptions = {},
  ): Result<number, SimError> {
    return telegramIdOf(this.apply({ kind: "read", groupAddress, ...sendFields(options) }));
  }

  /** Sends a GroupValue_Response from the test tool (or a named device). Returns the telegram id. */
  sendGroupResponse(
    groupAddress: number | string,
    value: unknown,
    options: SendOptions = {},
  ): Result<number, SimError> {
    return telegramIdOf(
      this.apply({
        kind: "response",
        groupAddress,
        value: value as JsonValue,
        ...sendFields(options),
      }),
    );
  }

  /** Presses (or releases) one of a device's local buttons. */
  pressButton(
    deviceId: string,
    buttonId: string,
    action: "press" | "release" | "long-press" = "press",
  ): Result<void, SimError> {
    return done(this.apply({ kind: "press", device: deviceId, button: buttonId, action }));
  }

  /** Changes a local input of a device that is not a button (a window contact, presence). */
  setInput(deviceId: string, input: string, value: unknown): Result<void, SimError> {
    return done(
      this.apply({ kind: "set-input", device: deviceId, input, value: value as JsonValue }),
    );
  }

  /** Sets one parameter (top-level key) and restarts the device; see the module comment. */
  setParameter(deviceId: string, key: string, value: unknown): Result<void, SimError> {
    return done(
      this.apply({
        kind: "set-parameter",
        device: deviceId,
        parameter: key,
        value: value as JsonValue,
      }),
    );
  }

  /** Replaces a device's parameters and restarts it; the bench is re-checked first. */
  setParameters(deviceId: string, parameters: Record<string, unknown>): Result<void, SimError> {
    return done(this.apply({ kind: "set-parameters", device: deviceId, parameters }));
  }

  /**
   * Injects a fault into a device (any id; `BUS_FAULTS` are also acted on by the
   * runtime) or breaks a unit link ("link.broken").
   */
  injectFault(target: string, faultId: string): Result<void, SimError> {
    return done(this.apply({ kind: "inject-fault", device: target, fault: faultId }));
  }

  /** Clears a fault injected with `injectFault`. */
  clearFault(target: string, faultId: string): Result<void, SimError> {
    return done(this.apply({ kind: "clear-fault", device: target, fault: faultId }));
  }

  /** A parameter change: the bench is re-checked with the new parameters, then the device restarts. */
  private reloadDevice(
    device: DeviceRuntime,
    parameters: Record<string, unknown>,
    input: SimInput,
    atUs: number,
  ): Result<Receipt, SimError> {
    const deviceId = device.id;
    const bench = this.loadedBench.bench;
    const document: Bench = {
      ...bench,
      devices: bench.devices.map((d) => (d.id === deviceId ? { ...d, parameters } : d)),
    };
    // Drop links to objects the new parameters remove; the loader would otherwise refuse them.
    const objects = new Set(
      device.type
        .groupObjects(device.type.parameters.safeParse(parameters).data ?? device.loaded.parameters)
        .map((o) => o.number),
    );
    const pruned: Bench = {
      ...document,
      links: document.links.filter((l) => l.device !== deviceId || objects.has(l.object)),
    };
    const current = this.loadedBench;
    const loaded = reloadedBench(current, deviceId, parameters, this.reuse, () =>
      loadBench(pruned, {
        deviceTypes: (id) => current.devices.find((d) => d.type.id === id)?.type ?? undefined,
      }),
    );
    if (!loaded.ok) return err(parametersRefused(loaded.error));
    this.loadedBench = loaded.value;
    this.emitter.userAction(
      { action: "parameter", deviceId, detail: JSON.stringify(parameters) },
      input,
    );
    this.runner.reset(device, loaded.value.deviceById.get(deviceId)!);
    this.objects.rebuildListeners(this.lines.values(), this.devices);
    this.runner.start(device);
    return ok({ atUs });
  }

  // ---------------------------------------------------------------- internals

  private setFault(
    input: Extract<SimInput, { kind: "inject-fault" | "clear-fault" }>,
  ): Result<void, SimError> {
    const target = input.device;
    const fault = input.fault;
    const active = input.kind === "inject-fault";
    const action = active ? "fault.inject" : "fault.clear";
    const device = this.deviceById.get(target);
    if (device !== undefined) {
      this.emitter.userAction({ action, deviceId: target, detail: fault }, input);
      const changed = active
        ? this.faults.raise(target, fault, "user")
        : this.faults.clear(target, fault, "user");
      if (!changed) return ok(undefined);
      device.busAnswer = this.faults.busAnswer(target);
      this.runner.transition(
        device,
        active ? { kind: "fault.inject", fault } : { kind: "fault.clear", fault },
      );
      return ok(undefined);
    }
    if (this.loadedBench.unitLinks.some((l) => l.id === target)) {
      if (fault !== UNIT_LINK_BROKEN) {
        return err({
          kind: "sim.fault-unknown",
          field: "fault",
          message: `a unit link only has the fault "${UNIT_LINK_BROKEN}", not "${fault}"`,
        });
      }
      this.emitter.userAction({ action, unitLink: target, detail: fault }, input);
      this.faults.setBroken(target, active);
      return ok(undefined);
    }
    return err({
      kind: "sim.fault-target-unknown",
      field: "device",
      message: `no device or unit link "${target}"`,
    });
  }

  private sendFromOutside(
    input: Extract<SimInput, { kind: "write" | "read" | "response" }>,
  ): Result<number, SimError> {
    const service = SERVICE_OF_INPUT[input.kind];
    const groupAddress = input.groupAddress;
    const value = input.kind === "read" ? undefined : input.value;
    const options = input;
    let raw: number;
    if (typeof groupAddress === "number") {
      if (!Number.isInteger(groupAddress) || groupAddress < 1 || groupAddress > 0xffff) {
        return err({
          kind: "sim.group-address-invalid",
          field: "groupAddress",
          message: `group address ${groupAddress} is not a raw address 1..65535`,
        });
      }
      raw = groupAddress;
    } else {
      const parsed = parseGroupAddress(groupAddress);
      if (!parsed.ok)
        return err({
          kind: "sim.group-address-invalid",
          field: "groupAddress",
          message: parsed.error.message,
        });
      raw = parsed.value;
    }
    const ga = this.loadedBench.groupAddresses.get(raw);
    if (ga === undefined) {
      return err({
        kind: "sim.group-address-unknown",
        field: "groupAddress",
        message: `group address ${formatGroupAddress(raw)} is not on this bench, so its DPT is unknown`,
      });
    }
    let payload = EMPTY_PAYLOAD;
    if (service !== "GroupValue_Read") {
      const codec = getDpt(ga.dpt)!;
      const encoded = codec.encode(value);
      if (!encoded.ok)
        return err({
          kind: "sim.value-invalid",
          field: "value",
          message: `${formatGroupAddress(raw)}: ${encoded.error.message}`,
        });
      payload = encoded.value;
    }
    const priority = options.priority ?? DEFAULT_GROUP_PRIORITY;
    const action = service === "GroupValue_Read" ? "group.read" : "group.write";
    const detail =
      service === "GroupValue_Read"
        ? "read"
        : `${service === "GroupValue_Write" ? "write" : "response"} ${JSON.stringify(value)}`;
    if (options.from !== undefined) {
      const device = this.deviceById.get(options.from);
      if (device === undefined) return unknownDevice(options.from, "from");
      if (device.sender === undefined) {
        return err({
          kind: "sim.device-not-on-line",
          field: "from",
          message: `device "${options.from}" is not on a KNX line and cannot send telegrams`,
        });
      }
      this.emitter.userAction(
        { action, deviceId: device.id, groupAddress: raw, detail },
        withTextAddress(input, raw),
      );
      const id = this.objects.queueFromDevice(device, service, raw, payload, ga.sizeBits, priority);
      if (id === undefined)
        return err({
          kind: "sim.device-not-on-line",
          field: "from",
          message: `device "${options.from}" is disconnected ("${BUS_FAULTS.silent}")`,
        });
      return ok(id);
    }
    this.emitter.userAction({ action, groupAddress: raw, detail }, withTextAddress(input, raw));
    const frame = groupFrame(
      this.loadedBench.testToolAddress,
      raw,
      service,
      payload,
      ga.sizeBits,
      priority,
    );
    return ok(this.testToolLine.line.queue(this.testToolSender, frame, this.telegramIds.next()).id);
  }
}

const EMPTY_PAYLOAD: Uint8Array = new Uint8Array(0);

const SERVICE_OF_INPUT: Readonly<Record<"write" | "read" | "response", GroupService>> = {
  write: "GroupValue_Write",
  read: "GroupValue_Read",
  response: "GroupValue_Response",
};

/** The input as the trace keeps it: the group address as text, optional fields left out when absent. */
function withTextAddress(
  input: Extract<SimInput, { kind: "write" | "read" | "response" }>,
  raw: number,
): SimInput {
  const { from, priority } = input;
  return {
    ...(input.kind === "read"
      ? { kind: "read" as const, groupAddress: formatGroupAddress(raw) }
      : { kind: input.kind, groupAddress: formatGroupAddress(raw), value: input.value }),
    ...(from === undefined ? {} : { from }),
    ...(priority === undefined ? {} : { priority }),
  } as SimInput;
}

function sendFields(options: SendOptions): { from?: string; priority?: Priority } {
  return {
    ...(options.from === undefined ? {} : { from: options.from }),
    ...(options.priority === undefined ? {} : { priority: options.priority }),
  };
}

function telegramIdOf(result: Result<Receipt, SimError>): Result<number, SimError> {
  return result.ok ? ok(result.value.telegramId!) : result;
}

function done(result: Result<Receipt, SimError>): Result<void, SimError> {
  return result.ok ? ok(undefined) : result;
}

/** Bench errors of a refused parameter change, folded into one error naming the first field. */
function parametersRefused(errors: readonly BenchError[]): SimError {
  return {
    kind: "sim.parameters-invalid",
    field: errors[0]?.path ?? "parameters",
    message: errors.map((e) => e.message).join("; "),
    issues: errors,
  };
}

function unknownDevice(
  deviceId: string,
  field = "device",
): { readonly ok: false; readonly error: SimError } {
  return err({
    kind: "sim.device-unknown",
    field,
    message: `no device "${deviceId}" on this bench`,
  });
}
