"use client";

import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getExpandedRowModel,
  getGroupedRowModel,
  useReactTable,
  type ExpandedState,
  type GroupingState,
} from "@tanstack/react-table";
import { useMemo, useState } from "react";
import { parseGroupAddress } from "@/engine";
import type { Bench } from "@/engine";
import type { CheckFinding } from "@/engine";
import { dptIds } from "@/engine";
import { deviceObjects } from "./model/device-objects";
import { groupAddressKey } from "./model/group-address-key";
import {
  addGroupAddress,
  deleteGroupAddresses,
  renameGroupAddress,
  renumberGroupAddress,
  setGroupAddressDpt,
} from "./model/group-addresses";
import { useEditorStoreApi } from "./store/editor-context";

export interface AddressRow {
  readonly key: string;
  readonly address: string;
  readonly main: number;
  readonly middle: string;
  readonly name: string;
  readonly dpt: string;
  /** "Hall relay · 0 Switch 1" per linked object. */
  readonly linked: readonly string[];
  /** Objects that send on this address (it is their first link). */
  readonly senders: readonly string[];
  readonly findings: readonly CheckFinding[];
}

/** The rows of the address table: one per group address, with links, senders and findings resolved. */
export function addressRows(bench: Bench, findings: readonly CheckFinding[]): AddressRow[] {
  const deviceById = new Map(bench.devices.map((d) => [d.id, d]));
  const objectNames = new Map<string, string>();
  const objectName = (device: string, object: number) => {
    const key = `${device}#${object}`;
    let name = objectNames.get(key);
    if (name === undefined) {
      const d = deviceById.get(device);
      const spec = d === undefined ? undefined : deviceObjects(d).find((o) => o.number === object);
      name = `${d?.name ?? device} · ${object} ${spec?.name ?? "?"}`;
      objectNames.set(key, name);
    }
    return name;
  };
  const linked = new Map<string, string[]>();
  const senders = new Map<string, string[]>();
  const seen = new Set<string>();
  for (const link of bench.links) {
    const key = groupAddressKey(link.groupAddress);
    const name = objectName(link.device, link.object);
    linked.set(key, [...(linked.get(key) ?? []), name]);
    const objectKey = `${link.device}#${link.object}`;
    if (!seen.has(objectKey)) {
      seen.add(objectKey);
      senders.set(key, [...(senders.get(key) ?? []), name]);
    }
  }
  const findingsByKey = new Map<string, CheckFinding[]>();
  for (const finding of findings) {
    if (finding.location.groupAddress === undefined) continue;
    const key = groupAddressKey(finding.location.groupAddress);
    findingsByKey.set(key, [...(findingsByKey.get(key) ?? []), finding]);
  }
  return bench.groupAddresses
    .map((g) => {
      const raw = parseGroupAddress(g.address);
      const value = raw.ok ? raw.value : 0;
      const key = groupAddressKey(g.address);
      return {
        key,
        raw: value,
        row: {
          key,
          address: g.address,
          main: value >>> 11,
          middle: `${value >>> 11}/${(value >>> 8) & 7}`,
          name: g.name,
          dpt: g.dpt,
          linked: linked.get(key) ?? [],
          senders: senders.get(key) ?? [],
          findings: findingsByKey.get(key) ?? [],
        },
      };
    })
    .sort((a, b) => a.raw - b.raw)
    .map((entry) => entry.row);
}

const column = createColumnHelper<AddressRow>();
const EXPAND_ALL_BELOW = 300;

function EditableCell({
  value,
  label,
  mono,
  onCommit,
}: {
  value: string;
  label: string;
  mono?: boolean;
  onCommit: (next: string) => void;
}) {
  const [draft, setDraft] = useState(value);
  const [shown, setShown] = useState(value);
  if (shown !== value) {
    setShown(value);
    setDraft(value);
  }
  const commit = () => {
    if (draft.trim() !== value) onCommit(draft.trim());
  };
  return (
    <input
      aria-label={label}
      value={draft}
      onChange={(e) => setDraft(e.target.value)}
      onBlur={commit}
      onKeyDown={(e) => {
        if (e.key === "Enter") commit();
        if (e.key === "Escape") setDraft(value);
      }}
      className={`w-full rounded border border-transparent bg-transparent px-1 py-0.5 hover:border-paper-line focus:border-copper focus:bg-paper ${mono ? "font-mono" : ""}`}
    />
  );
}

function DeleteButton({ address, onDelete }: { address: string; onDelete: () => void }) {
  const [armed, setArmed] = useState(false);
  return armed ? (
    <span className="flex gap-1">
      <button
        type="button"
        className="rounded bg-fault px-1.5 text-white"
        onClick={onDelete}
        aria-label={`Confirm delete ${address}`}
      >
        Delete
      </button>
      <button type="button" className="underline" onClick={() => setArmed(false)}>
        Keep
      </button>
    </span>
  ) : (
    <button
      type="button"
      className="inline-flex size-6 items-center justify-center rounded text-ink-soft hover:text-fault"
      onClick={() => setArmed(true)}
      aria-label={`Delete ${address}`}
    >
      ×
    </button>
  );
}

/**
 * The group addresses as a three-level table (main group, middle group,
 * address) with names, DPT, linked objects, the sending objects and the bench
 * checks' findings inline. Names, numbers and DPTs are edited in place; a
 * renumbered address keeps its links. With `readOnly` they are shown as text,
 * with no adding or deleting.
 */
export function AddressTable({
  bench,
  findings,
  readOnly = false,
}: {
  bench: Bench;
  findings: readonly CheckFinding[];
  readOnly?: boolean;
}) {
  const store = useEditorStoreApi();
  const data = useMemo(() => addressRows(bench, findings), [bench, findings]);
  const [grouping] = useState<GroupingState>(["main", "middle"]);
  const [expanded, setExpanded] = useState<ExpandedState>(() =>
    bench.groupAddresses.length < EXPAND_ALL_BELOW ? true : {},
  );
  const apply = store.getState().apply;

  const columns = useMemo(
    () => [
      column.accessor("main", { header: "Main", cell: (c) => c.getValue() }),
      column.accessor("middle", { header: "Middle", cell: (c) => c.getValue() }),
      column.accessor("address", {
        header: "Address",
        cell: (c) =>
          readOnly ? (
            <span className="px-1 font-mono">{c.getValue()}</span>
          ) : (
            <EditableCell
              mono
              value={c.getValue()}
              label={`Number of ${c.getValue()}`}
              onCommit={(next) =>
                apply(
                  (b) => renumberGroupAddress(b, c.getValue(), next),
                  `Renumbered ${c.getValue()} to ${next}`,
                )
              }
            />
          ),
      }),
      column.accessor("name", {
        header: "Name",
        cell: (c) =>
          readOnly ? (
            <span className="px-1">{c.getValue()}</span>
          ) : (
            <EditableCell
              value={c.getValue()}
              label={`Name of ${c.row.original.address}`}
              onCommit={(next) => apply((b) => renameGroupAddress(b, c.row.original.address, next))}
            />
          ),
      }),
      column.accessor("dpt", {
        header: "DPT",
        cell: (c) =>
          readOnly ? (
            <span className="px-1 font-mono">{c.getValue()}</span>
          ) : (
            <EditableCell
              mono
              value={c.getValue()}
              label={`DPT of ${c.row.original.address}`}
              onCommit={(next) => apply((b) => setGroupAddressDpt(b, c.row.original.address, next))}
            />
          ),
      }),
      column.accessor("linked", {
        header: "Linked objects",
        cell: (c) =>
          c.getValue().length === 0 ? (
            <span className="text-ink-soft">none</span>
          ) : (
            <span title={c.getValue().join("\n")}>{c.getValue().length}</span>
          ),
      }),
      column.accessor("senders", {
        header: "Sender",
        cell: (c) => (
          <span className="line-clamp-2">
            {c.getValue().join(", ") || <span className="text-ink-soft">none</span>}
          </span>
        ),
      }),
      column.accessor("findings", {
        header: "Checks",
        cell: (c) =>
          c.getValue().map((f, i) => (
            <span
              key={i}
              className={`block ${f.severity === "error" ? "text-fault" : "text-copper-deep"}`}
              title={f.rule}
            >
              {/* Severity by shape and word as well as colour. */}
              <span aria-hidden="true">
                {f.severity === "error" ? "✖ " : f.severity === "warning" ? "▲ " : "· "}
              </span>
              <span className="sr-only">{f.severity}: </span>
              {f.message}
            </span>
          )),
      }),
      column.display({
        id: "actions",
        header: "",
        cell: (c) => (
          <DeleteButton
            address={c.row.original.address}
            onDelete={() =>
              apply(
                (b) => deleteGroupAddresses(b, [c.row.original.address]),
                `Deleted ${c.row.original.address} and its links`,
              )
            }
          />
        ),
      }),
    ],
    [apply, readOnly],
  );

  // eslint-disable-next-line react-hooks/incompatible-library -- TanStack Table v8 returns fresh functions by design; this component is not memoised.
  const table = useReactTable({
    data,
    columns,
    state: {
      grouping,
      expanded,
      columnVisibility: { main: false, middle: false, actions: !readOnly },
    },
    onExpandedChange: setExpanded,
    getRowId: (row) => row.key,
    getCoreRowModel: getCoreRowModel(),
    getGroupedRowModel: getGroupedRowModel(),
    getExpandedRowModel: getExpandedRowModel(),
    autoResetExpanded: false,
  });

  return (
    <div className="flex flex-col gap-2">
      {readOnly ? null : <AddAddressForm />}
      <table className="w-full text-xs" aria-label="Group addresses">
        <thead>
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id} className="text-left text-ink-soft">
              {group.headers.map((header) => (
                <th key={header.id} className="px-1 py-1 font-medium">
                  {flexRender(header.column.columnDef.header, header.getContext())}
                </th>
              ))}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((row) => {
            if (row.getIsGrouped()) {
              const isMain = row.groupingColumnId === "main";
              return (
                <tr key={row.id} className={isMain ? "bg-paper-deep" : "bg-paper-deep/50"}>
                  <td colSpan={row.getVisibleCells().length} className="px-1 py-1">
                    <button
                      type="button"
                      onClick={row.getToggleExpandedHandler()}
                      aria-expanded={row.getIsExpanded()}
                      className="flex items-center gap-2 font-semibold"
                      style={{ paddingLeft: isMain ? 0 : 14 }}
                    >
                      <span aria-hidden="true">{row.getIsExpanded() ? "▾" : "▸"}</span>
                      <span className="font-mono">
                        {isMain ? `${String(row.groupingValue)}` : String(row.groupingValue)}
                      </span>
                      <span className="font-normal text-ink-soft">
                        {isMain ? "main group" : "middle group"} ·{" "}
                        {row.getLeafRows().filter((leaf) => !leaf.getIsGrouped()).length} addresses
                      </span>
                    </button>
                  </td>
                </tr>
              );
            }
            return (
              <tr
                key={row.id}
                className="border-t border-paper-line align-top hover:bg-paper-deep/40"
                onClick={(e) => {
                  if ((e.target as HTMLElement).closest("input,button")) return;
                  store
                    .getState()
                    .revealNode({ kind: "group-address", address: row.original.address });
                }}
              >
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-1 py-0.5">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            );
          })}
        </tbody>
      </table>
      <datalist id="benchline-dpt-ids">
        {dptIds.map((id) => (
          <option key={id} value={id} />
        ))}
      </datalist>
    </div>
  );
}

function AddAddressForm() {
  const store = useEditorStoreApi();
  const [address, setAddress] = useState("");
  const [name, setName] = useState("");
  const [dpt, setDpt] = useState("1.001");
  return (
    <form
      aria-label="Add a group address"
      className="flex flex-wrap items-end gap-2 text-xs"
      onSubmit={(e) => {
        e.preventDefault();
        const applied = store.getState().apply(
          (b) => {
            const result = addGroupAddress(b, {
              ...(address.trim() ? { address: address.trim() } : {}),
              name,
              dpt: dpt.trim(),
            });
            return result.ok ? { ok: true, value: result.value.bench } : result;
          },
          `Added ${address.trim() || "a group address"}`,
        );
        if (applied) {
          setAddress("");
          setName("");
        }
      }}
    >
      <label className="flex flex-col gap-0.5">
        Address
        <input
          value={address}
          onChange={(e) => setAddress(e.target.value)}
          placeholder="next free"
          className="w-24 rounded border border-paper-line bg-paper px-1 py-0.5 font-mono"
        />
      </label>
      <label className="flex flex-1 flex-col gap-0.5">
        Name
        <input
          value={name}
          onChange={(e) => setName(e.target.value)}
          required
          className="rounded border border-paper-line bg-paper px-1 py-0.5"
        />
      </label>
      <label className="flex flex-col gap-0.5">
        DPT
        <input
          value={dpt}
          onChange={(e) => setDpt(e.target.value)}
          list="benchline-dpt-ids"
          className="w-20 rounded border border-paper-line bg-paper px-1 py-0.5 font-mono"
        />
      </label>
      <button type="submit" className="rounded bg-copper px-2 py-1 text-white hover:bg-copper-deep">
        Add address
      </button>
    </form>
  );
}
