export {
  BUS_FAULTS,
  BenchLoadFailure,
  DEFAULT_GROUP_PRIORITY,
  Simulation,
  TEST_TOOL_SENDER,
  UNIT_LINK_BROKEN,
  UNIT_LINK_DELAY_US,
  createSimulation,
  tryCreateSimulation,
  type SendOptions,
  type SimulationOptions,
} from "./simulation";
export type { SimError } from "./sim-error";
export {
  parseSimInput,
  simInputSchema,
  type Receipt,
  type SimInput,
  type SimInputKind,
} from "./sim-input";
export {
  LiveSession,
  SimHost,
  DEFAULT_BACKLOG_CAPACITY,
  DEFAULT_MAX_ROWS_PER_BATCH,
  DEFAULT_TICK_BUDGET_MS,
  formatValue,
  type LiveSessionOptions,
  type SimHostOptions,
} from "./live/live-session";
export { summarizeBench } from "./live/bench-summary";
