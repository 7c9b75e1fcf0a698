import type { LoadedBench } from "../bench";
import type { Telegram, Tp1LineHost } from "../bus";
import type { Scheduler } from "../core/scheduler";
import type { DataFrame } from "../frame";
import type { CouplerNetwork } from "./couplers";
import type { DeviceRunner, DeviceRuntime } from "./device-runtime";
import type { FaultRegistry } from "./fault-registry";
import type { GroupObjectLayer, LineRuntime } from "./group-objects";
import type { DispatchRuntime } from "./input-dispatch";
import type { TraceEmitter } from "./trace-emitter";

/**
 * What the simulation's parts reach each other through: small classes the
 * simulation builds once per run, not literals (engine/core/run-objects.ts).
 */
/** What a line asks of the simulation at the end of a frame. */
export class SimulationLineHost implements Tp1LineHost {
  constructor(
    private readonly runtime: LineRuntime,
    private readonly objects: GroupObjectLayer,
    private readonly couplers: () => CouplerNetwork,
  ) {}

  receiveFrame(telegram: Telegram, repeated: boolean): number {
    return this.objects.receiveFrame(this.runtime, telegram, repeated);
  }

  telegramLost(telegram: Telegram): void {
    this.couplers().lost(telegram);
  }
}

/** The parts and actions input dispatch works through. */
export class SimulationDispatchRuntime implements DispatchRuntime {
  constructor(
    readonly clock: Scheduler,
    readonly emitter: TraceEmitter,
    readonly faults: FaultRegistry,
    readonly objects: GroupObjectLayer,
    readonly runner: DeviceRunner,
    readonly deviceById: ReadonlyMap<string, DeviceRuntime>,
    readonly reuse: boolean,
    readonly bench: () => LoadedBench,
    readonly setBench: (bench: LoadedBench) => void,
    readonly rebuildListeners: () => void,
    readonly queueFromTestTool: (frame: DataFrame) => number,
  ) {}
}
