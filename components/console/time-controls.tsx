"use client";

import { useLiveLink, useSimSend } from "@/components/sim/sim-context";
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

/** Why a server session has no speeds: said beside the controls, not only in a tooltip. */
export const REAL_TIME_REASON =
  "KNX software connected from outside lives in real time, so a session on the server always runs at 1x: no pause, single steps, other speeds or jumps ahead.";

/**
 * Run or pause, single step (which pauses), speeds, jumps and reset, with the virtual clock.
 * The run/pause button names what pressing it does; the state is said in
 * words beside the clock, so the two never contradict each other. A session
 * on the server runs at 1x only (see `REAL_TIME_REASON`).
 */
export function TimeControls() {
  const link = useLiveLink();
  return link === null ? (
    <BrowserTimeControls />
  ) : (
    <RealTimeControls canControl={link.canControl} />
  );
}

/** The virtual clock readout both kinds of controls start with. */
function ClockReadout({ nowUs }: { nowUs: number }) {
  return (
    <output
      aria-label="Virtual clock"
      className="min-w-32 rounded-md bg-graphite px-3 py-1.5 font-mono text-sm text-graphite-text tabular-nums"
    >
      {formatVirtualTime(nowUs)}
    </output>
  );
}

/** A server session's controls: the clock at 1x for everyone, Reset for the owner. */
function RealTimeControls({ canControl }: { canControl: boolean }) {
  const send = useSimSend();
  const clock = useFrameSimState((s) => s.clock);
  return (
    <div className="flex flex-wrap items-center gap-2" role="toolbar" aria-label="Time controls">
      <ClockReadout nowUs={clock.nowUs} />
      <span className="text-xs text-ink-soft" data-testid="run-state">
        <span aria-hidden="true">▶ </span>Running in real time
      </span>
      {canControl ? (
        <Button
          variant="secondary"
          onClick={() => send({ type: "reset" })}
          title="Start the run again; connected KNXnet/IP clients are disconnected and may reconnect"
        >
          Reset
        </Button>
      ) : null}
      <p className="max-w-xl text-xs text-ink-soft" data-testid="real-time-reason">
        <span className="font-medium text-ink">Real time (1x).</span> {REAL_TIME_REASON}
      </p>
    </div>
  );
}

function BrowserTimeControls() {
  const send = useSimSend();
  const clock = useFrameSimState((s) => s.clock);
  return (
    <div className="flex flex-wrap items-center gap-2" role="toolbar" aria-label="Time controls">
      <ClockReadout nowUs={clock.nowUs} />
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
