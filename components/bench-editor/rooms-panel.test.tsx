import { act, cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { useStore } from "zustand";
import { afterEach, describe, expect, it } from "vitest";
import { loadBench, type Bench } from "@/engine";
import { setDeviceRoom } from "./model/devices";
import { summarizeChanges } from "./model/summarize-changes";
import { testBench } from "./model/test-bench";
import { RoomsPanel } from "./rooms-panel";
import { EditorStoreProvider } from "./store/editor-context";
import { createEditorStore, type EditorState } from "./store/editor-store";
import type { StoreApi } from "zustand";

afterEach(cleanup);

function Panel({ store, readOnly }: { store: StoreApi<EditorState>; readOnly: boolean }) {
  const bench = useStore(store, (s) => s.bench);
  return <RoomsPanel bench={bench} readOnly={readOnly} />;
}

function renderPanel(bench: Bench = testBench(), readOnly = false) {
  const store = createEditorStore(bench);
  render(
    <EditorStoreProvider store={store}>
      <Panel store={store} readOnly={readOnly} />
    </EditorStoreProvider>,
  );
  return store;
}

function typeInto(field: HTMLElement, value: string) {
  act(() => {
    fireEvent.change(field, { target: { value } });
    fireEvent.blur(field);
  });
}

describe("RoomsPanel", () => {
  it("adds a room with the engine's defaults shown, and the caution beside it", () => {
    const store = renderPanel();
    expect(screen.getByText("This bench declares no rooms.")).toBeTruthy();
    // The product's caution where the panel touches real rooms and frost protection.
    expect(screen.getByRole("note", { name: "Caution" }).textContent).toMatch(
      /manufacturer's instructions, local codes.*licensed.*frost protection/s,
    );
    act(() => screen.getByRole("button", { name: "Add room" }).click());
    expect(store.getState().bench.rooms).toEqual([{ id: "room-1", name: "Room 1" }]);
    const room = screen.getByRole("region", { name: "Room Room 1" });
    // Defaults from engine/room (room-constants.ts): 600 kJ/K, 50 W/K; outdoor 10 °C, start 20 °C.
    expect(within(room).getByLabelText("Heat capacity (kJ/K)").getAttribute("placeholder")).toBe(
      "default 600",
    );
    expect(within(room).getByText("default 50 W/K")).toBeTruthy();
    expect(within(room).getByText("default 10 °C")).toBeTruthy();
    expect(within(room).getByText("none yet")).toBeTruthy();
    // The bench in the store stays a document the engine (and so the server) accepts.
    expect(loadBench(store.getState().bench).ok).toBe(true);
    expect(summarizeChanges(testBench(), store.getState().bench)).toBe("Added 1 room");
  });

  it("renames a room and sets a figure; a heat capacity of 0 or less is refused beside the field", () => {
    const store = renderPanel();
    act(() => screen.getByRole("button", { name: "Add room" }).click());
    typeInto(screen.getByLabelText(/^Room name/), "Lab room");
    expect(store.getState().bench.rooms?.[0]?.name).toBe("Lab room");

    const capacity = screen.getByLabelText("Heat capacity (kJ/K)");
    typeInto(capacity, "800");
    expect(store.getState().bench.rooms?.[0]?.heatCapacityKJPerK).toBe(800);

    const before = store.getState().bench;
    typeInto(screen.getByLabelText("Heat capacity (kJ/K)"), "-5");
    expect(screen.getByRole("alert").textContent).toBe("the heat capacity is 10 to 100000 kJ/K");
    expect(store.getState().bench).toBe(before);
    expect(screen.getByLabelText("Heat capacity (kJ/K)").getAttribute("aria-invalid")).toBe("true");

    typeInto(screen.getByLabelText("Envelope loss (W/K)"), "lots");
    expect(screen.getAllByRole("alert").map((a) => a.textContent)).toContain(
      "the envelope loss is a number in W/K",
    );
    expect(store.getState().bench).toBe(before);

    // A good value clears the message; a blank field goes back to the default.
    typeInto(screen.getByLabelText("Heat capacity (kJ/K)"), "");
    expect(store.getState().bench.rooms?.[0]).not.toHaveProperty("heatCapacityKJPerK");
    expect(screen.getAllByRole("alert")).toHaveLength(1);

    typeInto(screen.getByLabelText(/^Room name/), "  ");
    expect(screen.getAllByRole("alert").map((a) => a.textContent)).toContain("a room needs a name");
    expect(store.getState().bench.rooms?.[0]?.name).toBe("Lab room");
  });

  it("lists the devices in a room, and deleting it moves them out in one undoable step", () => {
    const withRoom: Bench = { ...testBench(), rooms: [{ id: "lab", name: "Lab" }] };
    const placed = setDeviceRoom(withRoom, "act-hall", "lab");
    if (!placed.ok) throw new Error(placed.error.message);
    const store = renderPanel(placed.value);
    const room = screen.getByRole("region", { name: "Room Lab" });
    const list = within(room).getByRole("list", { name: "Devices in Lab" });
    expect(
      within(list)
        .getAllByRole("listitem")
        .map((li) => li.textContent),
    ).toEqual([placed.value.devices.find((d) => d.id === "act-hall")!.name]);

    act(() => screen.getByRole("button", { name: "Delete room Lab" }).click());
    const after = store.getState().bench;
    expect(after.rooms).toBeUndefined();
    expect(after.devices.find((d) => d.id === "act-hall")).not.toHaveProperty("room");
    expect(loadBench(after).ok).toBe(true);
    expect(store.getState().notice?.text).toMatch(/1 device now models a room of its own/);

    act(() => store.getState().undo());
    expect(store.getState().bench).toBe(placed.value);
    expect(screen.getByRole("region", { name: "Room Lab" })).toBeTruthy();
  });

  it("shows rooms read only to a member who may not edit", () => {
    renderPanel({ ...testBench(), rooms: [{ id: "lab", name: "Lab", outdoorC: -5 }] }, true);
    expect(screen.queryByRole("button", { name: "Add room" })).toBeNull();
    expect(screen.queryByRole("button", { name: /Delete room/ })).toBeNull();
    const outdoor = screen.getByLabelText("Outdoor temperature (°C)") as HTMLInputElement;
    expect(outdoor.value).toBe("-5");
    expect(outdoor.readOnly).toBe(true);
  });
});
