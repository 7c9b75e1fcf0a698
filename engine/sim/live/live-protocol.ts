import { z } from "zod";
import { benchSchema } from "../../bench";
import { simInputSchema, type SimInput } from "../sim-input";

/**
 * The message protocol between the live console page and the simulation
 * worker. Commands are validated once, where they arrive (the session's
 * `handle`: the worker treats every message as untrusted-shaped), so a bad one
 * comes back as a command-error naming its field. Messages to the page are
 * built by the session's own typed code; the page checks only their envelope
 * (`checkSimMessage`), and tests check them against the full schemas here.
 * Everything here is plain JSON (structured-clone safe).
 *
 * Times are virtual microseconds (`…Us`) unless named otherwise.
 */

/** Playback speed: virtual seconds per wall second, or as fast as the worker can go. */
export const simSpeedSchema = z.union([
  z.literal(1),
  z.literal(10),
  z.literal(100),
  z.literal("max"),
]);
export type SimSpeed = z.infer<typeof simSpeedSchema>;

/** The longest jump ahead one command may ask for: one virtual day. */
export const MAX_JUMP_US = 86_400_000_000;
/** The most telegrams one flood command queues. */
export const MAX_FLOOD_COUNT = 20_000;

const idSchema = z.string().min(1);
const groupAddressTextSchema = z.string().min(1, "groupAddress is required");

export const simCommandSchema = z.discriminatedUnion("type", [
  z.object({ type: z.literal("load"), bench: z.unknown(), seed: z.number().int().default(1) }),
  z.object({ type: z.literal("play"), speed: simSpeedSchema }),
  z.object({ type: z.literal("pause") }),
  z.object({ type: z.literal("step") }),
  z.object({ type: z.literal("jump"), durationUs: z.number().int().positive().max(MAX_JUMP_US) }),
  z.object({ type: z.literal("reset") }),
  z.object({
    type: z.literal("write"),
    groupAddress: groupAddressTextSchema,
    value: z.unknown(),
    from: idSchema.optional(),
  }),
  z.object({
    type: z.literal("read"),
    groupAddress: groupAddressTextSchema,
    from: idSchema.optional(),
  }),
  z.object({
    type: z.literal("press"),
    deviceId: idSchema,
    buttonId: idSchema,
    action: z.enum(["press", "release", "long-press"]).default("press"),
  }),
  z.object({
    type: z.literal("set-input"),
    deviceId: idSchema,
    input: idSchema,
    value: z.unknown(),
  }),
  z.object({
    type: z.literal("set-parameter"),
    deviceId: idSchema,
    key: idSchema,
    value: z.unknown(),
  }),
  z.object({ type: z.literal("inject-fault"), target: idSchema, faultId: idSchema }),
  z.object({ type: z.literal("clear-fault"), target: idSchema, faultId: idSchema }),
  z.object({
    type: z.literal("flood"),
    groupAddress: groupAddressTextSchema,
    count: z.number().int().min(1).max(MAX_FLOOD_COUNT),
    value: z.unknown(),
  }),
  z.object({ type: z.literal("record"), on: z.boolean() }),
  z.object({
    type: z.literal("scene-dry-run"),
    groupAddress: groupAddressTextSchema,
    scene: z.number().int().min(1).max(64),
    settleUs: z.number().int().positive().max(600_000_000).default(5_000_000),
  }),
]);
/**
 * The worker's one way to act on the bench: a simulation input (engine/sim/sim-input.ts).
 * The single-purpose commands above (write, read, press, set-input, set-parameter,
 * inject-fault, clear-fault) are the older spelling of the same inputs; they are
 * translated into this form, and errors name their own field names.
 */
export const inputCommandSchema = z.object({ type: z.literal("input"), input: simInputSchema });

/** A command as the page sends it: playback controls, an input, or an input in the older spelling. */
export type SimCommand = z.input<typeof simCommandSchema> | z.input<typeof inputCommandSchema>;

type LegacyInputType =
  "write" | "read" | "press" | "set-input" | "set-parameter" | "inject-fault" | "clear-fault";

/** A playback control (load, play, pause, step, jump, reset, flood, record, scene dry-run). */
export type PlaybackCommand = Exclude<z.infer<typeof simCommandSchema>, { type: LegacyInputType }>;

/** A parsed input command: the input, the command name errors report, and its field names for the input's fields. */
export interface InputCommand {
  readonly type: "input";
  readonly input: SimInput;
  readonly command: string;
  /** Input field -> the field name the page used (older spellings: deviceId, buttonId, key, target, faultId). */
  readonly fields: Readonly<Record<string, string>>;
}

export type ParsedSimCommand = PlaybackCommand | InputCommand;

const LEGACY_FIELDS: Readonly<Record<LegacyInputType, Readonly<Record<string, string>>>> = {
  write: {},
  read: {},
  press: { device: "deviceId", button: "buttonId" },
  "set-input": { device: "deviceId" },
  "set-parameter": { device: "deviceId", parameter: "key" },
  "inject-fault": { device: "target", fault: "faultId" },
  "clear-fault": { device: "target", fault: "faultId" },
};

type Json = Extract<SimInput, { kind: "write" }>["value"];

/** The input an older-spelling command stands for. */
function legacyInput(
  command: Extract<z.infer<typeof simCommandSchema>, { type: LegacyInputType }>,
): SimInput {
  const from = "from" in command && command.from !== undefined ? { from: command.from } : {};
  switch (command.type) {
    case "write":
      return {
        kind: "write",
        groupAddress: command.groupAddress,
        value: command.value as Json,
        ...from,
      };
    case "read":
      return { kind: "read", groupAddress: command.groupAddress, ...from };
    case "press":
      return {
        kind: "press",
        device: command.deviceId,
        button: command.buttonId,
        ...(command.action === "press" ? {} : { action: command.action }),
      };
    case "set-input":
      return {
        kind: "set-input",
        device: command.deviceId,
        input: command.input,
        value: command.value as Json,
      };
    case "set-parameter":
      return {
        kind: "set-parameter",
        device: command.deviceId,
        parameter: command.key,
        value: command.value as Json,
      };
    case "inject-fault":
    case "clear-fault":
      return { kind: command.type, device: command.target, fault: command.faultId };
  }
}

/** Why a coupler did not pass a telegram on (the reasons a `coupler.drop` trace event names). */
export const couplerDropReasonSchema = z.enum([
  "filter",
  "blocked",
  "hop-count",
  "queue-full",
  "not-acknowledged",
]);

/** How a telegram's transmission ended for the sender. "pending" never reaches the page. */
export const ackSchema = z.enum(["ack", "nak", "busy", "none"]);
export type Ack = z.infer<typeof ackSchema>;

/**
 * One row of the telegram log. Flat strings ("" when absent) so a batch of
 * thousands is cheap to clone, validate and filter.
 */
export const logRowSchema = z.object({
  /** Increasing per run; a row's identity in the log. */
  seq: z.number().int(),
  /** "coupler": a coupler held or dropped a telegram (its forwards show as telegram rows on the far line). */
  kind: z.enum(["telegram", "fault", "coupler"]),
  timeUs: z.number().int(),
  /** Line address ("1.2") the telegram was on; for a coupler row the line it was heard on; "" for a fault row. */
  line: z.string(),
  /**
   * Set when a coupler is involved: on a telegram row, the coupler that sent it
   * on this line ("forward"); on a coupler row, what the coupler did ("hold",
   * "drop") and, for a drop, why.
   */
  coupler: z
    .object({
      id: z.string(),
      action: z.enum(["forward", "hold", "drop"]),
      reason: couplerDropReasonSchema.optional(),
      /** Line address ("1.0") the coupler passes (or would have passed) the telegram to. */
      toLine: z.string(),
    })
    .optional(),
  /** Individual address "1.1.10" of the sender, or the device name for a fault row. */
  source: z.string(),
  /** Device id of the sender or of the faulty device; "" for the test tool. */
  deviceId: z.string(),
  /** Group address "1/0/1", or the unit link for a link fault. */
  destination: z.string(),
  destinationName: z.string(),
  /** GroupValue_Write / _Read / _Response, or "fault raised" / "fault cleared". */
  service: z.string(),
  /** Decoded value with its unit ("21.00 °C"), or the fault id and text. */
  value: z.string(),
  priority: z.string(),
  repeated: z.boolean(),
  ack: z.union([ackSchema, z.literal("")]),
  /** Whole TP1 frame with its check octet, "BC 11 FA 08 01 E1 00 81 3A"; "" for a fault row. */
  rawHex: z.string(),
  /**
   * The individual address of the KNXnet/IP tunnel the telegram came in over ("1.1.241"),
   * so the console can mark telegrams from outside software; absent otherwise.
   */
  tunnel: z.string().optional(),
});
export type LogRow = z.infer<typeof logRowSchema>;

export const objectViewSchema = z.object({
  number: z.number().int(),
  /** Value formatted with its DPT ("21.00 °C"); null before the object has one. */
  value: z.string().nullable(),
  raw: z.unknown(),
});
export type ObjectView = z.infer<typeof objectViewSchema>;

/** What the inspector shows of one device, sent whenever something about it changed. */
export const deviceSnapshotSchema = z.object({
  id: z.string(),
  state: z.unknown(),
  objects: z.array(objectViewSchema),
  faults: z.array(z.string()),
  /** Name of the device's latest transition from the trace ("setpoint.clamped"). */
  transition: z.string().nullable(),
  transitionAtUs: z.number().int().nullable(),
});
export type DeviceSnapshot = z.infer<typeof deviceSnapshotSchema>;

export const activeFaultSchema = z.object({
  /** Device id or unit link id. */
  target: z.string(),
  fault: z.string(),
  by: z.enum(["device", "user"]),
});
export type ActiveFault = z.infer<typeof activeFaultSchema>;

/** What one unit in a bench room works toward at a sample: setpoint, °C, and power. */
export const roomUnitSampleSchema = z.object({
  unitId: z.string(),
  setpointC: z.number(),
  power: z.boolean(),
});
export type RoomUnitSample = z.infer<typeof roomUnitSampleSchema>;

/**
 * Chart sample of an indoor unit's own room (a unit in no bench room, as on
 * every bench without rooms), through its type's `roomSample` hook: what the
 * unit works toward, with the sample's time and the room as the unit last
 * stepped it, °C.
 */
export const unitRoomSampleSchema = roomUnitSampleSchema.extend({
  timeUs: z.number().int(),
  roomC: z.number(),
});
export type UnitRoomSample = z.infer<typeof unitRoomSampleSchema>;

/**
 * Chart sample of one bench room (`rooms` of the bench): its air temperature
 * read from the shared room model at the sample's time, °C, and every unit in
 * it (devices whose type offers `roomSample`), in bench order; none for a room
 * with only sensors in it.
 */
export const benchRoomSampleSchema = z.object({
  timeUs: z.number().int(),
  roomId: z.string(),
  roomC: z.number(),
  units: z.array(roomUnitSampleSchema),
});
export type BenchRoomSample = z.infer<typeof benchRoomSampleSchema>;

/** One chart series' sample: a bench room (has `roomId`) or a unit's own room (has `unitId`). */
export const roomSampleSchema = z.union([benchRoomSampleSchema, unitRoomSampleSchema]);
export type RoomSample = z.infer<typeof roomSampleSchema>;

/** Bus load over one whole virtual second on one line. */
export const busLoadSampleSchema = z.object({
  second: z.number().int(),
  /** Line id from the bench (see `lineAddress` for its address). */
  line: z.string(),
  /** Line address ("1.2"). */
  lineAddress: z.string(),
  loadPercent: z.number(),
  telegrams: z.number().int(),
});
export type BusLoadSample = z.infer<typeof busLoadSampleSchema>;

/**
 * Telegrams per destination address within one virtual second, each counted once as its
 * sender sent it: first transmissions only, and a coupler's copy on another line is not
 * counted again. Keys are group addresses ("1/0/1") or, for an individually addressed
 * telegram, the individual address ("1.1.10").
 */
export const addressRateSampleSchema = z.object({
  second: z.number().int(),
  counts: z.record(z.string(), z.number().int()),
});
export type AddressRateSample = z.infer<typeof addressRateSampleSchema>;

/**
 * What one coupler did since the run started, counted as the log shows it:
 * `forwarded` telegrams it sent on the other line, `held` times it queued one
 * behind a busy line (a held telegram is usually forwarded later, so it counts
 * in both), and `dropped` by reason. A drop by filter table or "block all" counts
 * only when someone beyond the coupler listens to the address: a coupler keeping
 * a line's own traffic at home is doing its job, not losing anything.
 */
export const couplerTotalsSchema = z.object({
  /** Device id of the coupler. */
  id: z.string(),
  forwarded: z.number().int(),
  held: z.number().int(),
  dropped: z.record(couplerDropReasonSchema, z.number().int()),
});
export type CouplerTotals = z.infer<typeof couplerTotalsSchema>;

export const clockSchema = z.object({
  nowUs: z.number().int(),
  running: z.boolean(),
  speed: simSpeedSchema,
});
export type SimClock = z.infer<typeof clockSchema>;

export const benchSummarySchema = z.object({
  name: z.string(),
  /** Lines with their address ("1.2"). */
  lines: z.array(z.object({ id: z.string(), name: z.string(), address: z.string() })),
  testToolAddress: z.string(),
  groupAddresses: z.array(
    z.object({
      raw: z.number().int(),
      address: z.string(),
      name: z.string(),
      dpt: z.string(),
    }),
  ),
  devices: z.array(
    z.object({
      id: z.string(),
      name: z.string(),
      type: z.string(),
      typeLabel: z.string(),
      medium: z.enum(["knx", "unit-link"]),
      individualAddress: z.string().nullable(),
      buttons: z.array(z.object({ id: z.string(), label: z.string() })),
      objects: z.array(
        z.object({
          number: z.number().int(),
          name: z.string(),
          dpt: z.string(),
          role: z.string(),
          groupAddresses: z.array(z.string()),
        }),
      ),
      unitLinks: z.array(z.string()),
      /** Controller role on the unit link for gateways and wall controllers, else null. */
      role: z.enum(["primary", "secondary"]).nullable(),
    }),
  ),
  unitLinks: z.array(z.object({ id: z.string(), name: z.string(), members: z.array(z.string()) })),
  /** Tiles of control-panel devices (engine/devices/control-panel), in bench order. */
  controlPanelTiles: z.array(
    z.object({
      deviceId: z.string(),
      deviceName: z.string(),
      /** The tile's group object number (= tile index). */
      object: z.number().int(),
      label: z.string(),
      kind: z.enum(["toggle", "value", "scene", "status"]),
      dpt: z.string(),
      /** Local button a press goes through; null for a status tile. */
      buttonId: z.string().nullable(),
      /** The object's first linked address (where a command tile sends), null when not linked. */
      groupAddress: z.string().nullable(),
      /** Preset a value or scene tile sends; undefined for toggle and status tiles. */
      value: z.unknown(),
    }),
  ),
});
export type BenchSummary = z.infer<typeof benchSummarySchema>;
export type BenchDeviceSummary = BenchSummary["devices"][number];
export type BenchGroupAddressSummary = BenchSummary["groupAddresses"][number];

export const sceneDryRunResultSchema = z.object({
  groupAddress: z.string(),
  scene: z.number().int(),
  atUs: z.number().int(),
  settleUs: z.number().int(),
  changed: z.array(
    z.object({ deviceId: z.string(), name: z.string(), changes: z.array(z.string()) }),
  ),
  /** Devices listening to the address that changed nothing. */
  silent: z.array(z.object({ deviceId: z.string(), name: z.string() })),
});
export type SceneDryRunResult = z.infer<typeof sceneDryRunResultSchema>;

export const simMessageSchema = z.discriminatedUnion("type", [
  z.object({
    type: z.literal("loaded"),
    bench: benchSummarySchema,
    /**
     * The bench document the session runs, with every parameter change applied,
     * so the page draws exactly what is simulated instead of parsing its own copy.
     */
    document: benchSchema,
    clock: clockSchema,
    /** True for a new run (clear the log); false when only the bench changed (a parameter). */
    fresh: z.boolean(),
  }),
  z.object({
    type: z.literal("load-failed"),
    errors: z.array(z.object({ message: z.string(), path: z.string().optional() })),
  }),
  z.object({
    type: z.literal("batch"),
    /** Increasing per run, so the page can tell a batch from a previous run. */
    seq: z.number().int(),
    clock: clockSchema,
    rows: z.array(logRowSchema),
    /** Rows the worker dropped because the page fell behind (never shown). */
    dropped: z.number().int(),
    devices: z.array(deviceSnapshotSchema),
    /** Every active fault, when any changed; absent when unchanged. */
    faults: z.array(activeFaultSchema).optional(),
    rooms: z.array(roomSampleSchema),
    busLoad: z.array(busLoadSampleSchema),
    rates: z.array(addressRateSampleSchema),
    /** Every coupler's totals, when any changed (and in the first batch of a run); absent when unchanged. */
    couplers: z.array(couplerTotalsSchema).optional(),
  }),
  z.object({ type: z.literal("reset-done"), clock: clockSchema }),
  z.object({
    type: z.literal("command-error"),
    command: z.string(),
    field: z.string().optional(),
    message: z.string(),
  }),
  z.object({
    type: z.literal("recording"),
    on: z.boolean(),
    /** The engine recorder's RecordedAction list (JSON), when recording stopped. */
    actions: z.array(z.unknown()),
    settleUs: z.number().int(),
  }),
  z.object({ type: z.literal("scene-result"), result: sceneDryRunResultSchema }),
]);
export type SimMessage = z.infer<typeof simMessageSchema>;

/** Parses a command or names the field that is wrong. */
export function parseSimCommand(
  raw: unknown,
): { ok: true; value: ParsedSimCommand } | { ok: false; field: string; message: string } {
  if (typeof raw === "object" && raw !== null && (raw as { type?: unknown }).type === "input") {
    const input = inputCommandSchema.safeParse(raw);
    if (input.success)
      return {
        ok: true,
        value: {
          type: "input",
          input: input.data.input,
          command: input.data.input.kind,
          fields: {},
        },
      };
    const issue = input.error.issues[0];
    return {
      ok: false,
      field: issue?.path.join(".") || "input",
      message: issue?.message ?? "not a simulation input",
    };
  }
  const parsed = simCommandSchema.safeParse(raw);
  if (parsed.success) {
    const command = parsed.data;
    if (command.type in LEGACY_FIELDS) {
      const legacy = command as Extract<typeof command, { type: LegacyInputType }>;
      return {
        ok: true,
        value: {
          type: "input",
          input: legacyInput(legacy),
          command: legacy.type,
          fields: LEGACY_FIELDS[legacy.type],
        },
      };
    }
    return { ok: true, value: command as PlaybackCommand };
  }
  const issue = parsed.error.issues[0];
  return {
    ok: false,
    field: issue?.path.join(".") || "type",
    message: issue?.message ?? "not a simulation command",
  };
}

const SIM_MESSAGE_TYPES: ReadonlySet<string> = new Set(
  simMessageSchema.options.map((option) => option.shape.type.value),
);

/**
 * The page's check of a worker message: only the envelope (an object whose
 * `type` is one of the protocol's), then the message is trusted as typed.
 * The worker runs our own engine code, whose types the compiler checks, and
 * structured clone keeps them; the full schema (`parseSimMessage`) costs
 * main-thread time on every batch at Max speed for no protection, so it is
 * used by tests that check the session's output instead. A message of
 * another kind is a bug in the worker, so it throws.
 */
export function checkSimMessage(raw: unknown): SimMessage {
  const type =
    typeof raw === "object" && raw !== null ? (raw as { type?: unknown }).type : undefined;
  if (typeof type !== "string" || !SIM_MESSAGE_TYPES.has(type))
    throw new Error(`simulation worker sent a message of unknown type ${JSON.stringify(type)}`);
  return raw as SimMessage;
}

/** Parses a worker message against the full schema (tests); a bad one is a bug in the worker, so it throws with the field. */
export function parseSimMessage(raw: unknown): SimMessage {
  const parsed = simMessageSchema.safeParse(raw);
  if (parsed.success) return parsed.data;
  const issue = parsed.error.issues[0];
  throw new Error(
    `simulation worker sent a bad message at ${issue?.path.join(".") || "type"}: ${issue?.message}`,
  );
}
