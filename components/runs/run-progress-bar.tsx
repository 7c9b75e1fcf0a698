"use client";

import type { RunProgress } from "./use-run-progress";

/** A labelled progress bar for a run: scenarios done out of total. */
export function RunProgressBar({ progress, label }: { progress: RunProgress; label: string }) {
  const total = Math.max(progress.total, 1);
  const percent = progress.status === "finished" ? 100 : Math.round((progress.done / total) * 100);
  const words =
    progress.status === "finished"
      ? `finished: ${progress.done} of ${progress.total}`
      : progress.status === "errored"
        ? "could not finish"
        : progress.status === "lost"
          ? "connection lost; reload to see the result"
          : progress.status === "running"
            ? `running: ${progress.done} of ${progress.total}`
            : progress.status === "queued"
              ? "queued"
              : "starting";
  return (
    <div className="flex min-w-56 flex-col gap-1">
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={percent}
        aria-valuetext={words}
        className="h-2 overflow-hidden rounded-full bg-paper-line"
      >
        <div
          className={
            progress.status === "finished" && progress.verdict !== "pass"
              ? "h-full bg-fault transition-[width]"
              : "h-full bg-teal transition-[width]"
          }
          style={{ width: `${percent}%` }}
        />
      </div>
      <span className="text-xs text-ink-soft" aria-live="polite">
        {words}
      </span>
    </div>
  );
}
