import { formatGroupAddress, parseGroupAddress } from "../address";
import { loadBench, type BenchError, type LoadedBench } from "../bench";
import type { Bench } from "../bench/bench-schema";
import { err, ok, type Result } from "../core/result";
import { getDpt } from "../dpt";
import type { DataFrame, GroupService } from "../frame";
import type { DeviceRunner, DeviceRuntime } from "./device-runtime";
import { BUS_FAULTS, UNIT_LINK_BROKEN, type FaultRegistry } from "./fault-registry";
import { DEFAULT_GROUP_PRIORITY, groupFrame, type GroupObjectLayer } from "./group-objects";
import { deviceButtons, reloadedBench } from "./prepared-bench";
import type { SimError } from "./sim-error";
import type { Receipt, SimInput } from "./sim-input";
import type { TraceEmitter } from "./trace-emitter";

/** What the input dispatch acts on: the simulation's parts and its bench. */
export interface DispatchRuntime {
  readonly clock: { readonly nowUs: number };
  readonly emitter: TraceEmitter;
  readonly faults: FaultRegistry;
  readonly objects: GroupObjectLayer;
  readonly runner: DeviceRunner;
  readonly deviceById: ReadonlyMap<string, DeviceRuntime>;
  readonly reuse: boolean;
  /** The bench as it stands. */
  bench(): LoadedBench;
  /** Replaces the bench after a parameter change. */
  setBench(bench: LoadedBench): void;
  /** Rebuilds every line's listener table from the devices' objects. */
  rebuildListeners(): void;
  /** Queues a frame from the test tool on its line; returns the telegram id. */
  queueFromTestTool(frame: DataFrame): number;
}

/**
 * The one dispatch of simulation inputs: checks each input against the bench,
 * traces it as a user action carrying the input, and acts through the parts.
 * A refused input changes nothing and comes back as a `SimError` naming the
 * input's field.
 */
export class InputDispatch {
  constructor(private readonly rt: DispatchRuntime) {}

  apply(input: SimInput): Result<Receipt, SimError> {
    const atUs = this.rt.clock.nowUs;
    switch (input.kind) {
      case "write":
      case "read":
      case "response": {
        const sent = this.sendFromOutside(input);
        return sent.ok ? ok({ atUs, telegramId: sent.value }) : sent;
      }
      case "press": {
        const device = this.rt.deviceById.get(input.device);
        if (device === undefined) return unknownDevice(input.device);
        const buttons = deviceButtons(device.loaded, this.rt.reuse);
        if (!buttons.some((b) => b.id === input.button)) {
          return err({
            kind: "sim.button-unknown",
            field: "button",
            message: `device "${input.device}" has no button "${input.button}" (it has ${buttons.map((b) => `"${b.id}"`).join(", ") || "none"})`,
          });
        }
        const action = input.action ?? "press";
        this.rt.emitter.userAction(
          { action: "button", deviceId: input.device, detail: `${action} ${input.button}` },
          input,
        );
        this.rt.runner.transition(device, { kind: "button", button: input.button, action });
        return ok({ atUs });
      }
      case "set-input": {
        const device = this.rt.deviceById.get(input.device);
        if (device === undefined) return unknownDevice(input.device);
        this.rt.emitter.userAction(
          {
            action: "input",
            deviceId: input.device,
            detail: `${input.input} = ${JSON.stringify(input.value)}`,
          },
          input,
        );
        this.rt.runner.transition(device, {
          kind: "input",
          input: input.input,
          value: input.value,
        });
        return ok({ atUs });
      }
      case "set-parameter": {
        const device = this.rt.deviceById.get(input.device);
        if (device === undefined) return unknownDevice(input.device);
        const current = this.rt.bench().bench.devices.find((d) => d.id === input.device)!;
        const parameters = { ...current.parameters, [input.parameter]: input.value };
        return this.reloadDevice(device, parameters, input, atUs);
      }
      case "set-parameters": {
        const device = this.rt.deviceById.get(input.device);
        if (device === undefined) return unknownDevice(input.device);
        return this.reloadDevice(device, input.parameters, input, atUs);
      }
      case "inject-fault":
      case "clear-fault": {
        const result = this.setFault(input);
        return result.ok ? ok({ atUs }) : result;
      }
    }
  }

  /** A parameter change: the bench is re-checked with the new parameters, then the device restarts. */
  private reloadDevice(
    device: DeviceRuntime,
    parameters: Record<string, unknown>,
    input: SimInput,
    atUs: number,
  ): Result<Receipt, SimError> {
    const deviceId = device.id;
    const current = this.rt.bench();
    const bench = current.bench;
    // Only a change not made before from this bench builds and checks the new bench document.
    const loaded = reloadedBench(current, deviceId, parameters, this.rt.reuse, () => {
      const document: Bench = {
        ...bench,
        devices: bench.devices.map((d) => (d.id === deviceId ? { ...d, parameters } : d)),
      };
      // Drop links to objects the new parameters remove; the loader would otherwise refuse them.
      const objects = new Set(
        device.type
          .groupObjects(
            device.type.parameters.safeParse(parameters).data ?? device.loaded.parameters,
          )
          .map((o) => o.number),
      );
      const pruned: Bench = {
        ...document,
        links: document.links.filter((l) => l.device !== deviceId || objects.has(l.object)),
      };
      return loadBench(pruned, {
        deviceTypes: (id) => current.devices.find((d) => d.type.id === id)?.type ?? undefined,
      });
    });
    if (!loaded.ok) return err(parametersRefused(loaded.error));
    this.rt.setBench(loaded.value);
    this.rt.emitter.userAction(
      { action: "parameter", deviceId, detail: JSON.stringify(parameters) },
      input,
    );
    this.rt.runner.reset(device, loaded.value.deviceById.get(deviceId)!);
    this.rt.rebuildListeners();
    this.rt.runner.start(device);
    return ok({ atUs });
  }

  // ---------------------------------------------------------------- internals

  private setFault(
    input: Extract<SimInput, { kind: "inject-fault" | "clear-fault" }>,
  ): Result<void, SimError> {
    const target = input.device;
    const fault = input.fault;
    const active = input.kind === "inject-fault";
    const action = active ? "fault.inject" : "fault.clear";
    const device = this.rt.deviceById.get(target);
    if (device !== undefined) {
      this.rt.emitter.userAction({ action, deviceId: target, detail: fault }, input);
      const changed = active
        ? this.rt.faults.raise(target, fault, "user")
        : this.rt.faults.clear(target, fault, "user");
      if (!changed) return ok(undefined);
      device.busAnswer = this.rt.faults.busAnswer(target);
      this.rt.runner.transition(
        device,
        active ? { kind: "fault.inject", fault } : { kind: "fault.clear", fault },
      );
      // Bus power is back: the device runs its start-up sequence as at first start.
      if (!active && fault === BUS_FAULTS.silent) this.rt.runner.powerReturn(device);
      return ok(undefined);
    }
    if (this.rt.bench().unitLinks.some((l) => l.id === target)) {
      if (fault !== UNIT_LINK_BROKEN) {
        return err({
          kind: "sim.fault-unknown",
          field: "fault",
          message: `a unit link only has the fault "${UNIT_LINK_BROKEN}", not "${fault}"`,
        });
      }
      this.rt.emitter.userAction({ action, unitLink: target, detail: fault }, input);
      this.rt.faults.setBroken(target, active);
      return ok(undefined);
    }
    return err({
      kind: "sim.fault-target-unknown",
      field: "device",
      message: `no device or unit link "${target}"`,
    });
  }

  private sendFromOutside(
    input: Extract<SimInput, { kind: "write" | "read" | "response" }>,
  ): Result<number, SimError> {
    const service = SERVICE_OF_INPUT[input.kind];
    const groupAddress = input.groupAddress;
    const value = input.kind === "read" ? undefined : input.value;
    const options = input;
    let raw: number;
    if (typeof groupAddress === "number") {
      if (!Number.isInteger(groupAddress) || groupAddress < 1 || groupAddress > 0xffff) {
        return err({
          kind: "sim.group-address-invalid",
          field: "groupAddress",
          message: `group address ${groupAddress} is not a raw address 1..65535`,
        });
      }
      raw = groupAddress;
    } else {
      const parsed = parseGroupAddress(groupAddress);
      if (!parsed.ok)
        return err({
          kind: "sim.group-address-invalid",
          field: "groupAddress",
          message: parsed.error.message,
        });
      raw = parsed.value;
    }
    const ga = this.rt.bench().groupAddresses.get(raw);
    if (ga === undefined) {
      return err({
        kind: "sim.group-address-unknown",
        field: "groupAddress",
        message: `group address ${formatGroupAddress(raw)} is not on this bench, so its DPT is unknown`,
      });
    }
    let payload = EMPTY_PAYLOAD;
    if (service !== "GroupValue_Read") {
      const codec = getDpt(ga.dpt)!;
      const encoded = codec.encode(value);
      if (!encoded.ok)
        return err({
          kind: "sim.value-invalid",
          field: "value",
          message: `${formatGroupAddress(raw)}: ${encoded.error.message}`,
        });
      payload = encoded.value;
    }
    const priority = options.priority ?? DEFAULT_GROUP_PRIORITY;
    const action = service === "GroupValue_Read" ? "group.read" : "group.write";
    const detail =
      service === "GroupValue_Read"
        ? "read"
        : `${service === "GroupValue_Write" ? "write" : "response"} ${JSON.stringify(value)}`;
    if (options.from !== undefined) {
      const device = this.rt.deviceById.get(options.from);
      if (device === undefined) return unknownDevice(options.from, "from");
      if (device.sender === undefined) {
        return err({
          kind: "sim.device-not-on-line",
          field: "from",
          message: `device "${options.from}" is not on a KNX line and cannot send telegrams`,
        });
      }
      this.rt.emitter.userAction(
        { action, deviceId: device.id, groupAddress: raw, detail },
        withTextAddress(input, raw),
      );
      const id = this.rt.objects.queueFromDevice(
        device,
        service,
        raw,
        payload,
        ga.sizeBits,
        priority,
      );
      if (id === undefined)
        return err({
          kind: "sim.device-not-on-line",
          field: "from",
          message: `device "${options.from}" is disconnected ("${BUS_FAULTS.silent}")`,
        });
      return ok(id);
    }
    this.rt.emitter.userAction({ action, groupAddress: raw, detail }, withTextAddress(input, raw));
    const frame = groupFrame(
      this.rt.bench().testToolAddress,
      raw,
      service,
      payload,
      ga.sizeBits,
      priority,
    );
    return ok(this.rt.queueFromTestTool(frame));
  }
}
const EMPTY_PAYLOAD: Uint8Array = new Uint8Array(0);

const SERVICE_OF_INPUT: Readonly<Record<"write" | "read" | "response", GroupService>> = {
  write: "GroupValue_Write",
  read: "GroupValue_Read",
  response: "GroupValue_Response",
};

/** The input as the trace keeps it: the group address as text, optional fields left out when absent. */
function withTextAddress(
  input: Extract<SimInput, { kind: "write" | "read" | "response" }>,
  raw: number,
): SimInput {
  const { from, priority } = input;
  return {
    ...(input.kind === "read"
      ? { kind: "read" as const, groupAddress: formatGroupAddress(raw) }
      : { kind: input.kind, groupAddress: formatGroupAddress(raw), value: input.value }),
    ...(from === undefined ? {} : { from }),
    ...(priority === undefined ? {} : { priority }),
  } as SimInput;
}

/** Bench errors of a refused parameter change, folded into one error naming the first field. */
function parametersRefused(errors: readonly BenchError[]): SimError {
  return {
    kind: "sim.parameters-invalid",
    field: errors[0]?.path ?? "parameters",
    message: errors.map((e) => e.message).join("; "),
    issues: errors,
  };
}

function unknownDevice(
  deviceId: string,
  field = "device",
): { readonly ok: false; readonly error: SimError } {
  return err({
    kind: "sim.device-unknown",
    field,
    message: `no device "${deviceId}" on this bench`,
  });
}
