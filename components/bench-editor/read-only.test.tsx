import { act, cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { checkBench } from "@/engine";
import { AddressTable } from "./address-table";
import { testBench } from "./model/test-bench";
import { ObjectList } from "./object-list";
import { ParameterPanel } from "./parameter-panel";
import { EditorStoreProvider } from "./store/editor-context";
import { createEditorStore } from "./store/editor-store";

afterEach(cleanup);

/** The panels as a member who may not edit the bench sees them (e.g. qa). */
function renderReadOnly(panel: "addresses" | "parameters" | "objects", deviceId = "act-hall") {
  const store = createEditorStore(testBench());
  const bench = store.getState().bench;
  const device = bench.devices.find((d) => d.id === deviceId)!;
  render(
    <EditorStoreProvider store={store}>
      {panel === "addresses" ? (
        <AddressTable bench={bench} findings={checkBench(bench)} readOnly />
      ) : panel === "parameters" ? (
        <ParameterPanel device={device} readOnly />
      ) : (
        <ObjectList device={device} bench={bench} readOnly />
      )}
    </EditorStoreProvider>,
  );
  return { store, before: bench };
}

describe("the editing panels for a member who may not edit", () => {
  it("shows the addresses as text, without adding, editing or deleting", () => {
    renderReadOnly("addresses");
    const table = screen.getByRole("table", { name: "Group addresses" });
    const hall = within(table).getByText("Hall light").closest("tr")!;
    expect(hall.textContent).toContain("1/0/1");
    expect(within(table).queryAllByRole("textbox")).toEqual([]);
    expect(screen.queryByRole("form", { name: "Add a group address" })).toBeNull();
    expect(screen.queryByRole("button", { name: /^Delete / })).toBeNull();
  });

  it("shows the parameters in disabled fields, with no adding or removing of items", async () => {
    const { store, before } = renderReadOnly("parameters", "pb-hall");
    expect(screen.queryByRole("button", { name: "Add channel" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Remove" })).toBeNull();
    const fn = screen.getByLabelText("Function") as HTMLSelectElement;
    // Disabled through its fieldset, as a browser has it.
    expect(fn.matches(":disabled")).toBe(true);
    await act(async () => {
      fireEvent.change(fn, { target: { value: "scene" } });
      await new Promise((resolve) => setTimeout(resolve, 10));
    });
    expect(store.getState().bench).toBe(before);
  });

  it("shows objects, flags and links but offers no unlinking or flag changes", () => {
    const { store, before } = renderReadOnly("objects");
    const table = screen.getByRole("table", { name: "Group objects of Hall relay" });
    expect(table.textContent).toContain("1/0/1");
    expect(within(table).queryAllByRole("button")).toEqual([]);
    const flags = within(table).getAllByRole("checkbox") as HTMLInputElement[];
    expect(flags.length).toBeGreaterThan(0);
    expect(flags.every((flag) => flag.disabled)).toBe(true);
    fireEvent.click(flags[0]!);
    expect(store.getState().bench).toBe(before);
  });
});
