"use client";

import {
  createContext,
  useCallback,
  useContext,
  useEffect,
  useMemo,
  useRef,
  useState,
  useSyncExternalStore,
} from "react";
import { useStore } from "zustand";
import { SimClient, startSimWorker } from "./sim-client";
import type { SimCommand } from "./sim-protocol";
import { createSimStore, type SimActions, type SimState, type SimStore } from "./sim-store";

interface SimContextValue {
  readonly store: SimStore;
  readonly send: (command: SimCommand) => void;
}

const SimContext = createContext<SimContextValue | null>(null);

/**
 * Starts the simulation worker for one bench and gives the console components
 * its store and a `send` function. The worker lives as long as the provider.
 */
export function SimProvider({
  bench,
  seed = 1,
  children,
}: {
  bench: unknown;
  seed?: number;
  children: React.ReactNode;
}) {
  const [store] = useState(() => createSimStore());
  const client = useRef<SimClient | null>(null);

  useEffect(() => {
    const created = new SimClient(startSimWorker(), store);
    created.send({ type: "load", bench, seed });
    client.current = created;
    return () => {
      client.current = null;
      created.dispose();
    };
  }, [bench, seed, store]);

  // One send function for the provider's life; it reads the live client when called.
  const [send] = useState(() => (command: SimCommand) => client.current?.send(command));
  return (
    <SimStoreProvider store={store} send={send}>
      {children}
    </SimStoreProvider>
  );
}

/** Hands a given store and send function to the console components (tests, benchmarks, other hosts). */
export function SimStoreProvider({
  store,
  send,
  children,
}: SimContextValue & { children: React.ReactNode }) {
  const value = useMemo<SimContextValue>(() => ({ store, send }), [store, send]);
  return <SimContext.Provider value={value}>{children}</SimContext.Provider>;
}

function useSimContext(): SimContextValue {
  const value = useContext(SimContext);
  if (value === null) throw new Error("useSim must be used inside <SimProvider>");
  return value;
}

/** The function that sends commands to the simulation worker. */
export function useSimSend(): (command: SimCommand) => void {
  return useSimContext().send;
}

/** A slice of the live simulation state; re-renders only when the slice changes. */
export function useSimState<T>(selector: (state: SimState & SimActions) => T): T {
  return useStore(useSimContext().store, selector);
}

/** The store itself, for reading the log ring outside React's render (export, windowing). */
export function useSimStore(): SimStore {
  return useSimContext().store;
}

/**
 * Like `useSimState`, but re-renders at most once per `intervalMs` of wall
 * time: for heavy views (charts, the inspector) that need not follow every
 * batch. The selector must return a value from the store, not a new object.
 */
export function useThrottledSimState<T>(
  selector: (state: SimState & SimActions) => T,
  intervalMs: number,
): T {
  const store = useSimStore();
  const subscribe = useCallback(
    (notify: () => void) => {
      let timer: ReturnType<typeof setTimeout> | undefined;
      let lastMs = 0;
      const unsubscribe = store.subscribe(() => {
        if (timer !== undefined) return;
        const waitMs = Math.max(0, lastMs + intervalMs - Date.now());
        timer = setTimeout(() => {
          timer = undefined;
          lastMs = Date.now();
          notify();
        }, waitMs);
      });
      return () => {
        unsubscribe();
        if (timer !== undefined) clearTimeout(timer);
      };
    },
    [store, intervalMs],
  );
  const snapshot = () => selector(store.getState());
  return useSyncExternalStore(subscribe, snapshot, snapshot);
}
