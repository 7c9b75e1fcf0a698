"use client";

import { useSimSend } from "@/components/sim/sim-context";
import type { SimSpeed } from "@/components/sim/sim-protocol";
import { Button } from "@/components/ui/button";
import { formatVirtualTime } from "./format-time";
import { useFrameSimState } from "./use-frame-sim-state";

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

const speedText = (speed: SimSpeed) => (speed === "max" ? "as fast as possible" : `at ${speed}x`);

/**
 * Run or pause, single step (which pauses), speeds, jumps and reset, with the virtual clock.
 * The run/pause button names what pressing it does; the state is said in
 * words beside the clock, so the two never contradict each other.
 */
export function TimeControls() {
  const send = useSimSend();
  const clock = useFrameSimState((s) => s.clock);
  return (
    <div className="flex flex-wrap items-center gap-2" role="toolbar" aria-label="Time controls">
      <output
        aria-label="Virtual clock"
        className="min-w-32 rounded-md bg-graphite px-3 py-1.5 font-mono text-sm text-graphite-text tabular-nums"
      >
        {formatVirtualTime(clock.nowUs)}
      </output>
      <span className="min-w-40 text-xs text-ink-soft" data-testid="run-state">
        {clock.running ? (
          <>
            <span aria-hidden="true">▶ </span>Running {speedText(clock.speed)}
          </>
        ) : (
          <>
            <span aria-hidden="true">❚❚ </span>Paused
          </>
        )}
      </span>
      {/* One button that keeps the focus while its label flips between the two actions. */}
      <Button
        variant={clock.running ? "secondary" : "primary"}
        className="w-20"
        onClick={() =>
          send(clock.running ? { type: "pause" } : { type: "play", speed: clock.speed })
        }
        title={clock.running ? "Pause the simulation" : `Run ${speedText(clock.speed)}`}
      >
        {clock.running ? "Pause" : "Run"}
      </Button>
      <Button variant="secondary" onClick={() => send({ type: "step" })}>
        Step
      </Button>
      <div role="group" aria-label="Speed" className="flex gap-1">
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
      </div>
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
