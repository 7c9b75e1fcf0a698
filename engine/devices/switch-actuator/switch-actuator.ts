import { z } from "zod";
import { startupDelaySchema } from "../startup-delay";
import {
  flags,
  type DeviceEffect,
  type DeviceType,
  type GroupObjectSpec,
  type LocalButtonSpec,
} from "../device-type";

/**
 * A switch actuator with 1..8 relay outputs. Per channel c (0-based):
 *
 * - object 2c "Switch": 1.001, flags C W. Writes switch the relay.
 * - object 2c+1 "Status": 1.001, flags C R T, present only when `statusObjects`
 *   is on. The status is sent when the relay changes (not on every write, to keep
 *   the line quiet — common practice, no published source) and answers reads.
 *
 * `staircaseS` > 0 turns a channel off again that many seconds after it was
 * switched on (a staircase timer); every further "on" restarts the time.
 * Each channel also has a manual button on the device that toggles the relay.
 */
export const switchActuatorParametersSchema = z.object({
  channels: z.number().int().min(1).max(8).default(1),
  statusObjects: z.boolean().default(true),
  staircaseS: z.number().int().min(0).max(86_400).default(0),
  /** Delay after bus power returns before the status objects are sent, s. */
  startupDelayS: startupDelaySchema,
});

export type SwitchActuatorParameters = z.infer<typeof switchActuatorParametersSchema>;

/** Relay position per channel. */
export interface SwitchActuatorState {
  readonly on: readonly boolean[];
}

/** Object number of channel `c`'s switch object. */
export function switchObject(channel: number): number {
  return 2 * channel;
}

/** Object number of channel `c`'s status object. */
export function statusObject(channel: number): number {
  return 2 * channel + 1;
}

function staircaseTimer(channel: number): string {
  return `staircase-${channel + 1}`;
}

function switchChannel(
  state: SwitchActuatorState,
  channel: number,
  on: boolean,
  parameters: SwitchActuatorParameters,
  why: string,
): { state: SwitchActuatorState; effects: DeviceEffect[]; transition?: string } {
  const effects: DeviceEffect[] = [];
  if (parameters.staircaseS > 0) {
    effects.push(
      on
        ? {
            kind: "timer.set",
            name: staircaseTimer(channel),
            delayUs: parameters.staircaseS * 1_000_000,
          }
        : { kind: "timer.cancel", name: staircaseTimer(channel) },
    );
  }
  if (state.on[channel] === on) return { state, effects };
  if (parameters.statusObjects)
    effects.push({
      kind: "group.send",
      object: statusObject(channel),
      service: "write",
      value: on,
    });
  const next = state.on.slice();
  next[channel] = on;
  return { state: { on: next }, effects, transition: `${why}.${on ? "on" : "off"}` };
}

export const switchActuatorType: DeviceType<SwitchActuatorParameters, SwitchActuatorState> = {
  id: "switch-actuator",
  label: "Switch actuator",
  description:
    "Relay outputs switched by 1-bit writes, with optional status feedback and a staircase timer.",
  medium: "knx",
  parameters: switchActuatorParametersSchema,
  startupDelayS: (p) => p.startupDelayS,

  groupObjects(parameters): readonly GroupObjectSpec[] {
    const objects: GroupObjectSpec[] = [];
    for (let c = 0; c < parameters.channels; c++) {
      objects.push({
        number: switchObject(c),
        name: `Switch ${c + 1}`,
        dpt: "1.001",
        flags: flags("CW"),
        role: "command",
      });
      if (parameters.statusObjects) {
        objects.push({
          number: statusObject(c),
          name: `Status ${c + 1}`,
          dpt: "1.001",
          flags: flags("CRT"),
          role: "status",
        });
      }
    }
    return objects;
  },

  buttons(parameters): readonly LocalButtonSpec[] {
    return Array.from({ length: parameters.channels }, (_, c) => ({
      id: `channel-${c + 1}`,
      label: `Manual ${c + 1}`,
    }));
  },

  initialState(parameters) {
    return { on: new Array<boolean>(parameters.channels).fill(false) };
  },

  transition(state, event, context) {
    const parameters = context.parameters;
    switch (event.kind) {
      case "start": {
        // Status objects answer reads from the first moment, so give them the relay position.
        const effects: DeviceEffect[] = [];
        if (parameters.statusObjects) {
          for (let c = 0; c < parameters.channels; c++) {
            effects.push({
              kind: "object.store",
              object: statusObject(c),
              value: state.on[c] === true,
            });
          }
        }
        return { state, effects };
      }
      case "group.write": {
        if (event.object % 2 !== 0 || typeof event.value !== "boolean")
          return { state, effects: [] };
        return switchChannel(state, event.object / 2, event.value, parameters, "relay.switched");
      }
      case "timer": {
        const match = /^staircase-(\d+)$/.exec(event.name);
        if (!match) return { state, effects: [] };
        return switchChannel(state, Number(match[1]) - 1, false, parameters, "staircase.expired");
      }
      case "button": {
        const match = /^channel-(\d+)$/.exec(event.button);
        const channel = match ? Number(match[1]) - 1 : -1;
        if (event.action !== "press" || channel < 0 || channel >= parameters.channels)
          return { state, effects: [] };
        return switchChannel(
          state,
          channel,
          state.on[channel] !== true,
          parameters,
          "manual.switched",
        );
      }
      default:
        return { state, effects: [] };
    }
  },
};
