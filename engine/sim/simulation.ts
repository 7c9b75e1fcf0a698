import { formatGroupAddress, parseGroupAddress } from "../address";
import { loadBench, type BenchError, type LoadedBench, type LoadedDevice } from "../bench";
import type { Bench, BenchInput } from "../bench/bench-schema";
import { SequentialIds } from "../core/ids";
import { err, ok, type Result } from "../core/result";
import { createRng, type Rng } from "../core/rng";
import { Scheduler } from "../core/scheduler";
import { Trace, type TraceEvent, type TraceListener } from "../core/trace";
import type {
  AnyDeviceType,
  DeviceContext,
  DeviceEffect,
  DeviceEvent,
  GroupObjectFlags,
} from "../devices/device-type";
import { getDpt, type DptCodec } from "../dpt";
import {
  ACK_OCTET,
  BUSY_OCTET,
  DEFAULT_HOP_COUNT,
  NAK_OCTET,
  type DataFrame,
  type GroupService,
  type Priority,
} from "../frame";
import { NO_ACK_OCTET, Tp1Line, Tp1Sender, type BusStats, type Telegram } from "../bus";
import type { SimError } from "./sim-error";
import type { Receipt, SimInput } from "./sim-input";
import { objectSpecs, reloadedBench } from "./prepared-bench";

type JsonValue = Extract<SimInput, { kind: "write" }>["value"];

/**
 * The simulation runtime and the facade the UI, the scenario runner and the CLI
 * all use. It owns the virtual clock, the lines, the device state machines and
 * the trace, and applies every effect a device asks for:
 *
 * - group.send / group.read: encoded with the object's DPT and queued on the
 *   object's line from the device's individual address, on the object's first
 *   linked address (communication and transmit flags required); group.send also
 *   stores the value.
 * - object.store: stores without sending.
 * - timer.set / timer.cancel: a named timer per device; setting a name again
 *   replaces it.
 * - link.send: delivered to every other member of the unit link after
 *   `UNIT_LINK_DELAY_US`, and only while the link is not broken (checked when
 *   sent and again when delivered). Members are not told that a link broke:
 *   like real units they notice by silence (their own timeouts).
 * - fault.raise / fault.clear: kept per device and traced.
 * - note: traced.
 *
 * Group objects: a device takes a group frame (and acknowledges it) when any of
 * its objects is linked to the destination. A write is stored in every linked
 * object with the communication and write flags and handed to the device; a
 * response likewise for the update flag; a read is answered by the runtime for
 * every linked object with the communication and read flags, from the stored
 * value (all-zero octets when the object never had one, as a device's memory
 * would hold). A device does not hear its own frames. A device that took a
 * frame acknowledges but ignores its repetitions, even when other frames pass
 * in between (exactly once per device, a little stricter than devices that only
 * compare with the last frame they received).
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

/** Virtual delay of a message between unit-link members: 10 ms, our own figure for a wired HVAC link. */
export const UNIT_LINK_DELAY_US = 10_000;

/** Faults the runtime interprets on a device's bus connection. */
export const BUS_FAULTS = { busy: "bus.busy", nak: "bus.nak", silent: "bus.silent" } as const;

/** The one fault a unit link can have. */
export const UNIT_LINK_BROKEN = "link.broken";

/** Key for the test tool in per-sender counts. */
export const TEST_TOOL_SENDER = "test-tool";

/** Priority of group telegrams unless asked otherwise (knx-reference.md: low is the default). */
export const DEFAULT_GROUP_PRIORITY: Priority = "low";

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

interface ObjectRuntime {
  readonly number: number;
  readonly dpt: string;
  readonly codec: DptCodec<unknown>;
  readonly sizeBits: number;
  readonly flags: GroupObjectFlags;
  readonly groupAddresses: readonly number[];
  value: unknown;
}

interface DeviceRuntime {
  readonly index: number;
  readonly id: string;
  loaded: LoadedDevice;
  readonly type: AnyDeviceType;
  state: unknown;
  objects: Map<number, ObjectRuntime>;
  context: DeviceContext<unknown>;
  readonly line: LineRuntime | undefined;
  readonly sender: Tp1Sender | undefined;
  /** Active faults and who raised them. */
  readonly faults: Map<string, "device" | "user">;
  /** Acknowledgement answered while a bus fault is active: ACK, BUSY, NAK, or NO_ACK_OCTET when silent. */
  busAnswer: number;
  /** Timer name -> generation of the live timer. */
  readonly timers: Map<string, number>;
  lastTakenTelegramId: number;
}

interface Listener {
  readonly device: DeviceRuntime;
  readonly objects: readonly ObjectRuntime[];
}

interface LineRuntime {
  readonly id: string;
  line: Tp1Line;
  /** Group address -> devices with objects linked to it, in bench order. */
  listeners: Map<number, Listener[]>;
}

interface TimerEntry {
  readonly device: DeviceRuntime;
  readonly name: string;
  readonly generation: number;
  readonly data: unknown;
}

interface LinkMessage {
  readonly unitLink: string;
  readonly from: string;
  readonly to: DeviceRuntime;
  readonly message: unknown;
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
  private readonly rng: Rng;
  private readonly traceLog: Trace;
  private readonly telegramIds = new SequentialIds();
  private readonly timerTag: number;
  private readonly linkTag: number;
  private readonly unitLinkDelayUs: number;
  private readonly reuse: boolean;

  private loadedBench: LoadedBench;
  private readonly lines = new Map<string, LineRuntime>();
  private readonly devices: DeviceRuntime[] = [];
  private readonly deviceById = new Map<string, DeviceRuntime>();
  private readonly testToolSender: Tp1Sender;
  private readonly testToolLine: LineRuntime;
  private readonly brokenUnitLinks = new Set<string>();
  private readonly groupValues = new Map<number, unknown>();
  private timerGeneration = 0;
  private deliveryCount = 0;

  // Decode cache for the frame being delivered: listeners of one DPT share one decode.
  private decodedTelegramId = -1;
  private decodedDpt = "";
  private decodedValue: unknown = undefined;
  private decodedOk = false;

  constructor(bench: LoadedBench, options: SimulationOptions) {
    this.loadedBench = bench;
    this.rng = createRng(options.seed);
    this.traceLog = new Trace({ capacity: options.traceCapacity });
    this.unitLinkDelayUs = options.unitLinkDelayUs ?? UNIT_LINK_DELAY_US;
    this.reuse = options.reuse ?? true;
    if (!Number.isSafeInteger(this.unitLinkDelayUs) || this.unitLinkDelayUs < 0) {
      throw new RangeError(`unitLinkDelayUs ${this.unitLinkDelayUs} is not a non-negative integer`);
    }
    this.timerTag = this.scheduler.register((_, payload) => this.onTimer(payload as TimerEntry));
    this.linkTag = this.scheduler.register((_, payload) =>
      this.onLinkMessage(payload as LinkMessage),
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
        { receiveFrame: (t, r) => this.receiveFrame(runtime, t, r) },
        { historyCapacity: options.historyCapacity },
      );
      this.lines.set(line.id, runtime);
    }
    this.testToolLine = this.lines.get(bench.testToolLine)!;
    this.testToolSender = new Tp1Sender(bench.testToolAddress, undefined, TEST_TOOL_SENDER);

    bench.devices.forEach((loaded, index) => {
      const line = loaded.line === undefined ? undefined : this.lines.get(loaded.line);
      const device: DeviceRuntime = {
        index,
        id: loaded.id,
        loaded,
        type: loaded.type,
        state: loaded.type.initialState(loaded.parameters),
        objects: buildObjects(loaded, this.reuse),
        context: undefined as unknown as DeviceContext<unknown>,
        line,
        sender:
          line === undefined || loaded.individualAddress === undefined
            ? undefined
            : new Tp1Sender(loaded.individualAddress, loaded.id, loaded.id),
        faults: new Map(),
        busAnswer: ACK_OCTET,
        timers: new Map(),
        lastTakenTelegramId: -1,
      };
      device.context = this.makeContext(device);
      this.devices.push(device);
      this.deviceById.set(device.id, device);
    });
    this.rebuildListeners();
    for (const device of this.devices) this.startDevice(device);
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
    return this.deliveryCount;
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
    const device = this.deviceById.get(target);
    if (device !== undefined) return [...device.faults.keys()];
    return this.brokenUnitLinks.has(target) ? [UNIT_LINK_BROKEN] : [];
  }

  /** Last value written or answered on a group address, decoded with the address's DPT; undefined if none yet. */
  groupValue(groupAddress: number | string): unknown {
    const raw = typeof groupAddress === "number" ? groupAddress : parseGroupAddress(groupAddress);
    if (typeof raw === "number") return this.groupValues.get(raw);
    return raw.ok ? this.groupValues.get(raw.value) : undefined;
  }

  /** Bus load and counts over the last `windowUs` µs on a line (the test tool's line by default). */
  busStats(windowUs: number, lineId?: string): BusStats {
    const line = lineId === undefined ? this.testToolLine : this.lines.get(lineId);
    if (line === undefined) throw new RangeError(`busStats: no line "${lineId}"`);
    return line.line.stats(windowUs);
  }

  /** Telegram totals since the start, per destination group address and per sender (device id or "test-tool"). */
  telegramCounts(lineId?: string): {
    readonly byGroupAddress: ReadonlyMap<number, number>;
    readonly bySender: ReadonlyMap<string, number>;
  } {
    const line = lineId === undefined ? this.testToolLine : this.lines.get(lineId);
    if (line === undefined) throw new RangeError(`telegramCounts: no line "${lineId}"`);
    return {
      byGroupAddress: line.line.telegramsByGroupAddress,
      bySender: line.line.telegramsBySender,
    };
  }

  /** The TP1 line model by id (the test tool's line by default), for totals and tests. */
  line(lineId?: string): Tp1Line {
    const line = lineId === undefined ? this.testToolLine : this.lines.get(lineId);
    if (line === undefined) throw new RangeError(`line: no line "${lineId}"`);
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
        this.userAction(
          { action: "button", deviceId: input.device, detail: `${action} ${input.button}` },
          input,
        );
        this.transition(device, { kind: "button", button: input.button, action });
        return ok({ atUs });
      }
      case "set-input": {
        const device = this.deviceById.get(input.device);
        if (device === undefined) return unknownDevice(input.device);
        this.userAction(
          {
            action: "input",
            deviceId: input.device,
            detail: `${input.input} = ${JSON.stringify(input.value)}`,
          },
          input,
        );
        this.transition(device, { kind: "input", input: input.input, value: input.value });
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
    this.userAction({ action: "parameter", deviceId, detail: JSON.stringify(parameters) }, input);
    this.restartDevice(device, loaded.value.deviceById.get(deviceId)!);
    return ok({ atUs });
  }

  // ---------------------------------------------------------------- internals: devices

  private makeContext(device: DeviceRuntime): DeviceContext<unknown> {
    const scheduler = this.scheduler;
    const rng = this.rng;
    const links = device.loaded.unitLinks;
    return {
      get nowUs() {
        return scheduler.nowUs;
      },
      deviceId: device.id,
      // Unit-link-only devices have no address; they see the unprogrammed default 15.15.255.
      individualAddress: device.loaded.individualAddress ?? 0xffff,
      parameters: device.loaded.parameters,
      links,
      objectValue: (object: number) => device.objects.get(object)?.value,
      random: () => rng.next(),
    };
  }

  private startDevice(device: DeviceRuntime): void {
    this.transition(device, { kind: "start" });
    for (const object of device.objects.values()) {
      if (object.flags.readOnInit && object.flags.communication) this.queueRead(device, object);
    }
  }

  private restartDevice(device: DeviceRuntime, loaded: LoadedDevice): void {
    device.loaded = loaded;
    device.objects = buildObjects(loaded, this.reuse);
    device.context = this.makeContext(device);
    device.state = device.type.initialState(loaded.parameters);
    device.timers.clear();
    device.lastTakenTelegramId = -1;
    for (const [fault, by] of [...device.faults]) {
      if (by !== "device") continue;
      device.faults.delete(fault);
      if (this.traceLog.active)
        this.traceLog.append({
          kind: "fault.cleared",
          timeUs: this.nowUs,
          fault,
          by: "device",
          deviceId: device.id,
        });
    }
    this.rebuildListeners();
    this.startDevice(device);
  }

  private rebuildListeners(): void {
    for (const line of this.lines.values()) line.listeners = new Map();
    for (const device of this.devices) {
      if (device.line === undefined) continue;
      const byAddress = new Map<number, ObjectRuntime[]>();
      for (const object of device.objects.values()) {
        for (const raw of object.groupAddresses) {
          const list = byAddress.get(raw) ?? [];
          list.push(object);
          byAddress.set(raw, list);
        }
      }
      for (const [raw, objects] of byAddress) {
        const list = device.line.listeners.get(raw) ?? [];
        list.push({ device, objects });
        device.line.listeners.set(raw, list);
      }
    }
  }

  private transition(device: DeviceRuntime, event: DeviceEvent): void {
    const result = device.type.transition(device.state, event, device.context);
    device.state = result.state;
    if (result.transition !== undefined && this.traceLog.active) {
      this.traceLog.append({
        kind: "device.transition",
        timeUs: this.scheduler.nowUs,
        deviceId: device.id,
        transition: result.transition,
        cause: event.kind,
      });
    }
    const effects = result.effects;
    for (let i = 0; i < effects.length; i++) this.applyEffect(device, effects[i]!);
  }

  private applyEffect(device: DeviceRuntime, effect: DeviceEffect): void {
    switch (effect.kind) {
      case "group.send": {
        const object = this.objectOf(device, effect.object, effect.kind);
        this.store(device, object, effect.value, "send", object.groupAddresses[0]);
        if (!object.flags.communication || !object.flags.transmit) return;
        const destination = object.groupAddresses[0];
        if (destination === undefined) return;
        const encoded = object.codec.encode(effect.value);
        if (!encoded.ok)
          throw new Error(
            `device "${device.id}" object ${object.number}: ${encoded.error.message}`,
          );
        this.queueFromDevice(
          device,
          effect.service === "write" ? "GroupValue_Write" : "GroupValue_Response",
          destination,
          encoded.value,
          object.sizeBits,
        );
        return;
      }
      case "group.read": {
        const object = this.objectOf(device, effect.object, effect.kind);
        if (object.flags.communication) this.queueRead(device, object);
        return;
      }
      case "object.store":
        this.store(
          device,
          this.objectOf(device, effect.object, effect.kind),
          effect.value,
          "store",
          undefined,
        );
        return;
      case "timer.set": {
        if (!Number.isSafeInteger(effect.delayUs) || effect.delayUs < 0) {
          throw new Error(
            `device "${device.id}" timer "${effect.name}": delayUs ${effect.delayUs} is not a non-negative integer`,
          );
        }
        const generation = ++this.timerGeneration;
        device.timers.set(effect.name, generation);
        const entry: TimerEntry = { device, name: effect.name, generation, data: effect.data };
        this.scheduler.schedule(this.scheduler.nowUs + effect.delayUs, this.timerTag, 0, entry);
        return;
      }
      case "timer.cancel":
        device.timers.delete(effect.name);
        return;
      case "link.send":
        this.sendOnUnitLink(device, effect.link, effect.message);
        return;
      case "fault.raise":
        if (!device.faults.has(effect.fault)) {
          device.faults.set(effect.fault, "device");
          if (this.traceLog.active) {
            this.traceLog.append({
              kind: "fault.raised",
              timeUs: this.nowUs,
              fault: effect.fault,
              by: "device",
              deviceId: device.id,
              text: effect.text,
            });
          }
        }
        return;
      case "fault.clear":
        if (device.faults.delete(effect.fault) && this.traceLog.active) {
          this.traceLog.append({
            kind: "fault.cleared",
            timeUs: this.nowUs,
            fault: effect.fault,
            by: "device",
            deviceId: device.id,
          });
        }
        return;
      case "note":
        if (this.traceLog.active)
          this.traceLog.append({
            kind: "device.note",
            timeUs: this.nowUs,
            deviceId: device.id,
            text: effect.text,
          });
        return;
    }
  }

  private objectOf(device: DeviceRuntime, number: number, effect: string): ObjectRuntime {
    const object = device.objects.get(number);
    if (object === undefined)
      throw new Error(
        `device "${device.id}" (${device.type.id}) asked for ${effect} on object ${number}, which it does not have`,
      );
    return object;
  }

  private store(
    device: DeviceRuntime,
    object: ObjectRuntime,
    value: unknown,
    cause: "write" | "response" | "send" | "store",
    groupAddress: number | undefined,
  ): void {
    const previous = object.value;
    if (sameValue(previous, value)) return;
    object.value = value;
    if (this.traceLog.active) {
      this.traceLog.append(
        groupAddress === undefined
          ? {
              kind: "object.changed",
              timeUs: this.scheduler.nowUs,
              deviceId: device.id,
              object: object.number,
              value,
              previous,
              cause,
            }
          : {
              kind: "object.changed",
              timeUs: this.scheduler.nowUs,
              deviceId: device.id,
              object: object.number,
              value,
              previous,
              cause,
              groupAddress,
            },
      );
    }
  }

  private onTimer(entry: TimerEntry): void {
    const device = entry.device;
    if (device.timers.get(entry.name) !== entry.generation) return; // replaced, cancelled or restarted
    device.timers.delete(entry.name);
    if (this.traceLog.active)
      this.traceLog.append({
        kind: "timer.fired",
        timeUs: this.nowUs,
        deviceId: device.id,
        name: entry.name,
      });
    this.transition(
      device,
      entry.data === undefined
        ? { kind: "timer", name: entry.name }
        : { kind: "timer", name: entry.name, data: entry.data },
    );
  }

  // ---------------------------------------------------------------- internals: unit links

  private sendOnUnitLink(device: DeviceRuntime, unitLink: string, message: unknown): void {
    if (!device.loaded.unitLinks.includes(unitLink)) {
      throw new Error(
        `device "${device.id}" sent on unit link "${unitLink}", which it is not a member of`,
      );
    }
    const link = this.loadedBench.unitLinks.find((l) => l.id === unitLink)!;
    for (const memberId of link.members) {
      if (memberId === device.id) continue;
      const to = this.deviceById.get(memberId)!;
      if (this.brokenUnitLinks.has(unitLink)) {
        if (this.traceLog.active)
          this.traceLog.append({
            kind: "link.dropped",
            timeUs: this.nowUs,
            unitLink,
            from: device.id,
            deviceId: memberId,
            message,
          });
        continue;
      }
      const payload: LinkMessage = { unitLink, from: device.id, to, message };
      this.scheduler.schedule(
        this.scheduler.nowUs + this.unitLinkDelayUs,
        this.linkTag,
        0,
        payload,
      );
    }
  }

  private onLinkMessage(message: LinkMessage): void {
    const { unitLink, from, to } = message;
    if (this.brokenUnitLinks.has(unitLink)) {
      if (this.traceLog.active)
        this.traceLog.append({
          kind: "link.dropped",
          timeUs: this.nowUs,
          unitLink,
          from,
          deviceId: to.id,
          message: message.message,
        });
      return;
    }
    if (this.traceLog.active)
      this.traceLog.append({
        kind: "link.delivered",
        timeUs: this.nowUs,
        unitLink,
        from,
        deviceId: to.id,
        message: message.message,
      });
    this.transition(to, { kind: "link.receive", link: unitLink, from, message: message.message });
  }

  // ---------------------------------------------------------------- internals: faults

  private setFault(
    input: Extract<SimInput, { kind: "inject-fault" | "clear-fault" }>,
  ): Result<void, SimError> {
    const target = input.device;
    const faultId = input.fault;
    const active = input.kind === "inject-fault";
    const device = this.deviceById.get(target);
    const action = active ? "fault.inject" : "fault.clear";
    if (device !== undefined) {
      this.userAction({ action, deviceId: target, detail: faultId }, input);
      const had = device.faults.has(faultId);
      if (active && !had) {
        device.faults.set(faultId, "user");
        if (this.traceLog.active)
          this.traceLog.append({
            kind: "fault.raised",
            timeUs: this.nowUs,
            fault: faultId,
            by: "user",
            deviceId: target,
          });
      } else if (!active && had) {
        device.faults.delete(faultId);
        if (this.traceLog.active)
          this.traceLog.append({
            kind: "fault.cleared",
            timeUs: this.nowUs,
            fault: faultId,
            by: "user",
            deviceId: target,
          });
      } else return ok(undefined);
      device.busAnswer = device.faults.has(BUS_FAULTS.silent)
        ? NO_ACK_OCTET
        : device.faults.has(BUS_FAULTS.busy)
          ? BUSY_OCTET
          : device.faults.has(BUS_FAULTS.nak)
            ? NAK_OCTET
            : ACK_OCTET;
      this.transition(
        device,
        active ? { kind: "fault.inject", fault: faultId } : { kind: "fault.clear", fault: faultId },
      );
      return ok(undefined);
    }
    if (this.loadedBench.unitLinks.some((l) => l.id === target)) {
      if (faultId !== UNIT_LINK_BROKEN) {
        return err({
          kind: "sim.fault-unknown",
          field: "fault",
          message: `a unit link only has the fault "${UNIT_LINK_BROKEN}", not "${faultId}"`,
        });
      }
      this.userAction({ action, unitLink: target, detail: faultId }, input);
      if (active === this.brokenUnitLinks.has(target)) return ok(undefined);
      if (active) this.brokenUnitLinks.add(target);
      else this.brokenUnitLinks.delete(target);
      if (this.traceLog.active) {
        this.traceLog.append(
          active
            ? {
                kind: "fault.raised",
                timeUs: this.nowUs,
                fault: faultId,
                by: "user",
                unitLink: target,
              }
            : {
                kind: "fault.cleared",
                timeUs: this.nowUs,
                fault: faultId,
                by: "user",
                unitLink: target,
              },
        );
      }
      return ok(undefined);
    }
    return err({
      kind: "sim.fault-target-unknown",
      field: "device",
      message: `no device or unit link "${target}"`,
    });
  }

  // ---------------------------------------------------------------- internals: bus

  private makeFrame(
    source: number,
    destination: number,
    service: GroupService,
    payload: Uint8Array,
    sizeBits: number,
    priority: Priority,
  ): DataFrame {
    return {
      priority,
      repeated: false,
      source,
      destination,
      addressType: "group",
      hopCount: DEFAULT_HOP_COUNT,
      service,
      payload,
      shortPayload: service !== "GroupValue_Read" && sizeBits <= 6,
    };
  }

  private queueFromDevice(
    device: DeviceRuntime,
    service: GroupService,
    destination: number,
    payload: Uint8Array,
    sizeBits: number,
    priority: Priority = DEFAULT_GROUP_PRIORITY,
  ): number | undefined {
    if (device.sender === undefined || device.line === undefined) return undefined; // unit-link-only device
    if (device.busAnswer === NO_ACK_OCTET) {
      if (this.traceLog.active)
        this.traceLog.append({
          kind: "device.note",
          timeUs: this.nowUs,
          deviceId: device.id,
          text: `not sent: "${BUS_FAULTS.silent}" disconnects the device from the line`,
        });
      return undefined;
    }
    const frame = this.makeFrame(
      device.sender.individualAddress,
      destination,
      service,
      payload,
      sizeBits,
      priority,
    );
    return device.line.line.queue(device.sender, frame, this.telegramIds.next()).id;
  }

  private queueRead(device: DeviceRuntime, object: ObjectRuntime): void {
    if (!object.flags.transmit) return;
    const destination = object.groupAddresses[0];
    if (destination === undefined) return;
    this.queueFromDevice(device, "GroupValue_Read", destination, EMPTY_PAYLOAD, object.sizeBits);
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
      this.userAction(
        { action, deviceId: device.id, groupAddress: raw, detail },
        withTextAddress(input, raw),
      );
      const id = this.queueFromDevice(device, service, raw, payload, ga.sizeBits, priority);
      if (id === undefined)
        return err({
          kind: "sim.device-not-on-line",
          field: "from",
          message: `device "${options.from}" is disconnected ("${BUS_FAULTS.silent}")`,
        });
      return ok(id);
    }
    this.userAction({ action, groupAddress: raw, detail }, withTextAddress(input, raw));
    const frame = this.makeFrame(
      this.loadedBench.testToolAddress,
      raw,
      service,
      payload,
      ga.sizeBits,
      priority,
    );
    return ok(this.testToolLine.line.queue(this.testToolSender, frame, this.telegramIds.next()).id);
  }

  /** End of a frame on a line: acknowledge, take, store, hand to devices. Returns the wired-AND acknowledgement. */
  private receiveFrame(line: LineRuntime, telegram: Telegram, repeated: boolean): number {
    const frame = telegram.frame;
    const destination = frame.destination;
    const service = frame.service;
    if (telegram.transmissions === 1 && service !== "GroupValue_Read")
      this.recordGroupValue(destination, frame.payload);
    const listeners = line.listeners.get(destination);
    if (listeners === undefined) return NO_ACK_OCTET;
    let answer = NO_ACK_OCTET;
    const senderDeviceId = telegram.sender.deviceId;
    for (let i = 0; i < listeners.length; i++) {
      const { device, objects } = listeners[i]!;
      if (device.id === senderDeviceId) continue;
      const busAnswer = device.busAnswer;
      if (busAnswer !== ACK_OCTET) {
        answer &= busAnswer; // NO_ACK_OCTET (silent) leaves the line alone
        continue;
      }
      answer &= ACK_OCTET;
      // Already took an earlier transmission of this telegram: acknowledge, ignore.
      if (
        repeated &&
        (device.lastTakenTelegramId === telegram.id || telegram.takenBy?.includes(device) === true)
      )
        continue;
      device.lastTakenTelegramId = telegram.id;
      for (let j = 0; j < objects.length; j++)
        this.deliver(device, objects[j]!, telegram, destination, service);
    }
    if (answer !== ACK_OCTET) {
      // A repetition will follow. Frames from other senders may pass in between and
      // overwrite `lastTakenTelegramId`, so remember on the telegram who took this one.
      for (let i = 0; i < listeners.length; i++) {
        const device = listeners[i]!.device;
        if (device.lastTakenTelegramId !== telegram.id) continue;
        const takenBy = (telegram.takenBy ??= []);
        if (!takenBy.includes(device)) takenBy.push(device);
      }
    }
    return answer;
  }

  private deliver(
    device: DeviceRuntime,
    object: ObjectRuntime,
    telegram: Telegram,
    destination: number,
    service: GroupService,
  ): void {
    const flags = object.flags;
    if (!flags.communication) return;
    if (service === "GroupValue_Read") {
      if (!flags.read) return;
      let payload: Uint8Array;
      if (object.value === undefined)
        payload = new Uint8Array(object.sizeBits <= 6 ? 1 : Math.ceil(object.sizeBits / 8));
      else {
        const encoded = object.codec.encode(object.value);
        if (!encoded.ok)
          throw new Error(
            `device "${device.id}" object ${object.number} holds a value its DPT refuses: ${encoded.error.message}`,
          );
        payload = encoded.value;
      }
      this.queueFromDevice(device, "GroupValue_Response", destination, payload, object.sizeBits);
      return;
    }
    const isWrite = service === "GroupValue_Write";
    if (isWrite ? !flags.write : !flags.update) return;
    if (this.decodedTelegramId !== telegram.id || this.decodedDpt !== object.dpt) {
      const decoded = object.codec.decode(telegram.frame.payload);
      this.decodedTelegramId = telegram.id;
      this.decodedDpt = object.dpt;
      this.decodedOk = decoded.ok;
      this.decodedValue = decoded.ok ? decoded.value : decoded.error.message;
    }
    if (!this.decodedOk) {
      if (this.traceLog.active)
        this.traceLog.append({
          kind: "device.note",
          timeUs: this.nowUs,
          deviceId: device.id,
          text: `object ${object.number}: ${String(this.decodedValue)}`,
        });
      return;
    }
    const value = this.decodedValue;
    this.deliveryCount++;
    this.store(device, object, value, isWrite ? "write" : "response", destination);
    this.transition(
      device,
      isWrite
        ? { kind: "group.write", object: object.number, value, source: telegram.frame.source }
        : { kind: "group.response", object: object.number, value, source: telegram.frame.source },
    );
  }

  private recordGroupValue(destination: number, payload: Uint8Array): void {
    const ga = this.loadedBench.groupAddresses.get(destination);
    if (ga === undefined) return;
    const decoded = getDpt(ga.dpt)!.decode(payload);
    if (decoded.ok) this.groupValues.set(destination, decoded.value);
  }

  private userAction(
    fields: {
      action: Extract<TraceEvent, { kind: "user.action" }>["action"];
      deviceId?: string;
      unitLink?: string;
      groupAddress?: number;
      detail: string;
    },
    input: SimInput,
  ): void {
    if (this.traceLog.active)
      this.traceLog.append({ kind: "user.action", timeUs: this.nowUs, ...fields, input });
  }
}

const EMPTY_PAYLOAD: Uint8Array = new Uint8Array(0);

function buildObjects(loaded: LoadedDevice, reuse: boolean): Map<number, ObjectRuntime> {
  const objects = new Map<number, ObjectRuntime>();
  for (const spec of objectSpecs(loaded, reuse)) {
    objects.set(spec.number, {
      number: spec.number,
      dpt: spec.dpt,
      codec: spec.codec,
      sizeBits: spec.sizeBits,
      flags: spec.flags,
      groupAddresses: spec.groupAddresses,
      value: undefined,
    });
  }
  return objects;
}

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

/** Equality for DPT values: primitives, and flat objects such as {control, value} or {r, g, b}. */
function sameValue(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== "object" || typeof b !== "object" || a === null || b === null) return false;
  const keysA = Object.keys(a);
  if (keysA.length !== Object.keys(b).length) return false;
  for (const key of keysA)
    if ((a as Record<string, unknown>)[key] !== (b as Record<string, unknown>)[key]) return false;
  return true;
}
