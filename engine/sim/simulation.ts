import { parseGroupAddress } from "../address";
import { loadBench, type BenchError, type LoadedBench } from "../bench";
import type { Bench, BenchInput } from "../bench/bench-schema";
import { SequentialIds } from "../core/ids";
import { runArray } from "../core/run-objects";
import { ok, type Result } from "../core/result";
import { createRng, type Rng } from "../core/rng";
import { Scheduler } from "../core/scheduler";
import { Trace, type TraceEvent, type TraceListener } from "../core/trace";
import { ACK_OCTET, type Priority } from "../frame";
import { copiedTelegram, Tp1Line, Tp1Sender, type BusStats, type Telegram } from "../bus";
import { DeviceRunner, type DeviceRuntime } from "./device-runtime";
import { FaultRegistry } from "./fault-registry";
import { GroupObjectLayer, RunningLine, type LineRuntime } from "./group-objects";
import { InputDispatch } from "./input-dispatch";
import { RoomClimate } from "./room-climate";
import type { SimError } from "./sim-error";
import type { Receipt, SimInput } from "./sim-input";
import { TraceEmitter, type FaultSource } from "./trace-emitter";
import { UNIT_LINK_DELAY_US, UnitLinkMedium } from "./unit-link-medium";
import { SimulationDispatchRuntime, SimulationLineHost } from "./simulation-hosts";
import { CouplerNetwork, type CouplerCounts } from "./couplers";

export { BUS_FAULTS, UNIT_LINK_BROKEN } from "./fault-registry";
export { DEFAULT_GROUP_PRIORITY } from "./group-objects";
export { UNIT_LINK_DELAY_US } from "./unit-link-medium";

type JsonValue = Extract<SimInput, { kind: "write" }>["value"];

/**
 * The simulation facade the UI, the scenario runner and the CLI all use: the
 * virtual clock, the trace, state queries and `apply`, the one entry point for
 * inputs from outside. The work is done by its parts:
 *
 * - InputDispatch (input-dispatch.ts): checks and applies inputs from outside.
 * - DeviceRunner (device-runtime.ts): transitions, effects, timers.
 * - GroupObjectLayer (group-objects.ts): flags, sending, listening, values.
 * - UnitLinkMedium (unit-link-medium.ts): messages between unit-link members.
 * - FaultRegistry (fault-registry.ts): active faults and who raised them.
 * - RoomClimate (room-climate.ts): each room once, read by every device in it.
 * - TraceEmitter (trace-emitter.ts): every event the runtime records.
 * - simulation-hosts.ts: what a line and the input dispatch reach the parts through.
 *
 * Each bench line is its own medium. Couplers (devices of type "coupler")
 * join a line to the line above and pass telegrams between them
 * (engine/sim/couplers); lines with no coupler between them stay apart. The
 * test tool sits on the line matching its individual address (else the first
 * line).
 *
 * Faults the runtime itself interprets on a device (`BUS_FAULTS`): "bus.busy"
 * and "bus.nak" make the device answer BUSY / NAK and not take the frame;
 * "bus.silent" disconnects it (no acknowledgement, no reception, nothing sent);
 * clearing it is bus power returning: the device runs its start-up sequence
 * (device-runtime.ts `powerReturn`).
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
 * a bad one throws `BenchLoadFailure`). Devices get their `start` event at
 * virtual time 0; statuses and read-on-init reads follow after each device's
 * start-up delay (at once for types without one).
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
  private readonly scheduler: Scheduler;
  private readonly traceLog: Trace;
  private readonly emitter: TraceEmitter;
  private readonly faults: FaultRegistry;
  private readonly objects: GroupObjectLayer;
  private readonly runner: DeviceRunner;
  private readonly unitLinks: UnitLinkMedium<DeviceRuntime>;
  private readonly telegramIds = new SequentialIds();
  private readonly reuse: boolean;
  private readonly options: SimulationOptions;
  private readonly rng: Rng;
  private readonly climate: RoomClimate;

  private loadedBench: LoadedBench;
  private readonly lines = new Map<string, LineRuntime>();
  private readonly devices: readonly DeviceRuntime[];
  private readonly deviceById = new Map<string, DeviceRuntime>();
  private readonly testToolSender: Tp1Sender;
  private readonly testToolLine: LineRuntime;
  private readonly inputs: InputDispatch;
  private readonly couplers: CouplerNetwork;

  /**
   * Starts a run of `bench`. With `original` (see `fork`) it starts from that
   * run as it stands instead: nothing is started, everything is copied.
   */
  constructor(bench: LoadedBench, options: SimulationOptions, original?: Simulation) {
    // Starts small and grows: a replay usually holds a few dozen pending events, and a
    // fresh run should cost little; a fork takes over its original's queue whole.
    this.scheduler = new Scheduler(original === undefined ? 64 : 0);
    this.climate = new RoomClimate(this.scheduler);
    this.loadedBench = bench;
    this.options = options;
    this.reuse = options.reuse ?? true;
    this.rng = createRng(options.seed, original?.rng.state());
    this.traceLog = new Trace({ capacity: options.traceCapacity });
    this.emitter = new TraceEmitter(this.traceLog, this.scheduler);
    this.faults = new FaultRegistry(
      this.emitter,
      // A fork copies the fault table whole.
      original === undefined ? bench.devices.map((d) => d.id) : [],
    );
    const benchNow = () => this.loadedBench;
    this.objects = new GroupObjectLayer(this.emitter, this.telegramIds, benchNow, this.reuse);
    this.runner = new DeviceRunner(
      this.scheduler,
      this.rng,
      this.emitter,
      this.faults,
      this.objects,
      () => this.unitLinks,
      this.reuse,
      this.climate,
    );
    if (original === undefined)
      for (const room of bench.rooms) this.climate.define(room.id, room.spec);
    this.objects.receiver = this.runner;
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
      const runtime = new RunningLine(line.id);
      runtime.line = new Tp1Line(
        line.id,
        this.scheduler,
        this.traceLog,
        new SimulationLineHost(runtime, this.objects, () => this.couplers),
        { historyCapacity: options.historyCapacity },
      );
      this.lines.set(line.id, runtime);
    }
    this.testToolLine = this.lines.get(bench.testToolLine)!;
    this.testToolSender = new Tp1Sender(bench.testToolAddress, undefined, TEST_TOOL_SENDER);

    const devices = runArray<DeviceRuntime>();
    bench.devices.forEach((loaded, index) => {
      const line = loaded.line === undefined ? undefined : this.lines.get(loaded.line);
      const sender =
        line === undefined || loaded.individualAddress === undefined
          ? undefined
          : new Tp1Sender(loaded.individualAddress, loaded.id, loaded.id);
      const device =
        original === undefined
          ? this.runner.create(index, loaded, line, sender, ACK_OCTET)
          : this.runner.copy(original.devices[index]!, line, sender);
      devices.push(device);
      this.deviceById.set(device.id, device);
    });
    this.devices = devices;
    this.objects.rebuildListeners(this.lines.values(), bench, this.devices);
    this.couplers = new CouplerNetwork(
      bench,
      this.lines,
      this.traceLog,
      this.scheduler,
      this.telegramIds,
      (id) => this.deviceById.get(id)!.busAnswer,
      this.devices,
    );
    this.inputs = new InputDispatch(
      new SimulationDispatchRuntime(
        this.scheduler,
        this.emitter,
        this.faults,
        this.objects,
        this.runner,
        this.deviceById,
        this.reuse,
        benchNow,
        (next) => (this.loadedBench = next),
        () => {
          this.objects.rebuildListeners(this.lines.values(), this.loadedBench, this.devices);
          this.couplers.refresh(this.loadedBench);
        },
        (frame) =>
          this.testToolLine.line.queue(this.testToolSender, frame, this.telegramIds.next()).id,
      ),
    );
    if (original === undefined) for (const device of this.devices) this.runner.start(device);
    else this.copyFrom(original);
  }

  /**
   * A copy of this run as it stands, which then runs on its own: the same
   * future for the same inputs, and this run is left untouched. Scenario
   * replays start from a fork of a run that has already settled.
   */
  fork(): Simulation {
    return new Simulation(this.loadedBench, this.options, this);
  }

  /** Takes over every part's state from `original` (a run of the same bench with the same options). */
  private copyFrom(original: Simulation): void {
    this.traceLog.copyFrom(original.traceLog);
    this.faults.copyFrom(original.faults);
    this.climate.copyFrom(original.climate);
    this.objects.copyFrom(original.objects);
    this.telegramIds.copyFrom(original.telegramIds);
    this.runner.copyTimerGeneration(original.runner);
    // Telegrams are mutable (repetitions, who took them), so each gets one copy shared by its queue and its line.
    const telegrams = new Map<Telegram, Telegram>();
    this.testToolSender.copyFrom(original.testToolSender, (t) =>
      this.copyTelegram(original, telegrams, t),
    );
    this.devices.forEach((d, index) =>
      d.sender?.copyFrom(original.devices[index]!.sender!, (t) =>
        this.copyTelegram(original, telegrams, t),
      ),
    );
    this.couplers.copyFrom(original.couplers, (t) => this.copyTelegram(original, telegrams, t));
    for (const [id, line] of this.lines)
      line.line.copyFrom(
        original.lines.get(id)!.line,
        (sender) => this.sender(original, sender),
        (t) => this.copyTelegram(original, telegrams, t),
      );
    this.scheduler.copyFrom(original.scheduler, (tag, payload) => {
      if (tag === this.runner.timerTag)
        return this.runner.copyTimer(payload, (from) => this.devices[from.index]!);
      if (tag === this.unitLinks.tag) return this.unitLinks.copyMessage(payload);
      throw new Error(`Simulation.fork: no copy for a queued event with tag ${tag}`);
    });
  }

  /** This run's copy of a telegram of `original` (one per telegram, kept in `copies`). */
  private copyTelegram(
    original: Simulation,
    copies: Map<Telegram, Telegram>,
    telegram: Telegram,
  ): Telegram {
    let copy = copies.get(telegram);
    if (copy === undefined) {
      copy = copiedTelegram(
        telegram,
        this.sender(original, telegram.sender),
        telegram.takenBy?.map(
          (taker) =>
            this.couplers.portLike(original.couplers, taker) ??
            this.devices[(taker as DeviceRuntime).index]!,
        ),
      );
      copies.set(telegram, copy);
    }
    return copy;
  }

  /** This run's sender matching a sender of `original`. */
  private sender(original: Simulation, sender: Tp1Sender): Tp1Sender {
    if (sender === original.testToolSender) return this.testToolSender;
    const coupler = this.couplers.senderLike(original.couplers, sender);
    if (coupler !== undefined) return coupler;
    return this.deviceById.get(sender.deviceId!)!.sender!;
  }

  // ---------------------------------------------------------------- clock

  /** Virtual time now, integer µs since the start of the run. */
  get nowUs(): number {
    return this.scheduler.nowUs;
  }

  /** Virtual time of the next scheduled event, µs; Infinity when nothing is scheduled. */
  get nextEventUs(): number {
    return this.scheduler.peekTimeUs();
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
    const device = this.deviceById.get(deviceId);
    const spec = device?.objects.get(object);
    return spec === undefined ? undefined : device!.values[spec.slot];
  }

  /** Air temperature now of a room (a bench room id, or "device:<id>" for a device's own room), °C. */
  roomTemperatureC(roomId: string): number {
    return this.climate.temperatureC(roomId);
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

  /** Telegrams each coupler forwarded and dropped (by reason) since the start, by coupler device id. */
  couplerCounts(): ReadonlyMap<string, Readonly<CouplerCounts>> {
    return this.couplers.counts();
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
    return this.inputs.apply(input);
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
