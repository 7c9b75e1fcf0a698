"use client";

import { useMemo, useState } from "react";
import { useSimSend, useSimState } from "@/components/sim/sim-context";
import type { BenchGroupAddressSummary } from "@/components/sim/sim-protocol";
import { Button } from "@/components/ui/button";
import { Mono } from "@/components/ui/mono";
import { getDpt } from "@/engine";
import { ControlTiles } from "./control-tiles";
import { checkDptValue, defaultDptValue } from "./dpt-value";
import { LocalButtons } from "./local-buttons";
import { ValueEditor } from "./value-editor";

/** Pick a group address by address or name, write a value made for its DPT or read it; control-panel tiles and local buttons below. */
export function ControlPad() {
  const bench = useSimState((s) => s.bench);
  const send = useSimSend();
  const [query, setQuery] = useState("");
  const [selected, setSelected] = useState<BenchGroupAddressSummary | null>(null);
  const [value, setValue] = useState<unknown>(undefined);

  const matches = useMemo(() => {
    const q = query.trim().toLowerCase();
    const all = bench?.groupAddresses ?? [];
    if (q === "") return all.slice(0, 12);
    return all
      .filter((ga) => ga.address.startsWith(q) || ga.name.toLowerCase().includes(q))
      .slice(0, 12);
  }, [bench, query]);

  if (bench === null) return null;
  const choose = (ga: BenchGroupAddressSummary) => {
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
          aria-expanded={matches.length > 0}
          aria-controls="pad-address-list"
          className="mt-1 w-full rounded-md border border-paper-line bg-white px-2 py-1.5 font-mono text-sm"
          placeholder="1/0/1 or a name"
          value={query}
          onChange={(e) => {
            setQuery(e.target.value);
            setSelected(null);
          }}
        />
        {selected === null ? (
          <ul
            id="pad-address-list"
            role="listbox"
            aria-label="Matching group addresses"
            className="mt-1 max-h-48 overflow-auto rounded-md border border-paper-line bg-white text-sm"
          >
            {matches.map((ga) => (
              <li key={ga.raw} role="option" aria-selected={false}>
                <button
                  type="button"
                  className="flex w-full gap-2 px-2 py-1 text-left hover:bg-paper-deep"
                  onClick={() => choose(ga)}
                >
                  <Mono className="w-16 text-copper-deep">{ga.address}</Mono>
                  <span className="flex-1 truncate">{ga.name}</span>
                  <Mono className="text-ink-soft">{ga.dpt}</Mono>
                </button>
              </li>
            ))}
            {matches.length === 0 ? (
              <li className="px-2 py-1 text-ink-soft">No address matches</li>
            ) : null}
          </ul>
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
