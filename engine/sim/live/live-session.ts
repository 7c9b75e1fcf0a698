import { formatGroupAddress, formatIndividualAddress } from "../../address";
import { loadBench, type LoadedBench } from "../../bench";
import type { TraceEvent } from "../../core/trace";
import { getDpt } from "../../dpt";
import { DEFAULT_HOP_COUNT, describeTelegram, fromHex, type DataFrame } from "../../frame";
import { TraceRecorder, type RecordedAction } from "../../scenario/recorder";
import type { Result } from "../../core/result";
import type { SimError } from "../sim-error";
import { Simulation } from "../simulation";
import { summarizeBench } from "./bench-summary";
import { formatLineAddress } from "../../topology/line-address";
import { COUPLER_TYPE_ID } from "../../devices/coupler/coupler";
import {
  parseSimCommand,
  type Ack,
  type ActiveFault,
  type AddressRateSample,
  type BusLoadSample,
  type CouplerTotals,
  type DeviceSnapshot,
  type LogRow,
  type ParsedSimCommand,
  type RoomSample,
  type RoomUnitSample,
  type SceneDryRunResult,
  type SimClock,
  type SimMessage,
  type SimSpeed,
} from "./live-protocol";

export interface LiveSessionOptions {
  /** Where messages for the page go (postMessage in the worker). */
  readonly post: (message: SimMessage) => void;
  /** Wall clock in milliseconds (performance.now in the worker; a fake in tests). */
  readonly now: () => number;
  /** Most log rows in one batch message. */
  readonly maxRowsPerBatch?: number;
  /** Rows kept waiting for the page; older ones are dropped (and counted) beyond this. */
  readonly backlogCapacity?: number;
  /** Wall time one tick may spend running the simulation, ms. */
  readonly tickBudgetMs?: number;
  /**
   * Called with every new simulation the session starts (load, reset), before
   * its first message: a host that attaches to the line (a KNXnet/IP endpoint)
   * follows the session to the new run this way.
   */
  readonly onSimulation?: (sim: Simulation) => void;
  /** Log rows `currentState` carries for a viewer who arrives late (the newest are kept). */
  readonly recentRows?: number;
}

/**
 * Defaults: the worker ticks every 50 ms, so 5,000 rows a batch is 100,000 rows a second at most.
 * (A 25 ms tick with half the rows was tried: the page's per-batch cost doubled and Max speed
 * had five times the long tasks, while an input no longer waits for a tick anyway.)
 */
export const DEFAULT_MAX_ROWS_PER_BATCH = 5_000;
export const DEFAULT_BACKLOG_CAPACITY = 100_000;
/**
 * Wall time one tick may run the simulation. A command that arrives meanwhile waits for the tick
 * to end (the worker has one thread), so this bounds how long a press waits before it is applied;
 * it also leaves the page's main thread more room at Max speed (30 % of the wall time, was 60 %).
 */
export const DEFAULT_TICK_BUDGET_MS = 15;
/** Rows a late viewer gets: about as many as the console's log shows without scrolling far. */
export const DEFAULT_RECENT_ROWS = 500;

const SECOND_US = 1_000_000;
/** "max" runs at most this many virtual seconds per tick (a quiet bench would otherwise race through hours). */
const MAX_SECONDS_PER_TICK = 600;
/** Chart samples kept waiting between batches; older ones would scroll off the charts anyway. */
const MAX_PENDING_SAMPLES = 600;
/**
 * At Max speed an input is followed at once by this much virtual time (wall budget permitting)
 * and a batch, so the telegrams it causes and the answers to them reach the page without
 * waiting for the next tick: 1 s covers a command, the unit link and the status telegram back.
 */
const INPUT_SLICE_US = SECOND_US;

/**
 * The live session: one simulation for the live console (in the browser's
 * worker, or in a server process), driven by commands, and turns its
 * trace into batches for the page: log rows (each telegram once its
 * acknowledgement is known), snapshots of the devices that changed, active
 * faults, and chart samples taken at whole virtual seconds.
 *
 * Virtual time follows wall time at the chosen speed: at 10x, 50 ms of wall
 * time runs 500 ms of virtual time. When the simulation cannot keep up inside
 * its tick budget, the mapping is re-anchored rather than letting a debt pile
 * up. "max" runs whole virtual seconds until the budget is spent or a batch's
 * worth of rows is waiting, which is the back-pressure that keeps the page fed
 * but never flooded.
 *
 * Pure apart from the two functions it is given (where messages go, and the
 * wall clock), so it runs unchanged in a Worker, in a Node process, and in a
 * test with a fake clock. It names no device type: charts come from the
 * types' own `roomSample` hook.
 */
export class LiveSession {
  private readonly post: (message: SimMessage) => void;
  private readonly now: () => number;
  private readonly maxRowsPerBatch: number;
  private readonly backlogCapacity: number;
  private readonly tickBudgetMs: number;
  private readonly onSimulation: ((sim: Simulation) => void) | undefined;
  private readonly recentCapacity: number;

  private document: unknown = undefined;
  private seed = 1;
  private sim: Simulation | undefined;
  private loaded: LoadedBench | undefined;
  private unsubscribe: (() => void) | undefined;

  private running = false;
  private speed: SimSpeed = 1;
  private anchorUs = 0;
  private anchorWallMs = 0;
  private lastPostedClock = "";
  /** Rows already posted, newest last, for `currentState` (at most `recentCapacity`). */
  private recent: LogRow[] = [];
  /** Individual addresses of KNXnet/IP tunnels: their telegrams are marked in the log. */
  private tunnelSources: ReadonlySet<number> = new Set();

  private rowSeq = 0;
  private batchSeq = 0;
  private backlog: LogRow[] = [];
  private backlogHead = 0;
  private dropped = 0;
  /** Rows whose transmission has not ended yet, by telegram id. */
  private readonly awaiting = new Map<number, LogRow>();
  /** Line id -> line address ("1.2"), for rows and samples. */
  private lineAddresses = new Map<string, string>();
  /** Routing counter of forwarded telegrams not yet on their line, by forwarded telegram id. */
  private readonly forwardedHopCount = new Map<number, number>();
  /** Device ids of the bench's couplers: what they send is a copy of someone else's telegram. */
  private couplerIds: ReadonlySet<string> = new Set();
  /**
   * Telegrams per destination address by the virtual second their frame started in, as their
   * senders sent them: first transmissions only, a coupler's copy on another line not counted
   * again. Seconds not yet sampled (a step can run past a second's end before it is sampled).
   */
  private secondCounts = new Map<number, Map<string, number>>();
  /** What each coupler forwarded, held and dropped since the run started, by coupler id. */
  private couplerTotals = new Map<string, CouplerTotals>();
  private couplersDirty = false;

  private readonly dirtyDevices = new Set<string>();
  private readonly transitions = new Map<string, { name: string; atUs: number }>();
  private faultsDirty = false;

  private roomSample: RoomSample[] | undefined;
  private busLoad: BusLoadSample[] = [];
  private rates: AddressRateSample[] = [];

  private recorder: TraceRecorder | undefined;
  /** Devices that took a telegram or changed during a scene dry-run; undefined outside one. */
  private responders: Set<string> | undefined;

  constructor(options: LiveSessionOptions) {
    this.post = options.post;
    this.now = options.now;
    this.maxRowsPerBatch = options.maxRowsPerBatch ?? DEFAULT_MAX_ROWS_PER_BATCH;
    this.backlogCapacity = options.backlogCapacity ?? DEFAULT_BACKLOG_CAPACITY;
    this.tickBudgetMs = options.tickBudgetMs ?? DEFAULT_TICK_BUDGET_MS;
    this.onSimulation = options.onSimulation;
    this.recentCapacity = options.recentRows ?? DEFAULT_RECENT_ROWS;
  }

  /** The running simulation (undefined before a bench loaded); a host reads the line through it. */
  get simulation(): Simulation | undefined {
    return this.sim;
  }

  /**
   * Runs the simulation up to the wall clock now without posting anything, so
   * something queued from outside between ticks (a tunnel's frame) starts at
   * the present virtual time. The next tick posts what happened.
   */
  advanceToNow(): void {
    this.advance();
  }

  /** Marks telegrams sent from these individual addresses (KNXnet/IP tunnels) in the log's `tunnel` field. */
  setTunnelSources(addresses: Iterable<number>): void {
    this.tunnelSources = new Set(addresses);
  }

  /**
   * The whole current state as messages for a viewer who arrives now (a
   * server session's new watcher): the bench ("loaded", fresh), then one batch
   * with every device, every active fault, the latest chart samples and the
   * recent log rows already posted to others. Rows still waiting go out with
   * the next tick's batch to everyone, so a late viewer sees each row once.
   * Nothing of the session changes; empty before a bench is loaded.
   */
  currentState(): SimMessage[] {
    const sim = this.sim;
    const loaded = this.loaded;
    if (sim === undefined || loaded === undefined) return [];
    const clock = this.clock();
    return [
      {
        type: "loaded",
        bench: summarizeBench(loaded),
        document: loaded.bench,
        clock,
        fresh: true,
      },
      {
        type: "batch",
        seq: this.batchSeq,
        clock,
        rows: this.recent.slice(-this.recentCapacity),
        dropped: 0,
        devices: loaded.devices.map((device) => this.snapshot(sim, device.id)),
        faults: this.activeFaults(sim),
        rooms: this.roomSamples(sim),
        busLoad: [],
        rates: [],
        ...(this.couplerTotals.size > 0 ? { couplers: this.couplerList() } : {}),
      },
    ];
  }

  /** Virtual time now, µs (0 before a bench is loaded). */
  get nowUs(): number {
    return this.sim?.nowUs ?? 0;
  }

  /** Rows waiting for the next batch. */
  get backlogLength(): number {
    return this.backlog.length - this.backlogHead;
  }

  /** Handles one command from the page; a bad one comes back as a command-error naming the field. */
  handle(raw: unknown): void {
    const parsed = parseSimCommand(raw);
    if (!parsed.ok) {
      const type =
        typeof raw === "object" && raw !== null ? String((raw as { type?: unknown }).type) : "?";
      this.post({
        type: "command-error",
        command: type,
        field: parsed.field,
        message: parsed.message,
      });
      return;
    }
    const command = parsed.value;
    if (command.type === "load") {
      this.document = command.bench;
      this.seed = command.seed;
      this.start(true);
      return;
    }
    const sim = this.sim;
    if (sim === undefined) {
      this.post({
        type: "command-error",
        command: command.type,
        field: "type",
        message: "no bench is loaded yet",
      });
      return;
    }
    this.run(sim, command);
    if (command.type === "input") this.answer(sim);
  }

  /** Advances the simulation for the wall time that passed and posts one batch; the worker calls this every 50 ms. */
  tick(): void {
    this.advance();
    this.flush();
  }

  /**
   * An input jumps the queue: its effects go to the page now rather than with the next tick.
   * At Max speed virtual time is not tied to the wall, so a short slice runs first for the
   * answers to arrive (a status telegram); at a paced speed the tick keeps the pace and only
   * what already changed is sent.
   */
  private answer(sim: Simulation): void {
    if (this.running && this.speed === "max")
      this.runTo(sim.nowUs + INPUT_SLICE_US, this.now() + this.tickBudgetMs);
    this.flush();
  }

  // ---------------------------------------------------------------- commands

  private run(sim: Simulation, command: Exclude<ParsedSimCommand, { type: "load" }>): void {
    switch (command.type) {
      case "play":
        this.speed = command.speed;
        this.running = true;
        this.anchor();
        return;
      case "pause":
        this.running = false;
        return;
      case "step": {
        this.running = false;
        const beforeUs = sim.nowUs;
        if (!sim.step()) {
          this.post({
            type: "command-error",
            command: "step",
            field: "type",
            message: "nothing is scheduled",
          });
          return;
        }
        if (Math.floor(sim.nowUs / SECOND_US) > Math.floor(beforeUs / SECOND_US)) {
          this.sampleSecond(Math.floor(sim.nowUs / SECOND_US) * SECOND_US);
        }
        return;
      }
      case "jump":
        this.runTo(sim.nowUs + command.durationUs, Infinity);
        this.anchor();
        return;
      case "reset":
        this.start(true);
        return;
      case "input": {
        const result = sim.apply(command.input);
        if (!result.ok) {
          const { field, message } = result.error;
          this.post({
            type: "command-error",
            command: command.command,
            field: command.fields[field] ?? field,
            message,
          });
          return;
        }
        const input = command.input;
        if (input.kind === "set-parameter" || input.kind === "set-parameters") {
          this.loaded = sim.bench;
          this.dirtyDevices.add(input.device);
          this.post({
            type: "loaded",
            bench: summarizeBench(sim.bench),
            document: sim.bench.bench,
            clock: this.clock(),
            fresh: false,
          });
        } else if (input.kind === "inject-fault" || input.kind === "clear-fault") {
          this.faultsDirty = true;
        }
        return;
      }
      case "flood": {
        // The test tool queues every telegram at once; the line sends them back to back, which is what a flood is.
        // A flood is load, not an action to replay: the recorder does not see its writes.
        const recorder = this.recorder;
        this.recorder = undefined;
        try {
          for (let i = 0; i < command.count; i++) {
            if (this.refused("flood", sim.sendGroupWrite(command.groupAddress, command.value)))
              return;
          }
        } finally {
          this.recorder = recorder;
        }
        return;
      }
      case "record":
        if (command.on) {
          const groupAddresses = sim.bench.groupAddresses;
          this.recorder = new TraceRecorder((raw) => groupAddresses.get(raw)?.dpt);
        } else {
          const actions: RecordedAction[] = this.recorder?.actions() ?? [];
          this.recorder = undefined;
          this.post({
            type: "recording",
            on: false,
            actions,
            settleUs: actions[0]?.action.atUs ?? sim.nowUs,
          });
          return;
        }
        this.post({ type: "recording", on: true, actions: [], settleUs: 0 });
        return;
      case "scene-dry-run":
        this.sceneDryRun(sim, command.groupAddress, command.scene, command.settleUs);
        return;
    }
  }

  /** Posts the error of a refused request; true when it was refused. */
  private refused(command: string, result: Result<unknown, SimError>): boolean {
    if (result.ok) return false;
    this.post({
      type: "command-error",
      command,
      field: result.error.field,
      message: result.error.message,
    });
    return true;
  }

  // ---------------------------------------------------------------- lifecycle

  private start(fresh: boolean): void {
    this.unsubscribe?.();
    this.unsubscribe = undefined;
    this.sim = undefined;
    this.running = false;
    this.backlog = [];
    this.backlogHead = 0;
    this.dropped = 0;
    this.awaiting.clear();
    this.dirtyDevices.clear();
    this.transitions.clear();
    this.roomSample = undefined;
    this.busLoad = [];
    this.rates = [];
    this.rowSeq = 0;
    this.recent = [];
    if (this.recorder !== undefined) {
      this.recorder = undefined;
      this.post({ type: "recording", on: false, actions: [], settleUs: 0 });
    }
    const loaded = loadBench(this.document);
    if (!loaded.ok) {
      this.loaded = undefined;
      this.post({
        type: "load-failed",
        errors: loaded.error.map((e) => ({ message: e.message, path: e.path })),
      });
      return;
    }
    this.loaded = loaded.value;
    this.lineAddresses = new Map(
      loaded.value.lines.map((line) => [line.id, formatLineAddress(line.lineAddress)]),
    );
    this.forwardedHopCount.clear();
    this.couplerIds = new Set(
      loaded.value.devices.filter((d) => d.type.id === COUPLER_TYPE_ID).map((d) => d.id),
    );
    this.secondCounts = new Map();
    this.couplerTotals = new Map(
      [...this.couplerIds].map((id) => [
        id,
        {
          id,
          forwarded: 0,
          held: 0,
          dropped: {
            filter: 0,
            blocked: 0,
            "hop-count": 0,
            "queue-full": 0,
            "not-acknowledged": 0,
          },
        },
      ]),
    );
    this.couplersDirty = this.couplerTotals.size > 0;
    // Nothing is kept inside the engine: the host takes every event as it happens.
    const sim = new Simulation(loaded.value, { seed: this.seed, traceCapacity: 0 });
    this.sim = sim;
    this.unsubscribe = sim.subscribe((event) => this.onTrace(event));
    this.onSimulation?.(sim);
    for (const device of loaded.value.devices) this.dirtyDevices.add(device.id);
    this.faultsDirty = true;
    this.anchor();
    this.post({
      type: "loaded",
      bench: summarizeBench(loaded.value),
      document: loaded.value.bench,
      clock: this.clock(),
      fresh,
    });
    this.sampleRooms();
    this.flush();
  }

  private anchor(): void {
    this.anchorUs = this.sim?.nowUs ?? 0;
    this.anchorWallMs = this.now();
  }

  private clock(): SimClock {
    return { nowUs: this.sim?.nowUs ?? 0, running: this.running, speed: this.speed };
  }

  // ---------------------------------------------------------------- running

  private advance(): void {
    const sim = this.sim;
    if (sim === undefined || !this.running) return;
    const startMs = this.now();
    const deadlineMs = startMs + this.tickBudgetMs;
    if (this.speed === "max") {
      for (
        let s = 0;
        s < MAX_SECONDS_PER_TICK &&
        this.backlogLength < this.maxRowsPerBatch &&
        this.now() < deadlineMs;
        s++
      ) {
        this.runTo(Math.floor(sim.nowUs / SECOND_US) * SECOND_US + SECOND_US, deadlineMs);
      }
      return;
    }
    const targetUs = this.anchorUs + Math.floor((startMs - this.anchorWallMs) * 1000 * this.speed);
    if (targetUs <= sim.nowUs) return;
    // Behind: start counting again from here instead of racing to catch up.
    if (!this.runTo(targetUs, deadlineMs)) this.anchor();
  }

  /** Runs to `targetUs` in steps that end on whole seconds (for the per-second samples). False if the deadline cut it short. */
  private runTo(targetUs: number, deadlineMs: number): boolean {
    const sim = this.sim!;
    while (sim.nowUs < targetUs) {
      const boundaryUs = Math.floor(sim.nowUs / SECOND_US) * SECOND_US + SECOND_US;
      const nextUs = Math.min(boundaryUs, targetUs);
      sim.runUntil(nextUs);
      if (nextUs === boundaryUs) this.sampleSecond(boundaryUs);
      if (deadlineMs !== Infinity && this.now() >= deadlineMs) return sim.nowUs >= targetUs;
    }
    return true;
  }

  /** Samples taken when virtual second `endUs / 1 s` ends: bus load and telegram counts per address, room temperatures. */
  private sampleSecond(endUs: number): void {
    const sim = this.sim!;
    const loaded = this.loaded!;
    const second = endUs / SECOND_US - 1;
    for (const line of loaded.lines) {
      const stats = sim.busStats(SECOND_US, line.id);
      this.busLoad.push({
        second,
        line: line.id,
        lineAddress: formatLineAddress(line.lineAddress),
        loadPercent: stats.loadPercent,
        telegrams: stats.telegrams,
      });
    }
    // Not the lines' own per-address counts: summed over lines they count a forwarded telegram
    // once per line (and a frame still on the line when a second ends in neither second).
    for (const [at, counts] of this.secondCounts) {
      if (at > second) continue;
      this.rates.push({ second: at, counts: Object.fromEntries(counts) });
      this.secondCounts.delete(at);
    }
    if (this.busLoad.length > MAX_PENDING_SAMPLES * loaded.lines.length)
      this.busLoad.splice(0, this.busLoad.length - MAX_PENDING_SAMPLES * loaded.lines.length);
    if (this.rates.length > MAX_PENDING_SAMPLES)
      this.rates.splice(0, this.rates.length - MAX_PENDING_SAMPLES);
    this.sampleRooms();
  }

  /** The latest chart samples (see `roomSamples`); only the newest are kept per batch. */
  private sampleRooms(): void {
    const samples = this.roomSamples(this.sim!);
    if (samples.length > 0) this.roomSample = samples;
  }

  /**
   * One sample per chart series: every bench room, its air temperature read
   * from the shared room model with the setpoints of the units in it; and every
   * device whose type offers a `roomSample` but sits in no bench room, as its
   * own room. Which devices are units comes from their types' hook, never from
   * a type name.
   */
  private roomSamples(sim: Simulation): RoomSample[] {
    const loaded = this.loaded!;
    const timeUs = sim.nowUs;
    const samples: RoomSample[] = [];
    const unitsByRoom = new Map<string, RoomUnitSample[]>(loaded.rooms.map((r) => [r.id, []]));
    for (const device of loaded.devices) {
      const sample = device.type.roomSample?.(sim.deviceState(device.id));
      if (sample === undefined) continue;
      const units = device.room === undefined ? undefined : unitsByRoom.get(device.room);
      if (units !== undefined)
        units.push({ unitId: device.id, setpointC: sample.setpointC, power: sample.power });
      else
        samples.push({
          timeUs,
          unitId: device.id,
          roomC: sample.roomC,
          setpointC: sample.setpointC,
          power: sample.power,
        });
    }
    for (const room of loaded.rooms)
      samples.push({
        timeUs,
        roomId: room.id,
        roomC: sim.roomTemperatureC(room.id),
        units: unitsByRoom.get(room.id)!,
      });
    return samples;
  }

  // ---------------------------------------------------------------- trace -> rows

  private onTrace(event: TraceEvent): void {
    this.recorder?.onEvent(event);
    switch (event.kind) {
      case "telegram.sent": {
        const row = this.telegramRow(event);
        // A tunnel has no device id; the test tool has none either, but never a tunnel's address.
        if (event.deviceId === undefined && this.tunnelSources.has(event.source))
          row.tunnel = row.source;
        this.awaiting.set(event.telegramId, row);
        if (event.attempt === 0 && !this.couplerIds.has(event.deviceId ?? "")) {
          const key = event.individual
            ? formatIndividualAddress(event.destination)
            : formatGroupAddress(event.destination);
          const at = Math.floor(event.timeUs / SECOND_US);
          let counts = this.secondCounts.get(at);
          if (counts === undefined) {
            counts = new Map();
            this.secondCounts.set(at, counts);
          }
          counts.set(key, (counts.get(key) ?? 0) + 1);
        }
        return;
      }
      case "telegram.acked":
        this.finish(event.telegramId, "ack");
        return;
      case "telegram.repeated":
      case "telegram.lost":
        this.finish(event.telegramId, event.reason);
        return;
      case "fault.raised":
      case "fault.cleared": {
        const target = event.deviceId ?? event.unitLink ?? "";
        this.faultsDirty = true;
        if (event.deviceId !== undefined) this.dirtyDevices.add(event.deviceId);
        const device =
          event.deviceId === undefined ? undefined : this.loaded?.deviceById.get(event.deviceId);
        const text = event.kind === "fault.raised" && event.text ? ` (${event.text})` : "";
        this.enqueue({
          seq: this.rowSeq++,
          kind: "fault",
          timeUs: event.timeUs,
          line: "",
          source: device?.name ?? target,
          deviceId: event.deviceId ?? "",
          destination: event.unitLink ?? "",
          destinationName: "",
          service: event.kind === "fault.raised" ? "fault raised" : "fault cleared",
          value: `${event.fault}${text}, by ${event.by}`,
          priority: "",
          repeated: false,
          ack: "",
          rawHex: "",
        });
        return;
      }
      case "coupler.forward":
        this.forwardedHopCount.set(event.forwardedTelegramId, event.hopCount);
        this.countCoupler(event);
        return;
      case "coupler.hold":
      case "coupler.drop":
        this.enqueue(this.couplerRow(event));
        this.countCoupler(event);
        return;
      case "device.transition":
        this.transitions.set(event.deviceId, { name: event.transition, atUs: event.timeUs });
        this.dirtyDevices.add(event.deviceId);
        this.responders?.add(event.deviceId);
        return;
      case "object.changed":
        if (event.cause === "write" || event.cause === "response")
          this.responders?.add(event.deviceId);
        this.dirtyDevices.add(event.deviceId);
        return;
      case "link.delivered":
      case "link.dropped":
      case "timer.fired":
      case "device.note":
        this.dirtyDevices.add(event.deviceId);
        return;
      default:
        return;
    }
  }

  private telegramRow(event: Extract<TraceEvent, { kind: "telegram.sent" }>): LogRow {
    const ga = event.individual ? undefined : this.loaded?.groupAddresses.get(event.destination);
    const frame: DataFrame = {
      priority: event.priority,
      repeated: event.repeated,
      source: event.source,
      destination: event.destination,
      addressType: event.individual ? "individual" : "group",
      hopCount: this.forwardedHopCount.get(event.telegramId) ?? DEFAULT_HOP_COUNT,
      service: event.service,
      payload: fromHex(event.payloadHex) ?? new Uint8Array(0),
      shortPayload: event.shortPayload,
    };
    const description = describeTelegram(
      frame,
      ga === undefined ? {} : { dpt: ga.dpt, groupAddressName: ga.name },
    );
    this.forwardedHopCount.delete(event.telegramId);
    const sender =
      event.deviceId === undefined ? undefined : this.loaded?.deviceById.get(event.deviceId);
    const line = this.lineAddresses.get(event.line) ?? event.line;
    return {
      seq: this.rowSeq++,
      kind: "telegram",
      timeUs: event.timeUs,
      line,
      ...(sender?.type.id === COUPLER_TYPE_ID
        ? { coupler: { id: sender.id, action: "forward" as const, toLine: line } }
        : {}),
      source: description.source,
      deviceId: event.deviceId ?? "",
      destination: description.destination,
      destinationName: ga?.name ?? "",
      service: event.service,
      value:
        event.service === "GroupValue_Read"
          ? ""
          : (description.value ?? description.valueError ?? description.payloadHex),
      priority: event.priority,
      repeated: event.repeated,
      ack: "",
      rawHex: description.rawHex,
    };
  }

  private couplerRow(
    event: Extract<TraceEvent, { kind: "coupler.hold" | "coupler.drop" }>,
  ): LogRow {
    const ga = this.loaded?.groupAddresses.get(event.destination);
    const coupler = this.loaded?.deviceById.get(event.coupler);
    const toLine = this.lineAddresses.get(event.toLine) ?? event.toLine;
    const hold = event.kind === "coupler.hold";
    return {
      seq: this.rowSeq++,
      kind: "coupler",
      timeUs: event.timeUs,
      line: this.lineAddresses.get(event.fromLine) ?? event.fromLine,
      coupler: hold
        ? { id: event.coupler, action: "hold", toLine }
        : { id: event.coupler, action: "drop", reason: event.reason, toLine },
      source: coupler?.name ?? event.coupler,
      deviceId: event.coupler,
      destination: event.individual
        ? formatIndividualAddress(event.destination)
        : formatGroupAddress(event.destination),
      destinationName: ga?.name ?? "",
      service: hold ? "coupler hold" : "coupler drop",
      value: hold
        ? `held for line ${toLine} behind ${event.queued} telegram(s)`
        : `not passed to line ${toLine}: ${event.reason}`,
      priority: "",
      repeated: false,
      ack: "",
      rawHex: "",
    };
  }

  private countCoupler(
    event: Extract<TraceEvent, { kind: "coupler.forward" | "coupler.hold" | "coupler.drop" }>,
  ): void {
    const totals = this.couplerTotals.get(event.coupler);
    if (totals === undefined) return;
    if (event.kind === "coupler.forward") totals.forwarded++;
    else if (event.kind === "coupler.hold") totals.held++;
    else totals.dropped[event.reason] = (totals.dropped[event.reason] ?? 0) + 1;
    this.couplersDirty = true;
  }

  /** Copies of every coupler's totals, in bench order (the message must not share the counters it keeps changing). */
  private couplerList(): CouplerTotals[] {
    return [...this.couplerTotals.values()].map((t) => ({ ...t, dropped: { ...t.dropped } }));
  }

  private finish(telegramId: number, ack: Ack): void {
    const row = this.awaiting.get(telegramId);
    if (row === undefined) return;
    this.awaiting.delete(telegramId);
    this.enqueue({ ...row, ack });
  }

  private enqueue(row: LogRow): void {
    this.backlog.push(row);
    if (this.backlog.length - this.backlogHead > this.backlogCapacity) {
      this.backlogHead++;
      this.dropped++;
    }
  }

  // ---------------------------------------------------------------- batches

  private flush(): void {
    const sim = this.sim;
    if (sim === undefined) return;
    const take = Math.min(this.backlogLength, this.maxRowsPerBatch);
    const rows = this.backlog.slice(this.backlogHead, this.backlogHead + take);
    this.backlogHead += take;
    if (this.backlogHead === this.backlog.length) {
      this.backlog = [];
      this.backlogHead = 0;
    } else if (this.backlogHead > 4096 && this.backlogHead * 2 > this.backlog.length) {
      this.backlog = this.backlog.slice(this.backlogHead);
      this.backlogHead = 0;
    }
    const devices = [...this.dirtyDevices].map((id) => this.snapshot(sim, id));
    this.dirtyDevices.clear();
    const faults = this.faultsDirty ? this.activeFaults(sim) : undefined;
    this.faultsDirty = false;
    const rooms = this.roomSample ?? [];
    this.roomSample = undefined;
    const couplers = this.couplersDirty ? this.couplerList() : undefined;
    this.couplersDirty = false;
    const clock = this.clock();
    const clockKey = `${clock.nowUs}|${clock.running}|${clock.speed}`;
    const idle =
      rows.length === 0 &&
      devices.length === 0 &&
      faults === undefined &&
      couplers === undefined &&
      rooms.length === 0 &&
      this.busLoad.length === 0 &&
      this.rates.length === 0 &&
      this.dropped === 0;
    if (idle && clockKey === this.lastPostedClock) return;
    this.lastPostedClock = clockKey;
    const message: SimMessage = {
      type: "batch",
      seq: this.batchSeq++,
      clock,
      rows,
      dropped: this.dropped,
      devices,
      ...(faults === undefined ? {} : { faults }),
      rooms,
      busLoad: this.busLoad,
      rates: this.rates,
      ...(couplers === undefined ? {} : { couplers }),
    };
    this.dropped = 0;
    this.busLoad = [];
    this.rates = [];
    this.remember(rows);
    this.post(message);
  }

  private remember(rows: readonly LogRow[]): void {
    if (this.recentCapacity === 0 || rows.length === 0) return;
    if (rows.length >= this.recentCapacity) {
      this.recent = rows.slice(rows.length - this.recentCapacity);
      return;
    }
    this.recent.push(...rows);
    // Trimmed in chunks, not per row: a copy per batch would cost more than the rows kept.
    if (this.recent.length > this.recentCapacity * 2)
      this.recent = this.recent.slice(this.recent.length - this.recentCapacity);
  }

  private snapshot(sim: Simulation, deviceId: string): DeviceSnapshot {
    const device = sim.bench.deviceById.get(deviceId);
    const transition = this.transitions.get(deviceId);
    return {
      id: deviceId,
      state: sim.deviceState(deviceId),
      objects: (device?.objects ?? []).map((object) => {
        const raw = sim.objectValue(deviceId, object.number);
        return {
          number: object.number,
          value: raw === undefined ? null : formatValue(object.dpt, raw),
          raw,
        };
      }),
      faults: [...sim.activeFaults(deviceId)],
      transition: transition?.name ?? null,
      transitionAtUs: transition?.atUs ?? null,
    };
  }

  private activeFaults(sim: Simulation): ActiveFault[] {
    const faults: ActiveFault[] = [];
    const targets = [
      ...sim.bench.devices.map((d) => d.id),
      ...sim.bench.unitLinks.map((l) => l.id),
    ];
    for (const target of targets) {
      for (const fault of sim.activeFaults(target)) {
        faults.push({
          target,
          fault,
          by: sim.faultRaisedBy(target, fault) ?? "device",
        });
      }
    }
    return faults;
  }

  // ---------------------------------------------------------------- scene dry-run

  private sceneDryRun(
    sim: Simulation,
    groupAddress: string,
    scene: number,
    settleUs: number,
  ): void {
    const loaded = sim.bench;
    const before = new Map(loaded.devices.map((d) => [d.id, describeDevice(sim, d.id)]));
    const atUs = sim.nowUs;
    const result = sim.sendGroupWrite(groupAddress, scene);
    if (this.refused("scene-dry-run", result)) return;
    const responders = new Set<string>();
    this.responders = responders;
    try {
      this.runTo(atUs + settleUs, Infinity);
    } finally {
      this.responders = undefined;
    }
    this.anchor();
    const listening = new Set(
      loaded.devices
        .filter((d) =>
          d.objects.some((o) => o.groupAddresses.some((raw) => sameAddress(raw, groupAddress))),
        )
        .map((d) => d.id),
    );
    const changed: SceneDryRunResult["changed"] = [];
    const silent: SceneDryRunResult["silent"] = [];
    for (const device of loaded.devices) {
      const after = describeDevice(sim, device.id);
      const previous = before.get(device.id) ?? new Map<string, string>();
      const changes: string[] = [];
      for (const [label, value] of after) {
        const old = previous.get(label);
        if (old !== value) changes.push(`${label}: ${old ?? "–"} → ${value}`);
      }
      if (changes.length > 0 && responders.has(device.id))
        changed.push({ deviceId: device.id, name: device.name, changes });
      else if (listening.has(device.id)) silent.push({ deviceId: device.id, name: device.name });
    }
    this.post({
      type: "scene-result",
      result: { groupAddress, scene, atUs, settleUs, changed, silent },
    });
  }
}

function sameAddress(raw: number, text: string): boolean {
  return formatGroupAddress(raw) === text || String(raw) === text;
}

/** A value formatted by its DPT, or as JSON when the codec refuses it. */
export function formatValue(dpt: string, value: unknown): string {
  const codec = getDpt(dpt);
  if (codec === undefined) return JSON.stringify(value);
  try {
    return codec.format(value);
  } catch {
    return JSON.stringify(value);
  }
}

// State fields and objects that drift on their own (clocks, the room model) and would drown a scene summary.
const DRIFTING_STATE_KEY = /(Us|^roomC|^reportedRoomC)$/;
const DRIFTING_OBJECT_NAME = /room temperature/i;

/** Object values and plain state fields of a device, as label -> text, for before/after comparison. */
function describeDevice(sim: Simulation, deviceId: string): Map<string, string> {
  const fields = new Map<string, string>();
  const device = sim.bench.deviceById.get(deviceId);
  for (const object of device?.objects ?? []) {
    if (DRIFTING_OBJECT_NAME.test(object.spec.name)) continue;
    const raw = sim.objectValue(deviceId, object.number);
    if (raw !== undefined) fields.set(object.spec.name, formatValue(object.dpt, raw));
  }
  const state = sim.deviceState(deviceId);
  if (typeof state === "object" && state !== null) {
    for (const [key, value] of Object.entries(state)) {
      if (DRIFTING_STATE_KEY.test(key)) continue;
      if (typeof value === "boolean" || typeof value === "string") fields.set(key, String(value));
      else if (typeof value === "number") fields.set(key, String(Math.round(value * 100) / 100));
    }
  }
  return fields;
}

/** The live session's older name. */
export const SimHost = LiveSession;
/** The live session's older name. */
export type SimHost = LiveSession;
/** The live session options' older name. */
export type SimHostOptions = LiveSessionOptions;
