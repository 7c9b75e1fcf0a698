import { z } from "zod";
import { registerDeviceType } from "@/engine";
import { flags, type DeviceEffect, type DeviceType } from "@/engine";

/**
 * A device type for the runtime's own tests and benchmarks, never in the
 * built-in catalogue list unless `registerTestDevices()` is called: it records
 * every event it gets and does what its inputs tell it, so tests can drive each
 * effect and observe each event.
 *
 * Objects: 0 "Counter" 7.001 with flags from the `objectFlags` parameter
 * (default C W T U); 1 "Switch" 1.001 C W T U.
 * Inputs: "send" (value for object 0), "send-random" (0..999 from the run's
 * generator), "send-switch", "read" (object 0), "store",
 * "link" ({link, message}), "timer" ({name, delayUs, data?}), "cancel" (name),
 * "raise" (fault), "clear" (fault), "note" (text).
 */
export interface RecorderState {
  readonly writes: readonly unknown[];
  readonly responses: readonly unknown[];
  readonly received: readonly string[];
}

export const recorderParametersSchema = z.object({
  medium: z.enum(["knx", "unit-link"]).default("knx"),
  objectFlags: z.string().default("CWTU"),
});

export type RecorderParameters = z.infer<typeof recorderParametersSchema>;

function recorder(medium: "knx" | "unit-link"): DeviceType<RecorderParameters, RecorderState> {
  return {
    id: medium === "knx" ? "test-recorder" : "test-link-recorder",
    label: "Test recorder",
    description: "Records every event; used by the runtime's tests and benchmarks.",
    medium,
    parameters: recorderParametersSchema,
    groupObjects: (p) =>
      medium === "knx"
        ? [
            {
              number: 0,
              name: "Counter",
              dpt: "7.001",
              flags: flags(p.objectFlags),
              role: "input",
            },
            { number: 1, name: "Switch", dpt: "1.001", flags: flags("CWTU"), role: "input" },
          ]
        : [],
    buttons: () => [{ id: "button", label: "Button" }],
    initialState: () => ({ writes: [], responses: [], received: [] }),
    transition(state, event, context) {
      const received = [
        ...state.received,
        event.kind === "link.receive"
          ? `link.receive:${event.from}:${JSON.stringify(event.message)}`
          : event.kind === "timer"
            ? `timer:${event.name}`
            : event.kind === "fault.inject" || event.kind === "fault.clear"
              ? `${event.kind}:${event.fault}`
              : event.kind,
      ];
      switch (event.kind) {
        case "group.write":
          return {
            state: { ...state, received, writes: [...state.writes, event.value] },
            effects: [],
            transition: "recorded.write",
          };
        case "group.response":
          return {
            state: { ...state, received, responses: [...state.responses, event.value] },
            effects: [],
          };
        case "input": {
          const v = event.value as never;
          const effect: DeviceEffect | undefined = {
            send: { kind: "group.send", object: 0, service: "write", value: v } as const,
            "send-random": {
              kind: "group.send",
              object: 0,
              service: "write",
              value: Math.floor(context.random() * 1000),
            } as const,
            "send-switch": { kind: "group.send", object: 1, service: "write", value: v } as const,
            read: { kind: "group.read", object: 0 } as const,
            store: { kind: "object.store", object: 0, value: v } as const,
            link: { kind: "link.send", ...(v as { link: string; message: unknown }) } as const,
            timer: { kind: "timer.set", ...(v as { name: string; delayUs: number }) } as const,
            cancel: { kind: "timer.cancel", name: v } as const,
            raise: { kind: "fault.raise", fault: v, text: "raised by test" } as const,
            clear: { kind: "fault.clear", fault: v } as const,
            note: { kind: "note", text: v } as const,
          }[event.input];
          return { state: { ...state, received }, effects: effect === undefined ? [] : [effect] };
        }
        default:
          return { state: { ...state, received }, effects: [] };
      }
    },
  };
}

export const testRecorderType = recorder("knx");
export const testLinkRecorderType = recorder("unit-link");

/** Registers the test recorders in the catalogue (idempotent). */
export function registerTestDevices(): void {
  registerDeviceType(testRecorderType);
  registerDeviceType(testLinkRecorderType);
}
