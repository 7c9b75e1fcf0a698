import { SampleRing } from "./sample-ring";
import type { LogRow } from "./sim-protocol";

/** The telegram log's storage: a ring of rows mutated in place (see SampleRing). */
export class LogRing extends SampleRing<LogRow> {}
