"use client";

import { createContext, useContext, useState } from "react";
import { useStore, type StoreApi } from "zustand";
import type { Bench } from "@/engine";
import { createEditorStore, type EditorState } from "./editor-store";

const EditorStoreContext = createContext<StoreApi<EditorState> | null>(null);

/** Provides one editor store for the bench it was first given. */
export function EditorStoreProvider({
  bench,
  store,
  children,
}: {
  bench?: Bench;
  store?: StoreApi<EditorState>;
  children: React.ReactNode;
}) {
  const [value] = useState(() => {
    if (store !== undefined) return store;
    if (bench === undefined) throw new Error("EditorStoreProvider needs a bench or a store");
    return createEditorStore(bench);
  });
  return <EditorStoreContext.Provider value={value}>{children}</EditorStoreContext.Provider>;
}

export function useEditorStoreApi(): StoreApi<EditorState> {
  const store = useContext(EditorStoreContext);
  if (store === null) throw new Error("useEditor must be used inside an EditorStoreProvider");
  return store;
}

/** Reads a slice of the editor state; re-renders only when the slice changes. */
export function useEditor<T>(selector: (state: EditorState) => T): T {
  return useStore(useEditorStoreApi(), selector);
}
