"use client";

import { useId, useMemo, useState } from "react";
import { useSimSend, useSimState } from "@/components/sim/sim-context";
import type { BenchGroupAddressSummary } from "@/components/sim/sim-protocol";
import { Button } from "@/components/ui/button";
import { cx } from "@/components/ui/cx";
import { Mono } from "@/components/ui/mono";
import { getDpt } from "@/engine";
import { ControlTiles } from "./control-tiles";
import { checkDptValue, defaultDptValue } from "./dpt-value";
import { LocalButtons } from "./local-buttons";
import { ValueEditor } from "./value-editor";

/**
 * Pick a group address by address or name (a combobox: type, arrows, Enter),
 * write a value made for its DPT or read it; control-panel tiles and local
 * buttons below.
 */
export function ControlPad() {
  const bench = useSimState((s) => s.bench);
  const send = useSimSend();
  const [query, setQuery] = useState("");
  const [selected, setSelected] = useState<BenchGroupAddressSummary | null>(null);
  const [value, setValue] = useState<unknown>(undefined);
  /** Option highlighted from the keyboard (aria-activedescendant), null for none. */
  const [active, setActive] = useState<number | null>(null);
  const listId = useId();
  const optionId = (i: number) => `${listId}-option-${i}`;

  const matches = useMemo(() => {
    const q = query.trim().toLowerCase();
    const all = bench?.groupAddresses ?? [];
    if (q === "") return all.slice(0, 12);
    return all
      .filter((ga) => ga.address.startsWith(q) || ga.name.toLowerCase().includes(q))
      .slice(0, 12);
  }, [bench, query]);

  if (bench === null) return null;
  const listOpen = selected === null && matches.length > 0;
  const choose = (ga: BenchGroupAddressSummary) => {
    setActive(null);
    setSelected(ga);
    setValue(defaultDptValue(ga.dpt));
    setQuery(`${ga.address} ${ga.name}`);
  };
  const check = selected === null ? null : checkDptValue(selected.dpt, value);
  const codec = selected === null ? undefined : getDpt(selected.dpt);
  // Control panels' buttons are their tiles, shown above with their values.
  const buttonDevices = bench.devices.filter(
    (d) => d.buttons.length > 0 && d.type !== "control-panel",
  );

  return (
    <div className="space-y-4">
      <div>
        <label className="block text-xs font-medium text-ink-soft" htmlFor="pad-address">
          Group address
        </label>
        <input
          id="pad-address"
          role="combobox"
          aria-expanded={listOpen}
          aria-controls="pad-address-list"
          aria-autocomplete="list"
          aria-activedescendant={listOpen && active !== null ? optionId(active) : undefined}
          className="mt-1 w-full rounded-md border border-paper-line bg-white px-2 py-1.5 font-mono text-sm"
          placeholder="1/0/1 or a name"
          value={query}
          onChange={(e) => {
            setQuery(e.target.value);
            setSelected(null);
            setActive(null);
          }}
          onKeyDown={(e) => {
            if (!listOpen || matches.length === 0) return;
            if (e.key === "ArrowDown" || e.key === "ArrowUp") {
              e.preventDefault();
              const step = e.key === "ArrowDown" ? 1 : -1;
              setActive((current) =>
                current === null
                  ? step === 1
                    ? 0
                    : matches.length - 1
                  : (current + step + matches.length) % matches.length,
              );
            } else if (e.key === "Enter") {
              e.preventDefault();
              choose(matches[active ?? 0]!);
            } else if (e.key === "Escape") {
              setActive(null);
            }
          }}
        />
        {listOpen ? (
          <ul
            id="pad-address-list"
            role="listbox"
            aria-label="Matching group addresses"
            className="mt-1 max-h-48 overflow-auto rounded-md border border-paper-line bg-white text-sm"
          >
            {/* Options are chosen by click or from the field (arrows, Enter): no buttons inside options. */}
            {matches.map((ga, i) => (
              <li
                key={ga.raw}
                id={optionId(i)}
                role="option"
                aria-selected={active === i}
                className={cx(
                  "flex w-full cursor-pointer gap-2 px-2 py-1 text-left hover:bg-paper-deep",
                  active === i && "bg-paper-deep outline-2 -outline-offset-2 outline-copper",
                )}
                onMouseDown={(e) => e.preventDefault()}
                onClick={() => choose(ga)}
              >
                <Mono className="w-16 text-copper-deep">{ga.address}</Mono>
                <span className="flex-1 truncate">{ga.name}</span>
                <Mono className="text-ink-soft">{ga.dpt}</Mono>
              </li>
            ))}
          </ul>
        ) : null}
        {selected === null && matches.length === 0 ? (
          <p className="mt-1 px-2 py-1 text-sm text-ink-soft">No address matches</p>
        ) : null}
      </div>
      {selected !== null ? (
        <div className="space-y-2 rounded-md border border-paper-line bg-white/60 p-3">
          <p className="text-sm">
            <Mono className="text-copper-deep">{selected.address}</Mono> {selected.name} · DPT{" "}
            <Mono>{selected.dpt}</Mono>
            {codec ? <span className="text-ink-soft"> ({codec.name})</span> : null}
          </p>
          <ValueEditor dpt={selected.dpt} value={value} onChange={setValue} />
          {check && !check.ok ? <p className="text-xs text-fault">{check.message}</p> : null}
          <div className="flex gap-2">
            <Button
              disabled={check?.ok !== true}
              onClick={() => send({ type: "write", groupAddress: selected.address, value })}
            >
              Write
            </Button>
            <Button
              variant="secondary"
              onClick={() => send({ type: "read", groupAddress: selected.address })}
            >
              Read
            </Button>
          </div>
        </div>
      ) : null}
      <ControlTiles />
      {buttonDevices.length > 0 ? (
        <div>
          <h3 className="text-xs font-medium text-ink-soft">Local buttons</h3>
          <ul className="mt-1 space-y-2">
            {buttonDevices.map((device) => (
              <li key={device.id} className="rounded-md border border-paper-line bg-white/60 p-2">
                <LocalButtons device={device} />
              </li>
            ))}
          </ul>
        </div>
      ) : null}
    </div>
  );
}
