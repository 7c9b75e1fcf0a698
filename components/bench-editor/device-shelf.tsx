"use client";

import { useState } from "react";
import type { Bench } from "@/engine";
import { COUPLER_TYPE_ID, listDeviceTypes } from "@/engine";
import { addDevice } from "./model/devices";
import { useEditorStoreApi } from "./store/editor-context";
import { DEVICE_TYPE_DRAG } from "@/components/canvas/node-ids";

/**
 * The catalogue of device types. "Add" places a device with the next free
 * individual address on the chosen line; an item can also be dragged onto the
 * canvas to drop it where it should go. Couplers are added from the topology panel.
 */
export function DeviceShelf({ bench }: { bench: Bench }) {
  const store = useEditorStoreApi();
  const [line, setLine] = useState(bench.lines[0]?.id ?? "");
  // A coupler takes its line's address a.l.0 and joins two lines: the topology panel adds it.
  const types = listDeviceTypes().filter((type) => type.id !== COUPLER_TYPE_ID);
  return (
    <section aria-label="Device shelf" className="flex flex-col gap-2">
      <label className="flex flex-col gap-1 text-xs text-ink-soft">
        Line for new devices
        <select
          value={line}
          onChange={(e) => setLine(e.target.value)}
          className="rounded border border-paper-line bg-paper px-2 py-1 text-sm text-ink"
        >
          {bench.lines.map((l) => (
            <option key={l.id} value={l.id}>
              {l.address} {l.name}
            </option>
          ))}
        </select>
      </label>
      <ul className="flex flex-col gap-1">
        {types.map((type) => (
          <li
            key={type.id}
            draggable
            onDragStart={(e) => {
              e.dataTransfer.setData(DEVICE_TYPE_DRAG, JSON.stringify({ type: type.id, line }));
              e.dataTransfer.effectAllowed = "copy";
            }}
            className="flex cursor-grab items-start justify-between gap-2 rounded border border-paper-line bg-paper px-2 py-1.5"
            title={type.description}
          >
            <span className="min-w-0">
              <span className="block text-sm font-medium">{type.label}</span>
              <span className="block text-[11px] text-ink-soft">
                {type.medium === "knx" ? "KNX" : "unit link only"}
              </span>
            </span>
            <button
              type="button"
              aria-label={`Add ${type.label}`}
              className="rounded bg-copper px-2 py-0.5 text-xs text-white hover:bg-copper-deep"
              onClick={() => {
                const state = store.getState();
                let added: string | undefined;
                state.apply((b) => {
                  const result = addDevice(b, { type: type.id, line });
                  if (!result.ok) return result;
                  added = result.value.deviceId;
                  return { ok: true, value: result.value.bench };
                }, `Added ${type.label}`);
                if (added) state.revealNode({ kind: "device", id: added });
              }}
            >
              Add
            </button>
          </li>
        ))}
      </ul>
    </section>
  );
}
