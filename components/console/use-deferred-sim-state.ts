"use client";

import { startTransition, useEffect, useEffectEvent, useState } from "react";
import { useSimStore } from "@/components/sim/sim-context";
import type { SimActions, SimState } from "@/components/sim/sim-store";

/**
 * A slice of the live simulation state for heavy views (charts, the state
 * inspector): read at most once per `intervalMs` of wall time and rendered as
 * a transition, which React may interrupt. A click or a key press that comes
 * in while a chart redraws is answered first, and the redraw never holds the
 * main thread in one long task the way a synchronous store update does.
 */
export function useDeferredSimState<T>(
  selector: (state: SimState & SimActions) => T,
  intervalMs: number,
  /** False pauses the updates (a view scrolled away); true again catches up at once. */
  enabled = true,
): T {
  const store = useSimStore();
  const [value, setValue] = useState(() => selector(store.getState()));
  const read = useEffectEvent(() => selector(store.getState()));
  useEffect(() => {
    if (!enabled) return;
    let timer: ReturnType<typeof setTimeout> | undefined;
    let lastMs = 0;
    const update = () => {
      timer = undefined;
      lastMs = performance.now();
      const next = read();
      startTransition(() => setValue(() => next));
    };
    const unsubscribe = store.subscribe(() => {
      if (timer === undefined)
        timer = setTimeout(update, Math.max(0, lastMs + intervalMs - performance.now()));
    });
    // Whatever changed between the first render and subscribing.
    update();
    return () => {
      unsubscribe();
      if (timer !== undefined) clearTimeout(timer);
    };
  }, [store, intervalMs, enabled]);
  return value;
}
