import { benchSchema, type Bench } from "@/engine";
import { hallFixture } from "@/test/harness/fixture-benches";

/** A small bench for the editor's tests: a rocker, a relay and four addresses on two lines. */
export function testBench(): Bench {
  return benchSchema.parse(
    hallFixture()
      .named("Editor test bench")
      .line("upper", "1.2", "Upper floor")
      .groupAddress("3/1/2", "9.001", "Lab setpoint")
      .link("pb-hall", 0, "1/0/1")
      .link("act-hall", 0, "1/0/1")
      .link("act-hall", 1, "1/0/2")
      .build(),
  );
}
