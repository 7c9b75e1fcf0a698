/**
 * Benchline's engine: a pure-TypeScript KNX TP1 simulator. Everything the UI,
 * the scenario runner and the CLI need from the engine is exported here.
 *
 * Conventions: virtual time is an integer number of microseconds since the start
 * of a run (`…Us`); addresses inside the engine are raw 16-bit numbers and bench
 * JSON stores their text forms; expected failures are `Result` values, bugs throw.
 * Scenario documents and bench checks live in engine/scenario and engine/checks.
 */

// ---------------------------------------------------------------- results

/** A success (`ok: true, value`) or an expected failure (`ok: false, error`); never thrown. */
export type { Result } from "./core/result";
/** Wraps a value as a successful `Result`. */
export { ok } from "./core/result";
/** Wraps an error as a failed `Result`. */
export { err } from "./core/result";

// ---------------------------------------------------------------- addresses

/** Group address notations: "three-level" (main/middle/sub), "two-level" (main/sub), "free" (0..65535). */
export type { GroupAddressStyle } from "./address";
/** Why an address text was refused: `{ kind: "address.invalid", input, message }`. */
export type { AddressError } from "./address";
/** Parses "1/0/1", "1/257" or "4097" into a raw 16-bit group address; 0/0/0 (broadcast) is refused. */
export { parseGroupAddress } from "./address";
/** Formats a raw group address; three-level ("1/0/1") unless another style is asked for. */
export { formatGroupAddress } from "./address";
/** Parses "area.line.device" ("1.1.10") into a raw individual address (area<<12 | line<<8 | device). */
export { parseIndividualAddress } from "./address";
/** Formats a raw individual address as "area.line.device". */
export { formatIndividualAddress } from "./address";

// ---------------------------------------------------------------- datapoint types

/** Encoder/decoder of one DPT: id, name, unit, size in bits, zod value schema, encode, decode, format. */
export type { DptCodec } from "./dpt";
/** Why a value or payload does not fit a DPT (out of range, wrong type, payload length), naming the DPT. */
export type { DptError } from "./dpt";
/** The codec for a DPT id ("9.001"), or undefined when Benchline does not know it. */
export { getDpt } from "./dpt";
/** Size of a DPT's value in bits (1 for 1.001, 16 for 9.001), or undefined. */
export { dptSizeBits } from "./dpt";
/** Every supported DPT id in numeric order. */
export { dptIds } from "./dpt";
/** The DPT 9.x "invalid data" value (0x7FFF on the bus). */
export { DPT9_INVALID } from "./dpt";
/** True for the DPT 9.x invalid-data marker. */
export { isDptInvalid } from "./dpt";

// ---------------------------------------------------------------- frames and timing

/** Frame priority: "system" > "urgent" > "normal" > "low" in arbitration; group telegrams default to "low". */
export type { Priority } from "./frame";
/** GroupValue_Read, GroupValue_Response or GroupValue_Write. */
export type { GroupService } from "./frame";
/** A standard data frame independent of the medium (TP1 or cEMI). */
export type { DataFrame } from "./frame";
/** Encodes a frame as TP1 octets, check octet included. */
export { encodeTp1Frame } from "./frame";
/** Decodes TP1 octets into a frame, refusing a bad check octet or length with a typed error. */
export { decodeTp1Frame } from "./frame";
/** Encodes an L_Data cEMI message (req, con, ind). */
export { encodeCemi } from "./frame";
/** Decodes an L_Data cEMI message. */
export { decodeCemi } from "./frame";
/** A frame described for people: addresses, service, decoded value with unit, raw hex. */
export { describeTelegram } from "./frame";
/** TP1 runs at 9600 bit/s; one bit time is about 104 µs. */
export { BITS_PER_SECOND } from "./frame";
/** Bit times to integer µs (rounded once per conversion). */
export { bitTimesToUs } from "./frame";
/** Duration of a frame of n octets on TP1, µs (13 bit times per octet). */
export { frameDurationUs } from "./frame";
/** Line time one acknowledged telegram of n octets holds, µs (193 bit times, 20,104 µs, for 9 octets). */
export { telegramOccupancyUs } from "./frame";

// ---------------------------------------------------------------- trace

/** One event of a run's trace (telegram.*, device.*, object.changed, timer.fired, fault.*, link.*, user.action), stamped with `timeUs`. */
export type { TraceEvent } from "./core/trace";
/** The `kind` strings of trace events. */
export type { TraceEventKind } from "./core/trace";
/** Criteria for `filterTrace`: address (raw), device id, kinds (exact or "prefix."), time range in µs. */
export type { TraceFilter } from "./core/trace";
/** The trace store: ordered append, optional ring capacity, subscribe, slice by time, filter. */
export { Trace } from "./core/trace";
/** Keeps the events matching every given criterion, in order. */
export { filterTrace } from "./core/trace";
/** Events with fromUs <= timeUs < toUs from a time-ordered list (binary search). */
export { sliceByTime } from "./core/trace";

// ---------------------------------------------------------------- seeded randomness and clock

/** The run's seeded generator (xoshiro128**): next() in [0, 1), nextInt(bound), state(). */
export type { Rng } from "./core/rng";
/** Creates a generator from a seed, or resumes one from a saved state. */
export { createRng } from "./core/rng";
/** The virtual clock and its stable binary-heap event queue (µs); the simulation owns one. */
export { Scheduler } from "./core/scheduler";

// ---------------------------------------------------------------- benches

/** Current bench document format number. */
export { BENCH_FORMAT } from "./bench";
/** Zod schema of a bench document (addresses as text). */
export { benchSchema } from "./bench";
/** A validated bench document. */
export type { Bench } from "./bench";
/** A bench document as written by hand (defaulted fields optional). */
export type { BenchInput } from "./bench";
/** Why a bench did not load; `path` is a JSON path and the device, object or address at fault is named. */
export type { BenchError } from "./bench";
/** A bench with every reference resolved and addresses as raw numbers. */
export type { LoadedBench } from "./bench";
/** A device of a loaded bench: type, parsed parameters, group objects with flags and links. */
export type { LoadedDevice } from "./bench";
/** Migrates (any known format) and checks a bench document; returns all errors found. */
export { loadBench } from "./bench";
/** Brings a bench document of an older format to the current one. */
export { migrateBench } from "./bench";

// ---------------------------------------------------------------- devices

/** The device-type interface: zod parameters, group objects, buttons, initial state and a pure transition. */
export type {
  DeviceType,
  AnyDeviceType,
  DeviceEvent,
  DeviceEffect,
  DeviceContext,
  TransitionResult,
} from "./devices";
/** A group object declaration and its standard flags (communication, read, write, transmit, update, read-on-init). */
export type { GroupObjectSpec, GroupObjectFlags, LocalButtonSpec } from "./devices";
/** Flags from letters: "CRWTUI". */
export { flags } from "./devices";
/** Adds a device type to the catalogue (built-ins register when the engine is imported). */
export { registerDeviceType } from "./devices";
/** The device type registered under an id, or undefined. */
export { getDeviceType } from "./devices";
/** Every registered device type, sorted by id. */
export { listDeviceTypes } from "./devices";

// ---------------------------------------------------------------- simulation

/** The simulation facade: run the clock, act from outside, read state, statistics and the trace. */
export { Simulation } from "./sim";
/** Starts a simulation of a loaded or loadable bench (a bad document throws `BenchLoadFailure`). */
export { createSimulation } from "./sim";
/** Loads a bench document and starts a simulation, returning load errors as values. */
export { tryCreateSimulation } from "./sim";
/** Thrown by `createSimulation` for a bench that does not load; carries the `BenchError`s. */
export { BenchLoadFailure } from "./sim";
/** Options of a run: `seed`, `traceCapacity` (events kept; 0 = none), `unitLinkDelayUs`, `historyCapacity`. */
export type { SimulationOptions } from "./sim";
/** Who sends a telegram from outside (`from`: device id, default the test tool) and at which priority. */
export type { SendOptions } from "./sim";
/** Why the simulation refused a request; `field` names the argument at fault. */
export type { SimError } from "./sim";
/** Virtual delay of unit-link messages between members: 10,000 µs. */
export { UNIT_LINK_DELAY_US } from "./sim";
/** Device faults the runtime acts on: "bus.busy", "bus.nak" (answer BUSY / NAK), "bus.silent" (disconnected). */
export { BUS_FAULTS } from "./sim";
/** The unit-link fault "link.broken": messages on the link are dropped while it is active. */
export { UNIT_LINK_BROKEN } from "./sim";
/** Load and counts of a line over a window (µs, percent of the window, per address and per sender). */
export type { BusStats } from "./bus";

// ---------------------------------------------------------------- scenarios, suites and bench checks

/** Scenario document schema (`format: 1`), its step union and the suite schema; durations stay text ("500ms"). */
export {
  scenarioSchema,
  stepSchema,
  stepKinds,
  type Scenario,
  type ScenarioDocument,
  type Step,
  type StepKind,
  type BenchReference,
} from "./scenario/scenario-schema";
/** Validates a scenario (JSON value or text); errors point at the step and field ("steps[3].within: ..."). */
export { parseScenario, parseScenarioText, type ScenarioError } from "./scenario/parse-scenario";
/** A named list of scenario files, paths relative to the suite file. */
export { suiteSchema, parseSuite, type Suite, type SuiteError } from "./scenario/suite-schema";
/** "500ms", "30s", "2m", "1h" <-> integer µs of virtual time; typed `duration.invalid` errors. */
export { parseDuration, formatDuration, type DurationError } from "./scenario/duration";
/** A point in virtual time (integer µs) as h:mm:ss.mmm, or h:mm:ss.mmmmmm with `precision: "us"`. */
export {
  formatVirtualTime,
  type VirtualTimeFormat,
  type VirtualTimePrecision,
} from "./core/virtual-time";
/** Replays a scenario on a fresh simulation: per-step verdicts with trace slices; wall clock injected as `now()` (ms). */
export {
  runScenario,
  stepLabel,
  DEFAULT_SCENARIO_BUDGET_MS,
  type RunScenarioOptions,
} from "./scenario/run-scenario";
/** Runs a list of prepared scenarios and aggregates them into a suite result. */
export { runSuite, type SuiteEntry, type RunSuiteOptions } from "./scenario/run-suite";
/** Scenario and suite results: outcome (expectedToFail applied), step verdicts, virtual µs, wall ms. */
export type {
  ScenarioResult,
  ScenarioOutcome,
  StepResult,
  StepStatus,
  SuiteResult,
  SuiteTotals,
} from "./scenario/scenario-result";
/** JUnit XML for CI: one testsuite per suite, one testcase per scenario. */
export { junitXml } from "./scenario/junit-xml";
/** One readable line for a trace event (time, kind, addresses, payload hex). */
export { describeTraceEvent } from "./scenario/describe-trace-event";
/** Live-console actions and the replies they drew -> a scenario draft (windows rounded up to readable durations). */
export {
  recordScenario,
  type ConsoleAction,
  type ObservedTelegram,
  type RecordedAction,
  type RecordOptions,
} from "./scenario/recorder";
/** Checks a bench document before it runs: findings with rule id, severity, message and location, errors first. */
export { checkBench, benchCheckRules, type CheckBenchOptions } from "./checks/check-bench";
/** A bench-check finding and its location (device, object, group address text, unit link, line, parameter path). */
export type { CheckFinding, CheckLocation, CheckSeverity } from "./checks/check-finding";
/** Load bounds of the checks: warn above 30 %, error above 60 % of line capacity by default. */
export {
  defaultCheckOptions,
  type CheckOptions,
  type BenchCheckRule,
} from "./checks/bench-check-rule";
/** Expected load per line from configured sending conditions (telegrams/s, percent of capacity, contributions). */
export { estimateLineLoad, type LineLoadEstimate, type LoadContribution } from "./checks/line-load";

// ---------------------------------------------------------------- KNXnet/IP

/** KNXnet/IP frames (pure encode/decode, typed errors), the pure tunnelling server transition and the `LineAccess` interface an endpoint binds to a simulation. */
export * as knxnetip from "./knxnetip";
