"use client";

import { useCallback, useSyncExternalStore } from "react";
import { useSimStore } from "@/components/sim/sim-context";
import type { SimActions, SimState } from "@/components/sim/sim-store";

/**
 * A slice of the live simulation state that re-renders at most once per
 * animation frame, however many batches arrive in between. At Max speed the
 * worker can post several batches per frame; rendering each of them is work
 * nobody sees. A press still shows on the next frame (about 16 ms), unlike a
 * fixed wall-clock throttle. The selector must return a value held by the
 * store (or a primitive), never a new object.
 */
export function useFrameSimState<T>(
  selector: (state: SimState & SimActions) => T,
  /** At least this long between two renders, ms (0: every frame with a change). */
  minIntervalMs = 0,
): T {
  const store = useSimStore();
  const subscribe = useCallback(
    (notify: () => void) => {
      let frame: number | null = null;
      let lastMs = -Infinity;
      const schedule = () => {
        frame = requestAnimationFrame((nowMs) => {
          if (nowMs - lastMs < minIntervalMs) return schedule();
          frame = null;
          lastMs = nowMs;
          notify();
        });
      };
      const unsubscribe = store.subscribe(() => {
        if (frame === null) schedule();
      });
      return () => {
        unsubscribe();
        if (frame !== null) cancelAnimationFrame(frame);
      };
    },
    [store, minIntervalMs],
  );
  const snapshot = () => selector(store.getState());
  return useSyncExternalStore(subscribe, snapshot, snapshot);
}
