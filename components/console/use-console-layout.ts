"use client";

import { useCallback, useEffect, useState } from "react";
import {
  clampSize,
  type ConsoleLayout,
  type ConsolePanel,
  type ConsoleSize,
  defaultConsoleLayout,
  layoutStorageKey,
  parseStoredLayout,
} from "./console-layout";

/**
 * The console's layout for one member, remembered in this browser's
 * localStorage under the member's id, so two people sharing a classroom
 * tablet each get their own.
 */
export function useConsoleLayout(memberId: string | undefined) {
  const key = memberId === undefined ? null : layoutStorageKey(memberId);
  // The console body renders only in the browser (after the worker loaded), so storage is there.
  const [layout, setLayout] = useState<ConsoleLayout>(() =>
    key === null ? defaultConsoleLayout : parseStoredLayout(readStorage(key)),
  );

  useEffect(() => {
    if (key !== null) writeStorage(key, JSON.stringify(layout));
  }, [key, layout]);

  const resize = useCallback(
    (size: ConsoleSize, px: number) =>
      setLayout((current) => ({ ...current, [size]: clampSize(size, px) })),
    [],
  );
  const toggle = useCallback(
    (panel: ConsolePanel) =>
      setLayout((current) => ({
        ...current,
        collapsed: { ...current.collapsed, [panel]: !current.collapsed[panel] },
      })),
    [],
  );
  return { layout, resize, toggle };
}

// Storage can be switched off or full (private windows): the layout then lasts for the visit.
function readStorage(key: string): string | null {
  try {
    return window.localStorage.getItem(key);
  } catch {
    return null;
  }
}

function writeStorage(key: string, value: string): void {
  try {
    window.localStorage.setItem(key, value);
  } catch {
    // kept in memory only
  }
}
