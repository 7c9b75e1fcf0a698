import type { DeviceContext, DeviceEvent, TransitionResult } from "./device-type";

type Transition<P, S> = (
  state: S,
  event: DeviceEvent,
  context: DeviceContext<P>,
) => TransitionResult<S>;

/**
 * A device's transition whose every new state passes once through `rebuild`,
 * which copies it field by field into one object shape: on Node 20 every
 * spread gives its result a shape of its own, and chained spreads soon run
 * V8's slow generic copy (DEVELOPERS.md, Adding a device type). An unchanged
 * state is returned as it is, not copied.
 */
export function withRebuiltStates<P, S>(
  transition: Transition<P, S>,
  rebuild: (state: S) => S,
): Transition<P, S> {
  return (state, event, context) => {
    const result = transition(state, event, context);
    if (result.state === state) return result;
    const rebuilt = rebuild(result.state);
    return result.transition === undefined
      ? { state: rebuilt, effects: result.effects }
      : { state: rebuilt, effects: result.effects, transition: result.transition };
  };
}
