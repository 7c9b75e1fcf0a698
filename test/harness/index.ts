export { SimHarness, type Duration } from "./sim-harness";
export { BenchBuilder, benchBuilder } from "./bench-builder";
export {
  registerTestDevices,
  testRecorderType,
  testLinkRecorderType,
  type RecorderState,
} from "./test-devices";
