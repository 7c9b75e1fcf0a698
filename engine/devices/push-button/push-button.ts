import { z } from "zod";
import {
  flags,
  type DeviceEffect,
  type DeviceType,
  type GroupObjectSpec,
  type LocalButtonSpec,
} from "../device-type";

/**
 * A wall push-button with up to eight rockers ("channels"). Each channel has one
 * group object whose DPT follows the channel's function:
 *
 * - toggle: 1.001, flags C W T U. A press sends the opposite of the object's
 *   value. Linking the actuator's status address as a second (listening) address
 *   keeps the toggle in step with changes made elsewhere — the usual wiring.
 * - on / off: 1.001, C T. A press always sends on (off).
 * - value: 5.001, C T. A press sends the configured percentage.
 * - scene: 17.001, C T. A press recalls the configured scene (1..64).
 *
 * Object number = channel index (0-based), so numbers stay put when a channel's
 * function changes.
 */
export const pushButtonChannelSchema = z.object({
  function: z.enum(["toggle", "on", "off", "value", "scene"]).default("toggle"),
  /** Percentage a value channel sends, 0..100 (DPT 5.001). */
  percent: z.number().min(0).max(100).default(100),
  /** Scene a scene channel recalls, 1..64 (DPT 17.001). */
  scene: z.number().int().min(1).max(64).default(1),
});

export const pushButtonParametersSchema = z.object({
  channels: z
    .array(pushButtonChannelSchema)
    .min(1)
    .max(8)
    .default([{ function: "toggle", percent: 100, scene: 1 }]),
});

export type PushButtonChannel = z.infer<typeof pushButtonChannelSchema>;
export type PushButtonParameters = z.infer<typeof pushButtonParametersSchema>;

/** How often each channel has been pressed; shown on the device card and asserted in scenarios. */
export interface PushButtonState {
  readonly presses: readonly number[];
}

const OBJECT_NAMES: Readonly<Record<PushButtonChannel["function"], string>> = {
  toggle: "Switch",
  on: "Switch on",
  off: "Switch off",
  value: "Value",
  scene: "Scene",
};

const OBJECT_DPTS: Readonly<Record<PushButtonChannel["function"], string>> = {
  toggle: "1.001",
  on: "1.001",
  off: "1.001",
  value: "5.001",
  scene: "17.001",
};

function buttonId(channel: number): string {
  return `channel-${channel + 1}`;
}

export const pushButtonType: DeviceType<PushButtonParameters, PushButtonState> = {
  id: "push-button",
  label: "Push-button",
  description:
    "Wall push-button with up to eight rockers: toggle, on, off, value (5.001) or scene (17.001) per rocker.",
  medium: "knx",
  parameters: pushButtonParametersSchema,

  groupObjects(parameters): readonly GroupObjectSpec[] {
    return parameters.channels.map((channel, index) => ({
      number: index,
      name: `${OBJECT_NAMES[channel.function]} ${index + 1}`,
      dpt: OBJECT_DPTS[channel.function],
      // A toggle listens to the status it toggles; the others only send.
      flags: flags(channel.function === "toggle" ? "CWTU" : "CT"),
      role: "command",
    }));
  },

  buttons(parameters): readonly LocalButtonSpec[] {
    return parameters.channels.map((_, index) => ({
      id: buttonId(index),
      label: `Rocker ${index + 1}`,
    }));
  },

  initialState(parameters) {
    return { presses: parameters.channels.map(() => 0) };
  },

  transition(state, event, context) {
    if (event.kind !== "button" || event.action !== "press") return { state, effects: [] };
    const index = context.parameters.channels.findIndex((_, i) => buttonId(i) === event.button);
    const channel = context.parameters.channels[index];
    if (channel === undefined)
      return { state, effects: [{ kind: "note", text: `no rocker "${event.button}"` }] };
    const presses = state.presses.map((count, i) => (i === index ? count + 1 : count));
    let effect: DeviceEffect;
    let transition: string;
    switch (channel.function) {
      case "toggle": {
        const next = context.objectValue(index) !== true;
        effect = { kind: "group.send", object: index, service: "write", value: next };
        transition = next ? "rocker.toggled-on" : "rocker.toggled-off";
        break;
      }
      case "on":
      case "off":
        effect = {
          kind: "group.send",
          object: index,
          service: "write",
          value: channel.function === "on",
        };
        transition = `rocker.switched-${channel.function}`;
        break;
      case "value":
        effect = { kind: "group.send", object: index, service: "write", value: channel.percent };
        transition = "rocker.value-sent";
        break;
      case "scene":
        effect = { kind: "group.send", object: index, service: "write", value: channel.scene };
        transition = "rocker.scene-recalled";
        break;
    }
    return { state: { presses }, effects: [effect], transition };
  },
};
