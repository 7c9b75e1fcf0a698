export { SimHarness, type Duration } from "./sim-harness";
export { BenchBuilder, benchBuilder, type BuiltBench } from "./bench-builder";
export { hallFixture, lightsFixture, twoFloorsFixture } from "./fixture-benches";
export {
  registerTestDevices,
  testRecorderType,
  testLinkRecorderType,
  type RecorderState,
} from "./test-devices";
