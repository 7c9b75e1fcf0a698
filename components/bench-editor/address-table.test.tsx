import { act, cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { checkBench } from "@/engine";
import { AddressTable } from "./address-table";
import { testBench } from "./model/test-bench";
import { EditorStoreProvider } from "./store/editor-context";
import { createEditorStore } from "./store/editor-store";

afterEach(cleanup);

function renderTable() {
  const store = createEditorStore(testBench());
  const view = () => {
    const bench = store.getState().bench;
    return (
      <EditorStoreProvider store={store}>
        <AddressTable bench={bench} findings={checkBench(bench)} />
      </EditorStoreProvider>
    );
  };
  const result = render(view());
  return { store, rerender: () => result.rerender(view()) };
}

describe("AddressTable", () => {
  it("groups addresses by main and middle group and shows links, senders and findings", () => {
    renderTable();
    const table = screen.getByRole("table", { name: "Group addresses" });
    // knx-reference.md, Addresses: three-level main/middle/sub.
    expect(
      within(table).getByRole("button", { name: /^1\s*main group · 3 addresses/ }),
    ).toBeTruthy();
    expect(
      within(table).getByRole("button", { name: /1\/0\s*middle group · 3 addresses/ }),
    ).toBeTruthy();
    expect(
      within(table).getByRole("button", { name: /^3\s*main group · 1 addresses/ }),
    ).toBeTruthy();
    const hall = screen.getByDisplayValue("Hall light").closest("tr")!;
    expect(hall.textContent).toContain("Hall rocker · 0 Switch 1");
    // 3/1/2 has nothing linked: the checks say so inline.
    const setpoint = screen.getByDisplayValue("Lab setpoint").closest("tr")!;
    expect(setpoint.textContent).toMatch(/no .*object|not linked|nothing/i);
  });

  it("renames and renumbers in place, and a renumbered address keeps its links", async () => {
    const { store, rerender } = renderTable();
    const name = screen.getByLabelText("Name of 1/0/1");
    fireEvent.change(name, { target: { value: "Hall ceiling" } });
    fireEvent.blur(name);
    expect(store.getState().bench.groupAddresses[0]!.name).toBe("Hall ceiling");
    rerender();
    const number = screen.getByLabelText("Number of 1/0/1");
    fireEvent.change(number, { target: { value: "1/0/9" } });
    fireEvent.blur(number);
    const bench = store.getState().bench;
    expect(bench.groupAddresses[0]!.address).toBe("1/0/9");
    expect(bench.links.filter((l) => l.groupAddress === "1/0/9")).toHaveLength(2);
  });

  it("refuses a taken number with a message and keeps the bench", () => {
    const { store } = renderTable();
    const number = screen.getByLabelText("Number of 1/0/1");
    fireEvent.change(number, { target: { value: "1/0/2" } });
    fireEvent.blur(number);
    expect(store.getState().notice).toMatchObject({ tone: "refusal", field: "address" });
    expect(store.getState().bench.groupAddresses[0]!.address).toBe("1/0/1");
  });

  it("adds the next free address and deletes one with its links after confirmation", async () => {
    const { store, rerender } = renderTable();
    const form = screen.getByRole("form", { name: "Add a group address" });
    fireEvent.change(within(form).getByLabelText("Name"), {
      target: { value: "Lab setpoint status" },
    });
    fireEvent.change(within(form).getByLabelText("DPT"), { target: { value: "9.001" } });
    await act(async () => {
      fireEvent.submit(form);
    });
    expect(store.getState().bench.groupAddresses.at(-1)).toMatchObject({
      address: "3/1/1",
      name: "Lab setpoint status",
      dpt: "9.001",
    });
    rerender();
    fireEvent.click(screen.getByRole("button", { name: "Delete 1/0/1" }));
    expect(store.getState().bench.groupAddresses.some((g) => g.address === "1/0/1")).toBe(true);
    fireEvent.click(screen.getByRole("button", { name: "Confirm delete 1/0/1" }));
    expect(store.getState().bench.groupAddresses.some((g) => g.address === "1/0/1")).toBe(false);
    expect(store.getState().bench.links.some((l) => l.groupAddress === "1/0/1")).toBe(false);
  });
});
