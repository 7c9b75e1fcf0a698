"use client";

import { useSimSend, useSimState } from "@/components/sim/sim-context";
import type { SimSpeed } from "@/components/sim/sim-protocol";
import { Button } from "@/components/ui/button";
import { formatVirtualTime } from "./format-time";

const SPEEDS: readonly { speed: SimSpeed; label: string }[] = [
  { speed: 1, label: "1x" },
  { speed: 10, label: "10x" },
  { speed: 100, label: "100x" },
  { speed: "max", label: "Max" },
];

const JUMPS: readonly { us: number; label: string }[] = [
  { us: 1_000_000, label: "+1 s" },
  { us: 10_000_000, label: "+10 s" },
  { us: 60_000_000, label: "+1 min" },
  { us: 600_000_000, label: "+10 min" },
  { us: 3_600_000_000, label: "+1 h" },
];

/** Pause, single step, speeds, jumps and reset, with the virtual clock. */
export function TimeControls() {
  const send = useSimSend();
  const clock = useSimState((s) => s.clock);
  return (
    <div className="flex flex-wrap items-center gap-2" role="toolbar" aria-label="Time controls">
      <output
        aria-label="Virtual clock"
        className="min-w-32 rounded-md bg-graphite px-3 py-1.5 font-mono text-sm text-graphite-text tabular-nums"
      >
        {formatVirtualTime(clock.nowUs)}
      </output>
      <span className="text-xs text-ink-soft">
        {clock.running
          ? `running ${clock.speed === "max" ? "as fast as possible" : `at ${clock.speed}x`}`
          : "paused"}
      </span>
      <Button
        variant={clock.running ? "secondary" : "primary"}
        onClick={() => send({ type: "pause" })}
        aria-pressed={!clock.running}
      >
        Pause
      </Button>
      <Button variant="secondary" onClick={() => send({ type: "step" })}>
        Step
      </Button>
      {SPEEDS.map(({ speed, label }) => (
        <Button
          key={label}
          variant={clock.running && clock.speed === speed ? "primary" : "secondary"}
          aria-pressed={clock.running && clock.speed === speed}
          onClick={() => send({ type: "play", speed })}
          aria-label={`Run at ${label}`}
        >
          {label}
        </Button>
      ))}
      <select
        aria-label="Jump ahead"
        className="rounded-md border border-paper-line bg-white px-2 py-2 text-sm"
        value=""
        onChange={(e) => {
          if (e.target.value !== "") send({ type: "jump", durationUs: Number(e.target.value) });
        }}
      >
        <option value="">Jump ahead…</option>
        {JUMPS.map((jump) => (
          <option key={jump.us} value={jump.us}>
            {jump.label}
          </option>
        ))}
      </select>
      <Button variant="secondary" onClick={() => send({ type: "reset" })}>
        Reset
      </Button>
    </div>
  );
}
