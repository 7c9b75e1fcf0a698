"use client";

import { useMemo, useState } from "react";
import { DEFAULT_COUPLER_QUEUE_CAPACITY, type Bench, type BenchDevice } from "@/engine";
import { setParameters } from "./model/devices";
import { Button } from "@/components/ui/button";
import { Mono } from "@/components/ui/mono";
import { StatusBadge } from "@/components/ui/status-badge";
import {
  addFilterEntry,
  filterTableRows,
  followLinks,
  regenerateFilterTable,
  removeFilterEntry,
  setGroupTelegrams,
  setIndividualTelegrams,
  storedFilterTable,
  type GroupTelegramMode,
  type IndividualTelegramMode,
} from "./model/topology";
import { sameGroupAddress } from "./model/group-address-key";
import { useEditorStoreApi } from "./store/editor-context";

const GROUP_MODES: readonly [GroupTelegramMode, string][] = [
  ["filter", "filter by the table"],
  ["forward", "pass all"],
  ["block", "block all"],
];
const INDIVIDUAL_MODES: readonly [IndividualTelegramMode, string][] = [
  ["route", "route by address"],
  ["forward", "pass all"],
  ["block", "block all"],
];

const selectClass = "rounded border border-paper-line bg-white px-2 py-1 text-sm";

/**
 * A coupler's settings and its filter table. The table the coupler uses is
 * either generated from the links whenever the bench loads, or stored (as
 * commissioning writes it, or edited by hand); a stored table can go stale,
 * and the rows say which needed address it blocks and which entry nothing uses.
 */
export function CouplerPanel({
  bench,
  device,
  readOnly,
}: {
  bench: Bench;
  device: BenchDevice;
  readOnly: boolean;
}) {
  const store = useEditorStoreApi();
  const [entry, setEntry] = useState("");
  const parameters = device.parameters as Record<string, unknown>;
  const groupMode = (parameters.groupTelegrams as GroupTelegramMode | undefined) ?? "filter";
  const individualMode =
    (parameters.individualTelegrams as IndividualTelegramMode | undefined) ?? "route";
  const stored = storedFilterTable(device);
  const rows = useMemo(() => filterTableRows(bench, device), [bench, device]);
  const blocked = rows.filter((r) => r.needed && !r.inTable).length;
  const nameOf = (address: string) =>
    bench.groupAddresses.find((g) => sameGroupAddress(g.address, address))?.name ?? "";
  const apply = (edit: (b: Bench) => ReturnType<typeof followLinks>, info: string) =>
    store.getState().apply(edit, info);

  return (
    <div className="flex flex-col gap-3" aria-label="Coupler settings">
      <ModeSelect<GroupTelegramMode>
        label="Group telegrams"
        value={groupMode}
        modes={GROUP_MODES}
        disabled={readOnly}
        onChange={(mode) =>
          apply((b) => setGroupTelegrams(b, device.id, mode), `Group telegrams: ${mode}`)
        }
      />
      <ModeSelect<IndividualTelegramMode>
        label="Individually addressed telegrams"
        value={individualMode}
        modes={INDIVIDUAL_MODES}
        disabled={readOnly}
        onChange={(mode) =>
          apply((b) => setIndividualTelegrams(b, device.id, mode), `Individual telegrams: ${mode}`)
        }
      />

      <label className="flex flex-col gap-1 text-xs text-ink-soft">
        Buffer per direction (telegrams)
        <input
          key={`queue:${String(parameters.queueCapacity ?? "")}`}
          type="number"
          min={1}
          max={1024}
          className={`${selectClass} w-28 font-mono`}
          defaultValue={Number(parameters.queueCapacity ?? DEFAULT_COUPLER_QUEUE_CAPACITY)}
          readOnly={readOnly}
          onBlur={(e) => {
            const value = Number(e.target.value);
            if (value === Number(parameters.queueCapacity ?? DEFAULT_COUPLER_QUEUE_CAPACITY))
              return;
            apply((b) => {
              const result = setParameters(b, device.id, { ...parameters, queueCapacity: value });
              return result.ok ? { ok: true, value: result.value.bench } : result;
            }, `Buffer per direction: ${value} telegrams`);
          }}
          onKeyDown={(e) => e.key === "Enter" && e.currentTarget.blur()}
        />
        <span className="text-[11px]">
          Telegrams it holds while the other line is busy; one more is answered busy, so the sender
          repeats.
        </span>
      </label>

      <section aria-label="Filter table" className="flex flex-col gap-2">
        <h4 className="text-sm font-semibold">Filter table</h4>
        <p className="text-xs text-ink-soft">
          {stored === undefined
            ? "Generated from the links whenever the bench loads, so it always matches them."
            : `Stored: ${stored.length} entries, as last written. It does not follow later changes to the links until it is regenerated.`}
          {groupMode === "filter"
            ? ""
            : " Not read while group telegrams are set to pass or block all."}
        </p>
        {blocked > 0 ? (
          <p role="status" className="text-xs text-fault">
            {blocked} address{blocked === 1 ? "" : "es"} the links need{" "}
            {blocked === 1 ? "is" : "are"} missing from the stored table: the coupler blocks{" "}
            {blocked === 1 ? "it" : "them"}.
          </p>
        ) : null}
        {readOnly ? null : (
          <div className="flex flex-wrap gap-2">
            <Button
              variant="secondary"
              className="px-2 py-1 text-xs"
              onClick={() =>
                apply(
                  (b) => regenerateFilterTable(b, device.id),
                  "Filter table regenerated from the links",
                )
              }
            >
              Regenerate from the links
            </Button>
            {stored === undefined ? null : (
              <Button
                variant="secondary"
                className="px-2 py-1 text-xs"
                onClick={() =>
                  apply((b) => followLinks(b, device.id), "Filter table follows the links")
                }
              >
                Follow the links
              </Button>
            )}
          </div>
        )}
        {rows.length === 0 ? (
          <p className="text-xs text-ink-soft">
            Empty: no group address has members on both sides of this coupler.
          </p>
        ) : (
          <table className="w-full text-xs">
            <caption className="sr-only">Filter table of {device.name}</caption>
            <thead>
              <tr className="text-left text-ink-soft">
                <th scope="col" className="font-medium">
                  Address
                </th>
                <th scope="col" className="font-medium">
                  State
                </th>
                {readOnly ? null : (
                  <th scope="col">
                    <span className="sr-only">Actions</span>
                  </th>
                )}
              </tr>
            </thead>
            <tbody>
              {rows.map((row) => (
                <tr key={row.address} className="border-t border-paper-line">
                  <th scope="row" className="py-1 pr-2 text-left font-normal">
                    <Mono>{row.address}</Mono>{" "}
                    <span className="text-ink-soft">{nameOf(row.address)}</span>
                  </th>
                  <td>
                    {row.inTable && row.needed ? (
                      <StatusBadge tone="healthy">passes</StatusBadge>
                    ) : row.needed ? (
                      <StatusBadge tone="fault">blocked, needed</StatusBadge>
                    ) : (
                      <StatusBadge tone="neutral">unused entry</StatusBadge>
                    )}
                  </td>
                  {readOnly ? null : (
                    <td className="text-right">
                      {row.inTable ? (
                        <button
                          type="button"
                          className="text-copper-deep underline"
                          aria-label={`Remove ${row.address} from the filter table`}
                          onClick={() =>
                            apply(
                              (b) => removeFilterEntry(b, device.id, row.address),
                              `Removed ${row.address} from the filter table`,
                            )
                          }
                        >
                          remove
                        </button>
                      ) : (
                        <button
                          type="button"
                          className="text-copper-deep underline"
                          aria-label={`Add ${row.address} to the filter table`}
                          onClick={() =>
                            apply(
                              (b) => addFilterEntry(b, device.id, row.address),
                              `Added ${row.address} to the filter table`,
                            )
                          }
                        >
                          add
                        </button>
                      )}
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        )}
        {readOnly ? null : (
          <form
            className="flex items-end gap-2"
            aria-label="Add a filter table entry"
            onSubmit={(e) => {
              e.preventDefault();
              if (
                apply(
                  (b) => addFilterEntry(b, device.id, entry),
                  `Added ${entry} to the filter table`,
                )
              )
                setEntry("");
            }}
          >
            <label className="flex flex-col gap-1 text-xs text-ink-soft">
              Group address
              <input
                className="w-28 rounded border border-paper-line bg-white px-2 py-1 font-mono text-sm"
                value={entry}
                placeholder="4/0/1"
                onChange={(e) => setEntry(e.target.value)}
              />
            </label>
            <Button
              type="submit"
              variant="secondary"
              className="px-2 py-1 text-xs"
              disabled={entry.trim() === ""}
            >
              Add entry
            </Button>
          </form>
        )}
      </section>
    </div>
  );
}

/** One of a coupler's forwarding settings, chosen from its modes. */
function ModeSelect<Mode extends string>({
  label,
  value,
  modes,
  disabled,
  onChange,
}: {
  label: string;
  value: Mode;
  modes: readonly (readonly [Mode, string])[];
  disabled: boolean;
  onChange: (mode: Mode) => void;
}) {
  return (
    <label className="flex flex-col gap-1 text-xs text-ink-soft">
      {label}
      <select
        className={selectClass}
        value={value}
        disabled={disabled}
        onChange={(e) => onChange(e.target.value as Mode)}
      >
        {modes.map(([mode, text]) => (
          <option key={mode} value={mode}>
            {text}
          </option>
        ))}
      </select>
    </label>
  );
}
