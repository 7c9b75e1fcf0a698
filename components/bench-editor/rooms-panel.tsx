"use client";

import { useState } from "react";
import { BENCH_ROOM_DEFAULTS } from "@/engine";
import type { Bench, BenchRoom } from "@/engine";
import { Button } from "@/components/ui/button";
import { Mono } from "@/components/ui/mono";
import type { EditRefusal } from "./model/edit-refusal";
import {
  addRoom,
  deleteRoom,
  devicesInRoom,
  renameRoom,
  setRoomThermal,
  type RoomThermalField,
} from "./model/rooms";
import { useEditorStoreApi } from "./store/editor-context";

/** The thermal figures as the panel shows them: label, unit and what the field means. */
const THERMAL_FIELDS: readonly {
  readonly field: RoomThermalField;
  readonly label: string;
  readonly unit: string;
  readonly hint: string;
}[] = [
  { field: "initialC", label: "Start temperature", unit: "°C", hint: "at the start of a run" },
  { field: "outdoorC", label: "Outdoor temperature", unit: "°C", hint: "what the room loses to" },
  {
    field: "heatCapacityKJPerK",
    label: "Heat capacity",
    unit: "kJ/K",
    hint: "air, furnishings and inner surfaces",
  },
  {
    field: "envelopeUaWPerK",
    label: "Envelope loss",
    unit: "W/K",
    hint: "walls, windows and air change, per kelvin to outdoors",
  },
];

/** A figure as typed: blank leaves the default, anything else must read as a number. */
function parseFigure(text: string): number | undefined | "not-a-number" {
  const trimmed = text.trim().replace(",", ".");
  if (trimmed === "") return undefined;
  const value = Number(trimmed);
  return Number.isFinite(value) ? value : "not-a-number";
}

function withoutKey(record: Readonly<Record<string, string>>, key: string) {
  const next = { ...record };
  delete next[key];
  return next;
}

/**
 * The bench's rooms: add, rename, set the thermal figures of and delete a
 * room, and see which devices are in each. Putting a device in a room stays in
 * the device's own panel. Every change goes through the editor store (undo, the
 * save path); a refused value stays in its field with the reason under it and
 * the bench is not changed.
 */
export function RoomsPanel({ bench, readOnly }: { bench: Bench; readOnly: boolean }) {
  const storeApi = useEditorStoreApi();
  const rooms = bench.rooms ?? [];
  return (
    <div className="flex flex-col gap-3">
      <aside
        role="note"
        aria-label="Caution"
        className="rounded-lg border border-l-4 border-copper/40 border-l-copper bg-paper-deep p-3 text-xs text-ink-soft"
      >
        A room here is one lumped thermal mass with round figures for training and dry runs. It does
        not replace a heat-load calculation, the manufacturer&apos;s instructions, local codes and
        regulations, or the work of a licensed HVAC technician, least of all for frost protection:
        set and verify that on the real installation.
      </aside>
      <p className="text-xs text-ink-soft">
        Every unit, sensor and window or presence device put in a room reads and acts on the same
        room temperature. Put a device in a room from its own panel (Selection). A device in no room
        models a room of its own. A blank figure takes the default shown.
      </p>
      {rooms.length === 0 ? (
        <p className="text-sm text-ink-soft">This bench declares no rooms.</p>
      ) : null}
      {rooms.map((room) => (
        <RoomCard key={room.id} bench={bench} room={room} readOnly={readOnly} />
      ))}
      {readOnly ? null : (
        <Button
          variant="secondary"
          className="self-start"
          onClick={() =>
            storeApi.getState().apply((b) => {
              const outcome = addRoom(b);
              return outcome.ok ? outcome.value.bench : outcome;
            }, "Room added: set its figures, then put devices in it from their panels")
          }
        >
          Add room
        </Button>
      )}
    </div>
  );
}

function RoomCard({ bench, room, readOnly }: { bench: Bench; room: BenchRoom; readOnly: boolean }) {
  const storeApi = useEditorStoreApi();
  // Refusals by field, shown under the field until it is changed to a value that applies.
  const [errors, setErrors] = useState<Readonly<Record<string, string>>>({});
  const devices = devicesInRoom(bench, room.id);

  /** Applies a room edit; a refusal is kept beside its field and the bench is left as it is. */
  const apply = (
    field: string,
    edit: (b: Bench) => ReturnType<typeof renameRoom>,
    info: string,
  ) => {
    const seen: { refusal?: EditRefusal } = {};
    storeApi.getState().apply((b) => {
      const outcome = edit(b);
      if (!outcome.ok) seen.refusal = outcome.error;
      return outcome;
    }, info);
    const message = seen.refusal?.message;
    setErrors((current) =>
      message === undefined ? withoutKey(current, field) : { ...current, [field]: message },
    );
  };

  const remove = () => {
    const moved = { count: 0 };
    storeApi.getState().apply((b) => {
      const outcome = deleteRoom(b, room.id);
      if (!outcome.ok) return outcome;
      moved.count = outcome.value.movedOut;
      return outcome.value.bench;
    });
    const movedOut = moved.count;
    storeApi.getState().notify({
      tone: "info",
      text:
        movedOut === 0
          ? `Deleted room ${room.name}`
          : `Deleted room ${room.name}; ${movedOut === 1 ? "1 device now models a room of its own" : `${movedOut} devices now model a room of their own`} (undo brings ${movedOut === 1 ? "it" : "them"} back)`,
    });
  };

  const nameId = `room-${room.id}-name`;
  return (
    <section
      aria-label={`Room ${room.name}`}
      className="flex flex-col gap-2 rounded border border-paper-line p-2"
    >
      <div className="flex items-end gap-2">
        <div className="flex flex-1 flex-col gap-1">
          <label htmlFor={nameId} className="text-xs text-ink-soft">
            Room name <Mono className="text-[10px]">{room.id}</Mono>
          </label>
          <input
            id={nameId}
            key={`name:${room.name}`}
            defaultValue={room.name}
            readOnly={readOnly}
            aria-invalid={errors.name ? true : undefined}
            onBlur={(e) =>
              e.target.value !== room.name &&
              apply(
                "name",
                (b) => renameRoom(b, room.id, e.target.value),
                `Room renamed ${e.target.value}`,
              )
            }
            onKeyDown={(e) => e.key === "Enter" && e.currentTarget.blur()}
            className="rounded border border-paper-line bg-paper px-2 py-1 text-sm text-ink"
          />
        </div>
        {readOnly ? null : (
          <Button
            variant="secondary"
            onClick={remove}
            aria-label={`Delete room ${room.name}`}
            title={
              devices.length === 0
                ? "Delete this room"
                : "Delete this room; its devices then model a room of their own"
            }
          >
            Delete
          </Button>
        )}
      </div>
      {errors.name ? (
        <p role="alert" className="text-xs text-fault">
          {errors.name}
        </p>
      ) : null}
      <div className="grid grid-cols-2 gap-2">
        {THERMAL_FIELDS.map(({ field, label, unit, hint }) => {
          const id = `room-${room.id}-${field}`;
          const stored = room[field];
          const fallback = BENCH_ROOM_DEFAULTS[field];
          return (
            <div key={field} className="flex flex-col gap-1">
              <label htmlFor={id} className="text-xs text-ink-soft" title={hint}>
                {label} ({unit})
              </label>
              <input
                id={id}
                key={`${field}:${stored ?? ""}`}
                type="text"
                inputMode="decimal"
                defaultValue={stored === undefined ? "" : String(stored)}
                placeholder={`default ${fallback}`}
                readOnly={readOnly}
                aria-invalid={errors[field] ? true : undefined}
                aria-describedby={`${id}-note`}
                onBlur={(e) => {
                  const value = parseFigure(e.target.value);
                  if (value === stored) {
                    // Back to what is stored: an earlier refusal no longer stands.
                    setErrors((current) => withoutKey(current, field));
                    return;
                  }
                  if (value === "not-a-number") {
                    setErrors((current) => ({
                      ...current,
                      [field]: `the ${label.toLowerCase()} is a number in ${unit}`,
                    }));
                    return;
                  }
                  apply(
                    field,
                    (b) => setRoomThermal(b, room.id, field, value),
                    value === undefined
                      ? `${label} of ${room.name}: default`
                      : `${label} of ${room.name}: ${value} ${unit}`,
                  );
                }}
                onKeyDown={(e) => e.key === "Enter" && e.currentTarget.blur()}
                className="rounded border border-paper-line bg-paper px-2 py-1 font-mono text-sm text-ink"
              />
              <span id={`${id}-note`} className="text-[10px] text-ink-soft">
                {stored === undefined ? `default ${fallback} ${unit}` : hint}
              </span>
              {errors[field] ? (
                <p role="alert" className="text-xs text-fault">
                  {errors[field]}
                </p>
              ) : null}
            </div>
          );
        })}
      </div>
      <div className="text-xs">
        <span className="text-ink-soft">Devices in this room: </span>
        {devices.length === 0 ? (
          <span className="text-ink-soft">none yet</span>
        ) : (
          <ul aria-label={`Devices in ${room.name}`} className="mt-0.5 flex flex-wrap gap-1">
            {devices.map((d) => (
              <li key={d.id}>
                <button
                  type="button"
                  className="rounded bg-paper-deep px-1.5 py-0.5 underline-offset-2 hover:underline"
                  onClick={() => storeApi.getState().revealNode({ kind: "device", id: d.id })}
                  title="Show this device on the canvas"
                >
                  {d.name}
                </button>
              </li>
            ))}
          </ul>
        )}
      </div>
    </section>
  );
}
