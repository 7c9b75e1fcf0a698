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
/** Display name of an area in a bench document (`areas`: number 0..15, name). */
export type { BenchArea } from "./bench";
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
/** Zod schema of one bench room (id, name, optional start and outdoor °C, heat capacity kJ/K, envelope loss W/K); its messages name the field's range and unit. */
export { benchRoomSchema, type BenchRoom } from "./bench";
/** What a bench room's left-out thermal fields default to: start and outdoor °C, heat capacity kJ/K, envelope loss W/K. */
export { BENCH_ROOM_DEFAULTS } from "./bench";

// ---------------------------------------------------------------- topology

/**
 * Areas and lines of a loaded bench for the topology panel: per line its
 * address ("1.2"), kind ("line" | "main" | "backbone"), KNX device count, the
 * coupler joining it to the line above, and the expected steady load in
 * percent of capacity including what couplers pass into it.
 */
export {
  benchTopology,
  type BenchTopology,
  type TopologyArea,
  type TopologyLine,
} from "./topology";
/**
 * The group addresses (raw, ascending) a coupler must pass, generated from the
 * links: an address whose sender and listener sit on different sides of the
 * coupler (rule and source in engine/topology/filter-table.ts). Throws for an
 * id that is not a coupler of the bench.
 */
export { generateFilterTable } from "./topology";
/** The same table as group address texts ("1/2/3"), ready to store in a coupler's `filterTable`. */
export { generateFilterTableTexts } from "./topology";
/** The couplers of a loaded bench with their settings and (stored or generated) filter tables. */
export { benchCouplers, type TopologyCoupler } from "./topology";
/**
 * Coupler decisions: group telegrams by mode and table (main groups 14 and 15
 * pass a filtering coupler, from memory), individual telegrams by address,
 * routing counter (0 is not passed, 7 is never decremented).
 */
export {
  groupPasses,
  individualPasses,
  nextHopCount,
  UNFILTERED_MAIN_GROUPS,
  UNLIMITED_HOP_COUNT,
  type CouplerDropReason,
  type GroupTelegramMode,
  type IndividualTelegramMode,
} from "./topology";
/** A line's place from its address: kind, the line above, the lines a coupler address joins, "1.2" reading and formatting. */
export {
  areaOf,
  couplerLines,
  formatLineAddress,
  lineNumberOf,
  parseLineAddress,
  lineKind,
  upperLineAddress,
  type LineKind,
} from "./topology";
/** Catalogue id of couplers ("coupler") and their default buffer per direction (32 telegrams, our own choice). */
export { COUPLER_TYPE_ID, DEFAULT_COUPLER_QUEUE_CAPACITY } from "./devices";
/** A coupler's parameters: groupTelegrams, individualTelegrams, filterTable (texts, optional), queueCapacity. */
export type { CouplerParameters } from "./devices";
/** Telegrams a coupler forwarded and dropped per reason since the start of a run (`Simulation.couplerCounts`). */
export type { CouplerCounts } from "./sim/couplers";

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

// ---------------------------------------------------------------- re-exported for the app

/** How a telegram's transmission ended for the sender. */
export type { Ack } from "./sim/live/live-protocol";
/** How a telegram's transmission ended for the sender. */
export { ackSchema } from "./sim/live/live-protocol";
/** One active fault as the live console lists it: the device or unit link it sits on (`target`), the fault id, and whether the device raised it itself or a user injected it (`by`). */
export type { ActiveFault } from "./sim/live/live-protocol";
/** Schema of an `ActiveFault` in a batch message; a batch carries the full list of active faults whenever any changed. */
export { activeFaultSchema } from "./sim/live/live-protocol";
/** Telegrams per destination address within one virtual second, each counted once as its sender sent it (a coupler's copies are not counted again). */
export type { AddressRateSample } from "./sim/live/live-protocol";
/** Telegrams per destination address within one virtual second, each counted once as its sender sent it (a coupler's copies are not counted again). */
export { addressRateSampleSchema } from "./sim/live/live-protocol";
/** One device of a bench document: catalogue type id, name, line, individual address as text ("1.1.10"; absent for a unit-link-only device), parameters checked by its type on load, flag overrides by object number, canvas position in canvas units. */
export type { BenchDevice } from "./bench";
/** A device as the page knows it from a `BenchSummary`: type and label, medium, individual address as text (null on a unit link only), local buttons, group objects with their addresses as text, unit links and controller role. */
export type { BenchDeviceSummary } from "./sim/live/live-protocol";
/** One group address of a bench document: the address as text ("1/0/1"), its name and the DPT of the value it carries ("9.001"). */
export type { BenchGroupAddress } from "./bench";
/** A group address as the page knows it from a `BenchSummary`: the 16-bit raw value, the text form ("1/0/1"), name and DPT id. */
export type { BenchGroupAddressSummary } from "./sim/live/live-protocol";
/** One line of a bench document: id, line address "area.line" ("1.1") and name; a device sits on the line named in it, else the one matching its individual address. */
export type { BenchLine } from "./bench";
/** A link of a device's group object to a group address (text); the first link of an object in the document is the address it sends on, all its links are listened to. */
export type { BenchLink } from "./bench";
/** What the live console page needs of the running bench, sent with every `loaded` message: lines, test tool address, group addresses, devices, unit links and control-panel tiles, all as plain JSON (addresses as text). */
export type { BenchSummary } from "./sim/live/live-protocol";
/** Schema of a `BenchSummary`: the bench as the page shows it (names, addresses as text, buttons, tiles), not a document to load. */
export { benchSummarySchema } from "./sim/live/live-protocol";
/** A unit link of a bench document: the non-KNX link between an indoor unit and its gateway and wall controllers; at least two members, by device id. */
export type { BenchUnitLink } from "./bench";
/** Bus load over one whole virtual second on one line. */
export type { BusLoadSample } from "./sim/live/live-protocol";
/** Bus load over one whole virtual second on one line. */
export { busLoadSampleSchema } from "./sim/live/live-protocol";
/** Schema of a `SimClock`: virtual time in µs, whether the session runs, and its speed. */
export { clockSchema } from "./sim/live/live-protocol";
/** What one coupler forwarded, held and dropped (by reason) since the live run started; a batch carries every coupler's totals when any changed. */
export type { CouplerTotals } from "./sim/live/live-protocol";
/** Schema of `CouplerTotals` in a batch message. */
export { couplerTotalsSchema } from "./sim/live/live-protocol";
/** What the inspector shows of one device, sent whenever something about it changed. */
export type { DeviceSnapshot } from "./sim/live/live-protocol";
/** What the inspector shows of one device, sent whenever something about it changed. */
export { deviceSnapshotSchema } from "./sim/live/live-protocol";
/** Parses "BC 11 01" / "bc1101" into octets; returns undefined for odd length or non-hex text. */
export { fromHex } from "./frame/hex";
/** 20.105 HVAC controller mode, the full table (knx-reference.md); 18, 19 and 21..255 are reserved. */
export { HVAC_CONTROLLER_MODES } from "./dpt";
/** 20.102 HVAC mode (DPT spec §4.x, knx-reference.md). */
export { HVAC_MODES } from "./dpt";
/** A parsed input command: the input, the command name errors report, and its field names for the input's fields. */
export type { InputCommand } from "./sim/live/live-protocol";
/** The worker's one way to act on the bench: a simulation input (engine/sim/sim-input.ts). */
export { inputCommandSchema } from "./sim/live/live-protocol";
/** The live session: one simulation for the live console (in the browser's worker, or in a server process), driven by commands, and turns its trace into batches for the page: log rows (each telegram once its acknowledgement is known), snapshots of the devices that changed, active faults, and chart samples taken at whole virtual seconds. */
export { LiveSession } from "./sim";
/** One row of the telegram log. */
export type { LogRow } from "./sim/live/live-protocol";
/** One row of the telegram log. */
export { logRowSchema } from "./sim/live/live-protocol";
/** The most telegrams one flood command queues. */
export { MAX_FLOOD_COUNT } from "./sim/live/live-protocol";
/** The longest jump ahead one command may ask for: one virtual day. */
export { MAX_JUMP_US } from "./sim/live/live-protocol";
/** One group object of a device snapshot: object number, the value formatted by its DPT with unit ("21.00 °C"; null before the object has a value) and the raw value as JSON. */
export type { ObjectView } from "./sim/live/live-protocol";
/** Schema of an `ObjectView`, one object of a `DeviceSnapshot`. */
export { objectViewSchema } from "./sim/live/live-protocol";
/** A command after the live session checked it: a playback control, or an input command with the `SimInput` it stands for and the field names its errors report. */
export type { ParsedSimCommand } from "./sim/live/live-protocol";
/** Parses a command or names the field that is wrong. */
export { parseSimCommand } from "./sim/live/live-protocol";
/** Parses a worker message against the full schema (tests check the session's output with it); throws with the field. */
export { parseSimMessage } from "./sim/live/live-protocol";
/** The page's cheap check of a worker message: its `type` is a protocol message type, then it is trusted as typed. */
export { checkSimMessage } from "./sim/live/live-protocol";
/** A playback control (load, play, pause, step, jump, reset, flood, record, scene dry-run). */
export type { PlaybackCommand } from "./sim/live/live-protocol";
/** Canvas position in canvas units (not pixels); the canvas owns the scale. */
export type { Position } from "./bench";
/** A room chart sample at a whole virtual second (time in µs, °C): a bench room (`roomId`, its shared air temperature, the setpoint and power of each unit in it) or a unit in no bench room (`unitId`, its own room, setpoint, power), through the device types' `roomSample` hook. */
export type {
  RoomSample,
  BenchRoomSample,
  UnitRoomSample,
  RoomUnitSample,
} from "./sim/live/live-protocol";
/** Schema of a `RoomSample`; a batch carries only the newest sample per series. */
export { roomSampleSchema } from "./sim/live/live-protocol";
/** What a scene dry-run found: the scene sent (1..64) to a group address at a virtual time in µs, settled for `settleUs`; the devices that changed with each change as "label: before → after", and the listeners that stayed silent. */
export type { SceneDryRunResult } from "./sim/live/live-protocol";
/** Schema of a `SceneDryRunResult`, sent in a `scene-result` message. */
export { sceneDryRunResultSchema } from "./sim/live/live-protocol";
/** The live session's clock as the page shows it: virtual time `nowUs` (µs since the run started), whether it runs, and the speed (1, 10, 100 virtual s per wall s, or "max"). */
export type { SimClock } from "./sim/live/live-protocol";
/** A command as the page sends it: playback controls, an input, or an input in the older spelling. */
export type { SimCommand } from "./sim/live/live-protocol";
/** Schema of the commands the live session takes in their older single-purpose spelling and of the playback controls (load, play, pause, step, jump, reset, flood, record, scene dry-run); `jump` is at most one virtual day, `flood` at most 20,000 telegrams. */
export { simCommandSchema } from "./sim/live/live-protocol";
/** The live session's older name. */
export { SimHost } from "./sim";
/** One thing done to a running bench from outside; see the module comment. */
export type { SimInput } from "./sim";
/** A message from the live session to the page: loaded (bench summary and document), load-failed, batch (log rows, device snapshots, faults, chart samples, clock), reset-done, command-error naming the field, recording, scene-result. */
export type { SimMessage } from "./sim/live/live-protocol";
/** Full schema of a `SimMessage`; tests check the session's output with it, the page checks only the envelope (`checkSimMessage`). */
export { simMessageSchema } from "./sim/live/live-protocol";
/** Playback speed: virtual seconds per wall second, or as fast as the worker can go. */
export type { SimSpeed } from "./sim/live/live-protocol";
/** Playback speed: virtual seconds per wall second, or as fast as the worker can go. */
export { simSpeedSchema } from "./sim/live/live-protocol";
/** What the console needs to know about a bench to draw its controls: addresses with names and DPTs, devices with their objects and local buttons, unit links, and control-panel tiles. */
export { summarizeBench } from "./sim";
/** Devices on the engine's real runtime without a KNX line (transitions, effects, timers, unit links, faults), for device tests. */
export {
  DeviceBench,
  type DeviceBenchLink,
  type DeviceBenchMember,
  type DeviceBenchRoom,
} from "./sim/device-bench";

/** Decodes one datagram into a frame; never throws, whatever the octets. */
export { decodeKnxNetIpFrame } from "./knxnetip";
/** Hop count devices send with (knx-reference.md, TP1 standard frame). */
export { DEFAULT_HOP_COUNT } from "./frame";
/** A KNXnet/IP description information block: device information (54 octets), supported service families, or any other block kept as its type and octets so a response round-trips. */
export type { Dib } from "./knxnetip/dib";
/** Encodes a frame, header included. */
export { encodeKnxNetIpFrame } from "./knxnetip";
/** Host protocol address information (KNXnet/IP spec, Core §8.6.2): structure length 0x08 | host protocol (0x01 UDP, 0x02 TCP) | IPv4 address (4) | port (2, big-endian) 0.0.0.0 port 0 is the "route back" form a client behind NAT sends: answer to the address and port the datagram came from (Core §8.6.3, from memory). */
export type { Hpai } from "./knxnetip/hpai";
/** A server with no tunnels. */
export { initialTunnellingServerState } from "./knxnetip";
/** The standard KNXnet/IP UDP port. */
export { KNXNETIP_PORT } from "./knxnetip";
/** KNXnet/IP frames of the core and tunnelling services as values, and their encoding (KNXnet/IP spec, Core §2.3 and §7.5-7.8, Tunnelling §4.4): header: 0x06 | 0x10 | service type (2) | total length (2, header included) SEARCH_REQUEST            HPAI discovery endpoint SEARCH_RESPONSE           HPAI control endpoint | DIB device info | DIB service families DESCRIPTION_REQUEST       HPAI control endpoint DESCRIPTION_RESPONSE      DIB device info | DIB service families | further DIBs CONNECT_REQUEST           HPAI control endpoint | HPAI data endpoint | CRI CONNECT_RESPONSE          channel id | status | (HPAI data endpoint | CRD, when status is E_NO_ERROR) CONNECTIONSTATE_REQUEST   channel id | reserved | HPAI control endpoint CONNECTIONSTATE_RESPONSE  channel id | status DISCONNECT_REQUEST        channel id | reserved | HPAI control endpoint DISCONNECT_RESPONSE       channel id | status TUNNELLING_REQUEST        connection header (0x04 | channel id | sequence counter | reserved) | cEMI TUNNELLING_ACK            connection header (0x04 | channel id | sequence counter | status) The cEMI message of a tunnelling request stays octets here: a tunnel may carry message codes the engine's cEMI code does not model, and the server decides what to do with them (engine/frame/cemi.ts decodes L_Data). */
export type { KnxNetIpFrame } from "./knxnetip/knxnetip-frame";
/** What a KNXnet/IP endpoint needs from a running simulation: one line to put frames on and to watch. */
export type { LineAccess } from "./knxnetip";
/** The earliest time a `tick` has something to do (a heartbeat or acknowledgement deadline), or undefined. */
export { nextDeadlineUs } from "./knxnetip";
/** The NAT "route back" HPAI: 0.0.0.0:0 over UDP. */
export { ROUTE_BACK_HPAI } from "./knxnetip";
/** Status codes of the specification (Core §7.8.5 and Tunnelling §2.7; 0x01, 0x02 from memory). */
export { STATUS } from "./knxnetip";
/** One TP1 line at 9600 bit/s: queues telegrams, arbitrates senders by priority bit by bit, repeats up to 3 times after NAK, BUSY or no answer, and keeps windowed bus-load statistics (times in µs). */
export type { Tp1Line } from "./bus";
/** One station's sending side: a queue of telegrams sent one at a time, each with its repetitions. */
export { Tp1Sender } from "./bus";
/** Individual addresses for a KNXnet/IP endpoint on one bench line: its own address and one per tunnel, all on that line and free of devices and the test tool (from device number 240 upward, then downward from 239); an error names `lineId` or `tunnels`. */
export { tunnelAddressPool } from "./knxnetip";
/** One open tunnel. */
export type { TunnelConnection } from "./knxnetip";
/** The CRI of a tunnel on the link layer: 04 04 02 00. */
export { tunnelCri } from "./knxnetip";
/** A full configuration from the required fields and any overrides. */
export { tunnellingServerConfig } from "./knxnetip";
/** What a tunnelling server is and how strict it is; `tunnellingServerConfig` fills the defaults. */
export type { TunnellingServerConfig } from "./knxnetip";
/** Counts of what the server dropped or refused, for the console and tests. */
export type { TunnellingServerCounters } from "./knxnetip";
/** What the tunnelling server asks its host to do after an event: send a datagram, put a frame on the line, report a tunnel opened or closed (with the reason), or report a dropped datagram (with the reason). */
export type { TunnellingServerEffect } from "./knxnetip";
/** What the tunnelling server reacts to, each with the virtual time `nowUs`: a datagram from a client, a frame on the line, a line put confirmed, a tick for heartbeat and acknowledgement timeouts, an operator disconnect, shutdown. */
export type { TunnellingServerEvent } from "./knxnetip";
/** The tunnelling server's whole state as a value: open tunnels by channel id, the next channel and request ids, frames on their way to the line, rate-limit token buckets, drop counters. Changed only by the server's pure transition. */
export type { TunnellingServerState } from "./knxnetip";
/** Applies one event; see the module comment. */
export { tunnellingServerTransition } from "./knxnetip";
/** An IPv4 UDP address: dotted address and port. */
export type { UdpAddress } from "./knxnetip";
