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
import type { LiveSessionView } from "@/app/_lib/live/live-session-view";
import {
  createLiveLinkStore,
  type LiveLinkActions,
  type LiveLinkState,
  type LiveLinkStore,
} from "./live-link-store";
import { ServerSimClient } from "./server-sim-client";
import { SimClient, startSimWorker } from "./sim-client";
import type { SimCommand } from "./sim-protocol";
import { createSimStore, type SimActions, type SimState, type SimStore } from "./sim-store";
import type { SimTransport } from "./sim-transport";

interface SimContextValue {
  readonly store: SimStore;
  readonly send: (command: SimCommand) => void;
}

const SimContext = createContext<SimContextValue | null>(null);

/** A server session's link, for the views that show what only a server session has. */
export interface LiveLinkContextValue {
  readonly link: LiveLinkStore;
  /** The member may command, publish, disconnect clients and stop (owner or admin). */
  readonly canControl: boolean;
}

const LiveLinkContext = createContext<LiveLinkContextValue | null>(null);

/**
 * Opens a transport for the provider's life and hands the console its store
 * and a `send` that goes to whichever transport is live.
 */
function TransportProvider({
  open,
  children,
}: {
  open: (store: SimStore) => SimTransport;
  children: React.ReactNode;
}) {
  const [store] = useState(() => createSimStore());
  const transport = useRef<SimTransport | null>(null);

  useEffect(() => {
    const created = open(store);
    transport.current = created;
    return () => {
      transport.current = null;
      created.dispose();
    };
  }, [open, store]);

  // One send function for the provider's life; it reads the live transport when called.
  const [send] = useState(() => (command: SimCommand) => transport.current?.send(command));
  return (
    <SimStoreProvider store={store} send={send}>
      {children}
    </SimStoreProvider>
  );
}

/**
 * Runs one bench in this browser: starts the simulation worker and loads the
 * bench. The worker lives as long as the provider.
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
  const open = useCallback(
    (store: SimStore) => {
      const client = new SimClient(startSimWorker(), store);
      client.send({ type: "load", bench, seed });
      return client;
    },
    [bench, seed],
  );
  return <TransportProvider open={open}>{children}</TransportProvider>;
}

/**
 * Attaches to a live session hosted by the server: its state streams in, the
 * console's commands go to its API. Leaving the page detaches; the session
 * keeps running on the server until its owner stops it or it idles out.
 */
export function ServerSimProvider({
  session,
  children,
}: {
  /** The session as the page loaded it for this member, shown until the stream describes it. */
  session: LiveSessionView;
  children: React.ReactNode;
}) {
  const sessionId = session.id;
  const [link] = useState(() => createLiveLinkStore(sessionId, session));
  const open = useCallback(
    (store: SimStore) => new ServerSimClient({ sessionId, store, link }),
    [sessionId, link],
  );
  // Decided by the server for this member (owner or admin); the API checks it again every time.
  const canControl = session.canControl;
  const value = useMemo(() => ({ link, canControl }), [link, canControl]);
  return (
    <LiveLinkContext.Provider value={value}>
      <TransportProvider open={open}>{children}</TransportProvider>
    </LiveLinkContext.Provider>
  );
}

/** The server session's link, or null when the bench runs in this browser. */
export function useLiveLink(): LiveLinkContextValue | null {
  return useContext(LiveLinkContext);
}

/** A slice of the server session's link state; `fallback` when the bench runs in this browser. */
export function useLiveLinkState<T>(
  selector: (state: LiveLinkState & LiveLinkActions) => T,
  fallback: T,
): T {
  const context = useContext(LiveLinkContext);
  const subscribe = useCallback(
    (notify: () => void) => (context === null ? () => {} : context.link.subscribe(notify)),
    [context],
  );
  const snapshot = () => (context === null ? fallback : selector(context.link.getState()));
  return useSyncExternalStore(subscribe, snapshot, snapshot);
}

/** Hands a given server-session link to the views (tests). */
export function LiveLinkProvider({
  value,
  children,
}: {
  value: LiveLinkContextValue;
  children: React.ReactNode;
}) {
  return <LiveLinkContext.Provider value={value}>{children}</LiveLinkContext.Provider>;
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
