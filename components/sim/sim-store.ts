import { createStore, type StoreApi } from "zustand/vanilla";
import { ChartSamples } from "./chart-samples";
import { LogRing } from "./log-ring";
import type { Bench } from "@/engine";
import type {
  ActiveFault,
  BenchSummary,
  CouplerTotals,
  DeviceSnapshot,
  SceneDryRunResult,
  SimClock,
  SimMessage,
} from "./sim-protocol";

/** Rows the log keeps; older ones scroll away. */
export const LOG_CAPACITY = 100_000;
export { ROOM_SAMPLES_KEPT, SECONDS_KEPT } from "./chart-samples";

/** A device as the inspector shows it, with change counters that drive the highlight. */
export interface DeviceView extends DeviceSnapshot {
  /** Bumped each time the device's state or faults change. */
  readonly stateVersion: number;
  /** Object number -> bumped each time that object's value changes. */
  readonly objectVersions: Readonly<Record<number, number>>;
}

export interface SimError {
  readonly command: string;
  readonly field?: string;
  readonly message: string;
  /** Increases with every error, so the page can show a repeated one again. */
  readonly id: number;
}

export interface RecordedDraft {
  /** The engine recorder's RecordedAction list. */
  readonly actions: readonly unknown[];
  readonly settleUs: number;
}

export interface SimState {
  readonly status: "idle" | "ready" | "failed";
  readonly bench: BenchSummary | null;
  /** The bench document the worker runs (parameter changes applied); what the live canvas draws. */
  readonly benchDocument: Bench | null;
  readonly loadErrors: readonly { message: string; path?: string }[];
  readonly clock: SimClock;
  /** Mutated in place; watch `logVersion`. */
  readonly log: LogRing;
  /** Bumped once per batch that added rows: the one number the log view re-renders on. */
  readonly logVersion: number;
  readonly telegramRows: number;
  readonly droppedRows: number;
  readonly batches: number;
  readonly devices: Readonly<Record<string, DeviceView>>;
  readonly faults: readonly ActiveFault[];
  /** What each coupler forwarded, held and dropped since the run started (empty on a bench without couplers). */
  readonly couplers: readonly CouplerTotals[];
  /** Chart samples in rings, mutated in place; watch `chartVersion`. */
  readonly charts: ChartSamples;
  /** Bumped once per batch that added chart samples: what the charts redraw on. */
  readonly chartVersion: number;
  readonly recording: boolean;
  readonly recordedDraft: RecordedDraft | null;
  readonly sceneResult: SceneDryRunResult | null;
  readonly lastError: SimError | null;
}

export interface SimActions {
  /** Folds one worker message into the state; one `set` per message. */
  apply(message: SimMessage): void;
  clearRecordedDraft(): void;
  clearError(): void;
}

export type SimStore = StoreApi<SimState & SimActions>;

function initialState(log: LogRing, charts: ChartSamples): SimState {
  return {
    status: "idle",
    bench: null,
    benchDocument: null,
    loadErrors: [],
    clock: { nowUs: 0, running: false, speed: 1 },
    log,
    logVersion: 0,
    telegramRows: 0,
    droppedRows: 0,
    batches: 0,
    devices: {},
    faults: [],
    couplers: [],
    charts,
    chartVersion: 0,
    recording: false,
    recordedDraft: null,
    sceneResult: null,
    lastError: null,
  };
}

/**
 * The live console's page state, fed by the worker's batches. The log lives
 * in a ring mutated in place, and each batch is one `set`, so a busy bus
 * costs at most one re-render per batch (about 20 a second), never one per
 * telegram.
 */
export function createSimStore(options: { logCapacity?: number } = {}): SimStore {
  const log = new LogRing(options.logCapacity ?? LOG_CAPACITY);
  const charts = new ChartSamples();
  let errorId = 0;
  return createStore<SimState & SimActions>()((set, get) => ({
    ...initialState(log, charts),
    clearRecordedDraft: () => set({ recordedDraft: null }),
    clearError: () => set({ lastError: null }),
    apply(message) {
      const state = get();
      switch (message.type) {
        case "loaded":
          if (message.fresh) {
            log.clear();
            charts.reset(message.bench.lines.length);
            set({
              ...initialState(log, charts),
              status: "ready",
              bench: message.bench,
              benchDocument: message.document,
              clock: message.clock,
              logVersion: state.logVersion + 1,
              chartVersion: state.chartVersion + 1,
            });
          } else {
            set({ bench: message.bench, benchDocument: message.document, clock: message.clock });
          }
          return;
        case "load-failed":
          set({ status: "failed", loadErrors: message.errors });
          return;
        case "reset-done":
          set({ clock: message.clock });
          return;
        case "command-error":
          set({
            lastError: {
              command: message.command,
              field: message.field,
              message: message.message,
              id: ++errorId,
            },
          });
          return;
        case "recording":
          set(
            message.on
              ? { recording: true, recordedDraft: null }
              : {
                  recording: false,
                  recordedDraft:
                    message.actions.length > 0
                      ? { actions: message.actions, settleUs: message.settleUs }
                      : state.recordedDraft,
                },
          );
          return;
        case "scene-result":
          set({ sceneResult: message.result });
          return;
        case "batch":
          set(foldBatch(state, message));
          return;
      }
    },
  }));
}

function foldBatch(
  state: SimState,
  batch: Extract<SimMessage, { type: "batch" }>,
): Partial<SimState> {
  const next: { -readonly [K in keyof SimState]?: SimState[K] } = {
    clock: batch.clock,
    batches: state.batches + 1,
  };
  if (batch.rows.length > 0) {
    state.log.push(batch.rows);
    let telegrams = 0;
    for (let i = 0; i < batch.rows.length; i++) if (batch.rows[i]!.kind === "telegram") telegrams++;
    next.logVersion = state.logVersion + 1;
    next.telegramRows = state.telegramRows + telegrams;
  }
  if (batch.dropped > 0) next.droppedRows = state.droppedRows + batch.dropped;
  if (batch.devices.length > 0) {
    const devices: Record<string, DeviceView> = { ...state.devices };
    for (const snapshot of batch.devices)
      devices[snapshot.id] = mergeDevice(devices[snapshot.id], snapshot);
    next.devices = devices;
  }
  if (batch.faults !== undefined) next.faults = batch.faults;
  if (batch.couplers !== undefined) next.couplers = batch.couplers;
  // Appended in place: copying the kept samples on every batch cost main-thread time at Max speed.
  if (state.charts.add(batch.rooms, batch.busLoad, batch.rates))
    next.chartVersion = state.chartVersion + 1;
  return next;
}

function mergeDevice(previous: DeviceView | undefined, snapshot: DeviceSnapshot): DeviceView {
  if (previous === undefined) return { ...snapshot, stateVersion: 0, objectVersions: {} };
  const objectVersions: Record<number, number> = { ...previous.objectVersions };
  const before = new Map(previous.objects.map((o) => [o.number, o.value]));
  for (const object of snapshot.objects) {
    if (before.get(object.number) !== object.value)
      objectVersions[object.number] = (objectVersions[object.number] ?? 0) + 1;
  }
  const stateChanged =
    JSON.stringify(previous.state) !== JSON.stringify(snapshot.state) ||
    previous.faults.join() !== snapshot.faults.join() ||
    previous.transition !== snapshot.transition;
  return {
    ...snapshot,
    stateVersion: previous.stateVersion + (stateChanged ? 1 : 0),
    objectVersions,
  };
}
