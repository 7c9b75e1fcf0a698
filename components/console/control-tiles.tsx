"use client";

import { memo, useCallback, useEffect, useState } from "react";
import { useSimSend, useSimState } from "@/components/sim/sim-context";
import type { BenchSummary } from "@/components/sim/sim-protocol";
import type { DeviceView } from "@/components/sim/sim-store";
import { cx } from "@/components/ui/cx";
import { Mono } from "@/components/ui/mono";
import { shownValueText } from "./shown-value";
import { useFrameSimState } from "./use-frame-sim-state";

type Tile = BenchSummary["controlPanelTiles"][number];

/** How long a pressed tile says "sent" when no new value comes back. */
const SENT_MS = 1500;
const SEPARATOR = "\u0000";

function tileValue(devices: Readonly<Record<string, DeviceView>>, tile: Tile): string | null {
  return devices[tile.deviceId]?.objects.find((o) => o.number === tile.object)?.value ?? null;
}

/**
 * The quick row of the bench's control-panel tiles. A command tile presses the
 * panel's own button for it, so the telegram comes from the panel (toggle from
 * what the tile last heard, or its preset); every tile shows its object's value.
 * A press shows at once ("sent") and the value the tile hears on the next frame
 * it changes: the tiles follow only their own values, not every batch.
 */
export function ControlTiles() {
  const tiles = useSimState((s) => s.bench?.controlPanelTiles ?? NO_TILES);
  // One string of every tile's value: re-renders only when one of them changes.
  const joined = useFrameSimState((s) =>
    tiles.map((tile) => tileValue(s.devices, tile) ?? "").join(SEPARATOR),
  );
  const values = joined.split(SEPARATOR);
  const send = useSimSend();
  const press = useCallback(
    (tile: Tile) => send({ type: "press", deviceId: tile.deviceId, buttonId: tile.buttonId! }),
    [send],
  );
  if (tiles.length === 0) return null;
  const panels = [...new Set(tiles.map((t) => t.deviceId))];

  return (
    <div>
      <h3 className="text-xs font-medium text-ink-soft">Control panel</h3>
      {panels.map((panel) => {
        const own = tiles.flatMap((tile, i) => (tile.deviceId === panel ? [{ tile, i }] : []));
        return (
          <div
            key={panel}
            role="group"
            aria-label={`Tiles of ${own[0]!.tile.deviceName}`}
            className="mt-1"
          >
            {panels.length > 1 ? <p className="text-xs">{own[0]!.tile.deviceName}</p> : null}
            <div className="mt-1 grid grid-cols-2 gap-1.5">
              {own.map(({ tile, i }) => (
                <TileView
                  key={tile.object}
                  tile={tile}
                  value={values[i] === "" ? null : (values[i] ?? null)}
                  onPress={press}
                />
              ))}
            </div>
          </div>
        );
      })}
    </div>
  );
}

const TileView = memo(function TileView({
  tile,
  value,
  onPress,
}: {
  tile: Tile;
  value: string | null;
  onPress: (tile: Tile) => void;
}) {
  const [sentValue, setSentValue] = useState<string | null | undefined>(undefined);
  // "sent" until the value changes or a while has passed.
  const sent = sentValue !== undefined && sentValue === value;
  useEffect(() => {
    if (sentValue === undefined) return;
    const timer = setTimeout(() => setSentValue(undefined), SENT_MS);
    return () => clearTimeout(timer);
  }, [sentValue]);
  const shown = shownValueText(value);
  const body = (
    <>
      <span className="block truncate text-xs font-medium">{tile.label}</span>
      <Mono className="block truncate text-[11px] text-ink-soft">
        {shown}
        {tile.groupAddress ? ` · ${tile.groupAddress}` : ""}
        {sent ? " · sent" : ""}
      </Mono>
    </>
  );
  const box = "rounded-md border px-2 py-1 text-left";
  if (tile.buttonId === null)
    return (
      <div
        role="group"
        className={cx(box, "border-paper-line bg-paper-deep/60")}
        aria-label={`${tile.label}: ${value === null ? "no value yet" : shown}`}
        data-tile={`${tile.deviceId}-${tile.object}`}
      >
        {body}
      </div>
    );
  return (
    <button
      type="button"
      className={cx(
        box,
        "bg-white hover:border-copper",
        sent ? "border-copper ring-1 ring-copper" : "border-paper-line",
      )}
      aria-label={tile.label}
      title={`${tile.kind} tile · DPT ${tile.dpt}`}
      data-tile={`${tile.deviceId}-${tile.object}`}
      data-sent={sent ? "true" : undefined}
      onClick={() => {
        setSentValue(value);
        onPress(tile);
      }}
    >
      {body}
    </button>
  );
});

const NO_TILES: readonly Tile[] = [];
