export {
  BENCH_FORMAT,
  benchSchema,
  type Bench,
  type BenchInput,
  type BenchDevice,
  type BenchGroupAddress,
  type BenchLine,
  type BenchArea,
  type BenchLink,
  type BenchUnitLink,
  type Position,
  benchRoomSchema,
  type BenchRoom,
} from "./bench-schema";
export type { BenchError } from "./bench-error";
export { migrateBench, benchMigrations, type BenchMigration } from "./bench-migrations";
export {
  BENCH_ROOM_DEFAULTS,
  loadBench,
  jsonPath,
  type LoadedBench,
  type LoadedDevice,
  type LoadedGroupAddress,
  type LoadedLine,
  type LoadedObject,
  type LoadBenchOptions,
} from "./load-bench";
