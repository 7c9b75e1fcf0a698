"use client";

import { useRef } from "react";
import { cx } from "@/components/ui/cx";

const KEY_STEP_PX = 16;
const PAGE_STEP_PX = 96;

/**
 * A splitter between two console areas: drag it with a pointer, or focus it
 * and use the arrow keys (Shift or Page Up/Down for bigger steps, Home/End
 * for the bounds). `direction` says which way a positive change grows the
 * area: a handle left of an area grows it when dragged left (-1).
 */
export function ResizeHandle({
  label,
  orientation,
  valuePx,
  minPx,
  maxPx,
  direction = 1,
  onResize,
  className,
}: {
  label: string;
  /** "horizontal": a bar between areas above and below; "vertical": between left and right. */
  orientation: "horizontal" | "vertical";
  valuePx: number;
  minPx: number;
  maxPx: number;
  direction?: 1 | -1;
  onResize: (px: number) => void;
  className?: string;
}) {
  const drag = useRef<{ startPointer: number; startValue: number } | null>(null);
  const along = (event: { clientX: number; clientY: number }) =>
    orientation === "horizontal" ? event.clientY : event.clientX;

  return (
    <div
      role="separator"
      aria-label={label}
      aria-orientation={orientation}
      aria-valuenow={valuePx}
      aria-valuemin={minPx}
      aria-valuemax={maxPx}
      tabIndex={0}
      className={cx(
        "group flex touch-none items-center justify-center select-none",
        orientation === "horizontal" ? "h-3 cursor-row-resize" : "w-3 cursor-col-resize",
        className,
      )}
      onPointerDown={(event) => {
        event.currentTarget.setPointerCapture(event.pointerId);
        drag.current = { startPointer: along(event), startValue: valuePx };
      }}
      onPointerMove={(event) => {
        if (drag.current === null) return;
        onResize(drag.current.startValue + direction * (along(event) - drag.current.startPointer));
      }}
      onPointerUp={() => (drag.current = null)}
      onPointerCancel={() => (drag.current = null)}
      onKeyDown={(event) => {
        const step = event.shiftKey ? PAGE_STEP_PX : KEY_STEP_PX;
        const grow = orientation === "horizontal" ? "ArrowDown" : "ArrowRight";
        const shrink = orientation === "horizontal" ? "ArrowUp" : "ArrowLeft";
        let next: number | null = null;
        if (event.key === grow) next = valuePx + direction * step;
        else if (event.key === shrink) next = valuePx - direction * step;
        else if (event.key === "PageUp") next = valuePx + PAGE_STEP_PX;
        else if (event.key === "PageDown") next = valuePx - PAGE_STEP_PX;
        else if (event.key === "Home") next = minPx;
        else if (event.key === "End") next = maxPx;
        if (next === null) return;
        event.preventDefault();
        onResize(next);
      }}
    >
      <span
        aria-hidden="true"
        className={cx(
          "rounded-full bg-paper-line group-hover:bg-copper group-focus-visible:bg-copper",
          orientation === "horizontal" ? "h-1 w-16" : "h-16 w-1",
        )}
      />
    </div>
  );
}
