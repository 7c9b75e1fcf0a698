export {
  benchCouplers,
  benchTopology,
  generateFilterTable,
  generateFilterTableTexts,
  loadedAddressUses,
  type BenchTopology,
  type TopologyArea,
  type TopologyCoupler,
  type TopologyLine,
} from "./bench-topology";
export {
  groupPasses,
  individualPasses,
  mainGroupOf,
  nextHopCount,
  UNFILTERED_MAIN_GROUPS,
  UNLIMITED_HOP_COUNT,
  type CouplerDropReason,
  type CrossingDirection,
  type GroupTelegramMode,
  type IndividualTelegramMode,
} from "./coupler-rules";
export { generatedFilterTable, mustCross } from "./filter-table";
export { addressUses, type AddressUse } from "./address-use";
export {
  areaOf,
  couplerLines,
  formatLineAddress,
  lineNumberOf,
  parseLineAddress,
  isWithin,
  linePath,
  lineKind,
  upperLineAddress,
  MAX_AREAS,
  MAX_LINES_PER_AREA,
  type LineKind,
} from "./line-address";
