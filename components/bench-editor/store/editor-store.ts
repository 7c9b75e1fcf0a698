import { createStore, type StoreApi } from "zustand/vanilla";
import type { Bench } from "@/engine";
import type { EditRefusal, EditResult } from "../model/edit-refusal";
import { copyDevices, pasteDevices, type DeviceClipboard } from "../model/clipboard";
import { removeDevices } from "../model/devices";
import { deleteGroupAddresses } from "../model/group-addresses";
import type { NodeRef } from "../model/move-nodes";

/** What the editor has selected: device cards and/or bus-bars, and an optional object row. */
export interface EditorSelection {
  readonly devices: readonly string[];
  readonly groupAddresses: readonly string[];
  /** Object row highlighted on the selected device (from a check finding or the object list). */
  readonly object?: number;
}

/** A short message the editor shows over the canvas: a refusal, or what an edit did. */
export interface EditorNotice {
  readonly tone: "refusal" | "info";
  readonly text: string;
  /** The refused edit's field, when there was one. */
  readonly field?: string;
}

export interface EditorState {
  readonly bench: Bench;
  /** The bench as last saved (or loaded), to tell whether there is something to save. */
  readonly savedBench: Bench;
  /** Earlier benches, most recent last; capped at HISTORY_LIMIT. */
  readonly past: readonly Bench[];
  readonly future: readonly Bench[];
  readonly selection: EditorSelection;
  readonly notice: EditorNotice | null;
  readonly clipboard: DeviceClipboard | null;
  /** A request to bring a node into view; `seq` changes on every request so the same node can be asked for twice. */
  readonly reveal: { readonly node: NodeRef; readonly seq: number } | null;

  /** Applies a pure edit; a refusal leaves the bench as it is and shows the message. Returns whether it applied. */
  apply(edit: (bench: Bench) => EditResult | Bench, info?: string): boolean;
  undo(): void;
  redo(): void;
  select(selection: Partial<EditorSelection> & { devices?: readonly string[] }): void;
  selectNode(node: NodeRef | null, object?: number): void;
  /** Selects a node and asks the canvas to centre it (from the address table, the check list, search). */
  revealNode(node: NodeRef, object?: number): void;
  /** Deletes the selected devices and bus-bars (with their links). */
  deleteSelection(): void;
  copySelection(): void;
  paste(): void;
  notify(notice: EditorNotice | null): void;
  /** Replaces the whole bench (an imported file) as one undoable step. */
  replaceBench(bench: Bench, info?: string): void;
  /** Marks the current bench as saved. */
  markSaved(bench?: Bench): void;
}

/** How many steps undo remembers. */
export const HISTORY_LIMIT = 200;

const emptySelection: EditorSelection = { devices: [], groupAddresses: [] };

function isResult(value: EditResult | Bench): value is EditResult {
  return typeof value === "object" && value !== null && "ok" in value;
}

/**
 * The editor's state: the bench being edited with undo/redo, the selection,
 * the clipboard and the notice line. One store per open editor; the bench in it
 * is plain engine bench JSON and every change goes through the model's pure
 * functions.
 */
export function createEditorStore(initial: Bench): StoreApi<EditorState> {
  return createStore<EditorState>()((set, get) => {
    const commit = (next: Bench, notice: EditorNotice | null = null) => {
      const { bench, past } = get();
      if (next === bench) return;
      set({ bench: next, past: [...past.slice(-(HISTORY_LIMIT - 1)), bench], future: [], notice });
    };
    return {
      bench: initial,
      savedBench: initial,
      past: [],
      future: [],
      selection: emptySelection,
      notice: null,
      clipboard: null,
      reveal: null,

      apply(edit, info) {
        const outcome = edit(get().bench);
        if (isResult(outcome)) {
          if (!outcome.ok) {
            const refusal: EditRefusal = outcome.error;
            set({
              notice: {
                tone: "refusal",
                text: refusal.message,
                ...(refusal.field ? { field: refusal.field } : {}),
              },
            });
            return false;
          }
          commit(outcome.value, info ? { tone: "info", text: info } : null);
          return true;
        }
        commit(outcome, info ? { tone: "info", text: info } : null);
        return true;
      },
      undo() {
        const { past, bench, future } = get();
        const previous = past[past.length - 1];
        if (previous === undefined) return;
        set({ bench: previous, past: past.slice(0, -1), future: [bench, ...future], notice: null });
      },
      redo() {
        const { past, bench, future } = get();
        const next = future[0];
        if (next === undefined) return;
        set({ bench: next, past: [...past, bench], future: future.slice(1), notice: null });
      },
      select(selection) {
        set({ selection: { ...emptySelection, ...selection } });
      },
      selectNode(node, object) {
        if (node === null) set({ selection: emptySelection });
        else if (node.kind === "device")
          set({
            selection: {
              devices: [node.id],
              groupAddresses: [],
              ...(object === undefined ? {} : { object }),
            },
          });
        else set({ selection: { devices: [], groupAddresses: [node.address] } });
      },
      revealNode(node, object) {
        get().selectNode(node, object);
        set({ reveal: { node, seq: (get().reveal?.seq ?? 0) + 1 } });
      },
      deleteSelection() {
        const { selection, bench } = get();
        if (selection.devices.length === 0 && selection.groupAddresses.length === 0) return;
        const next = deleteGroupAddresses(
          removeDevices(bench, selection.devices),
          selection.groupAddresses,
        );
        const parts = [];
        if (selection.devices.length)
          parts.push(
            `${selection.devices.length} device${selection.devices.length === 1 ? "" : "s"}`,
          );
        if (selection.groupAddresses.length)
          parts.push(
            `${selection.groupAddresses.length} group address${selection.groupAddresses.length === 1 ? "" : "es"}`,
          );
        commit(next, { tone: "info", text: `Deleted ${parts.join(" and ")}` });
        set({ selection: emptySelection });
      },
      copySelection() {
        const { selection, bench } = get();
        if (selection.devices.length === 0) return;
        set({
          clipboard: copyDevices(bench, selection.devices),
          notice: {
            tone: "info",
            text: `Copied ${selection.devices.length} device${selection.devices.length === 1 ? "" : "s"}`,
          },
        });
      },
      paste() {
        const { clipboard, bench } = get();
        if (clipboard === null || clipboard.devices.length === 0) return;
        const pasted = pasteDevices(bench, clipboard);
        commit(pasted.bench, {
          tone: "info",
          text: `Pasted ${pasted.deviceIds.length} device${pasted.deviceIds.length === 1 ? "" : "s"}`,
        });
        set({ selection: { devices: pasted.deviceIds, groupAddresses: [] } });
      },
      notify(notice) {
        set({ notice });
      },
      replaceBench(bench, info) {
        commit(bench, info ? { tone: "info", text: info } : null);
        set({ selection: emptySelection });
      },
      markSaved(bench) {
        set({ savedBench: bench ?? get().bench });
      },
    };
  });
}
