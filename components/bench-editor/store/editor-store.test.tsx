import { describe, expect, it } from "vitest";
import { addDevice, connectObject } from "../model";
import { testBench } from "../model/test-bench";
import { createEditorStore } from "./editor-store";

describe("editor store", () => {
  it("undoes and redoes edits, and a new edit clears the redo list", () => {
    const store = createEditorStore(testBench());
    const start = store.getState().bench;
    store
      .getState()
      .apply((b) => connectObject(b, { device: "pb-hall", object: 0, groupAddress: "1/0/2" }));
    const linked = store.getState().bench;
    expect(linked.links).toHaveLength(4);
    store.getState().undo();
    expect(store.getState().bench).toBe(start);
    store.getState().redo();
    expect(store.getState().bench).toBe(linked);
    store.getState().undo();
    store.getState().apply((b) => {
      const added = addDevice(b, { type: "push-button" });
      return added.ok ? { ok: true, value: added.value.bench } : added;
    });
    expect(store.getState().future).toEqual([]);
  });

  it("shows a refusal without changing the bench or the history", () => {
    const store = createEditorStore(testBench());
    const before = store.getState().bench;
    // DPT spec §3: a 1-bit object does not fit a one-octet 5.001 address.
    const applied = store
      .getState()
      .apply((b) => connectObject(b, { device: "act-hall", object: 0, groupAddress: "1/0/3" }));
    expect(applied).toBe(false);
    expect(store.getState().bench).toBe(before);
    expect(store.getState().past).toEqual([]);
    expect(store.getState().notice).toMatchObject({ tone: "refusal", field: "groupAddress" });
  });

  it("deletes the selection, copies and pastes devices", () => {
    const store = createEditorStore(testBench());
    store.getState().select({ devices: ["pb-hall"] });
    store.getState().copySelection();
    store.getState().paste();
    expect(store.getState().bench.devices.map((d) => d.id)).toEqual([
      "pb-hall",
      "act-hall",
      "push-button-1",
    ]);
    expect(store.getState().selection.devices).toEqual(["push-button-1"]);
    store.getState().select({ devices: ["act-hall"], groupAddresses: ["1/0/2"] });
    store.getState().deleteSelection();
    const bench = store.getState().bench;
    expect(bench.devices.map((d) => d.id)).toEqual(["pb-hall", "push-button-1"]);
    expect(bench.groupAddresses.map((g) => g.address)).not.toContain("1/0/2");
    expect(bench.links.every((l) => l.device !== "act-hall")).toBe(true);
    store.getState().undo();
    expect(store.getState().bench.devices).toHaveLength(3);
  });
});
