"use client";

import { useEffect, useMemo, useState } from "react";
import type { Bench } from "@/engine";
import {
  EMPTY_LAYOUT,
  layoutBench,
  layoutSignature,
  needsElk,
  type BenchLayout,
  type ElkLike,
} from "./bench-layout";

let elk: Promise<ElkLike> | undefined;

/** Stands in for elkjs where the layout does not use it (a topology, a very big bench). */
const NO_ELK: ElkLike = {
  layout: () => Promise.reject(new Error("this bench is laid out without elkjs")),
};

/** elkjs's bundled build, loaded on first use so pages without a canvas never download it. */
function loadElk(): Promise<ElkLike> {
  elk ??= import("elkjs/lib/elk.bundled.js").then(({ default: ELK }) => new ELK());
  return elk;
}

/**
 * The bench's layered layout, computed off the render path and again only
 * when the layout signature changes (a device, address or link added or
 * removed), so a drag or a rename never reshuffles the canvas. Null until the
 * first layout is in; the previous layout stays while the next one runs.
 */
export function useBenchLayout(bench: Bench): BenchLayout | null {
  const signature = useMemo(() => layoutSignature(bench), [bench]);
  const [laidOut, setLaidOut] = useState<{ signature: string; layout: BenchLayout } | null>(null);
  const current = laidOut?.signature;
  useEffect(() => {
    if (current === signature) return;
    let cancelled = false;
    (needsElk(bench) ? loadElk() : Promise.resolve(NO_ELK))
      .then((instance) => layoutBench(bench, instance))
      .then(
        (layout) => {
          if (!cancelled) setLaidOut({ signature, layout });
        },
        (error: unknown) => {
          // A layout failure must not take the editor down: nodes fall back to the origin.
          console.error("bench layout failed", error);
          if (!cancelled)
            setLaidOut({
              signature,
              layout: EMPTY_LAYOUT,
            });
        },
      );
    return () => {
      cancelled = true;
    };
  }, [bench, signature, current]);
  return laidOut?.layout ?? null;
}
