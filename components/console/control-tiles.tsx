"use client";

import { useSimSend, useSimState, useThrottledSimState } from "@/components/sim/sim-context";
import type { BenchSummary } from "@/components/sim/sim-protocol";
import { Mono } from "@/components/ui/mono";
import { cx } from "@/components/ui/cx";

type Tile = BenchSummary["controlPanelTiles"][number];

/**
 * The quick row of the bench's control-panel tiles. A command tile presses the
 * panel's own button for it, so the telegram comes from the panel (toggle from
 * what the tile last heard, or its preset); every tile shows its object's value.
 */
export function ControlTiles() {
  const tiles = useSimState((s) => s.bench?.controlPanelTiles ?? NO_TILES);
  const devices = useThrottledSimState((s) => s.devices, 250);
  const send = useSimSend();
  if (tiles.length === 0) return null;
  const panels = [...new Set(tiles.map((t) => t.deviceId))];
  const valueOf = (tile: Tile) =>
    devices[tile.deviceId]?.objects.find((o) => o.number === tile.object)?.value ?? null;

  return (
    <div>
      <h3 className="text-xs font-medium text-ink-soft">Control panel</h3>
      {panels.map((panel) => {
        const own = tiles.filter((t) => t.deviceId === panel);
        return (
          <div
            key={panel}
            role="group"
            aria-label={`Tiles of ${own[0]!.deviceName}`}
            className="mt-1"
          >
            {panels.length > 1 ? <p className="text-xs">{own[0]!.deviceName}</p> : null}
            <div className="mt-1 grid grid-cols-2 gap-1.5">
              {own.map((tile) => {
                const value = valueOf(tile);
                const body = (
                  <>
                    <span className="block truncate text-xs font-medium">{tile.label}</span>
                    <Mono className="block truncate text-[11px] text-ink-soft">
                      {value ?? "–"}
                      {tile.groupAddress ? ` · ${tile.groupAddress}` : ""}
                    </Mono>
                  </>
                );
                const box = "rounded-md border px-2 py-1 text-left";
                return tile.buttonId === null ? (
                  <div
                    key={tile.object}
                    className={cx(box, "border-paper-line bg-paper-deep/60")}
                    aria-label={`${tile.label}: ${value ?? "no value yet"}`}
                    data-tile={`${tile.deviceId}-${tile.object}`}
                  >
                    {body}
                  </div>
                ) : (
                  <button
                    key={tile.object}
                    type="button"
                    className={cx(box, "border-paper-line bg-white hover:border-copper")}
                    aria-label={tile.label}
                    title={`${tile.kind} tile · DPT ${tile.dpt}`}
                    data-tile={`${tile.deviceId}-${tile.object}`}
                    onClick={() =>
                      send({ type: "press", deviceId: tile.deviceId, buttonId: tile.buttonId! })
                    }
                  >
                    {body}
                  </button>
                );
              })}
            </div>
          </div>
        );
      })}
    </div>
  );
}

const NO_TILES: readonly Tile[] = [];
