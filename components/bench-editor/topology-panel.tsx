"use client";

import { useState } from "react";
import type { Bench, BenchTopology } from "@/engine";
import { Button } from "@/components/ui/button";
import { Mono } from "@/components/ui/mono";
import { addArea, addCoupler, addLine, proposedCouplerAddress } from "./model/topology";
import { useEditorStoreApi } from "./store/editor-context";

const KIND_LABEL = { line: "line", main: "main line", backbone: "backbone" } as const;
const fieldClass = "w-16 rounded border border-paper-line bg-white px-2 py-1 font-mono text-sm";

/**
 * The bench's topology: each area with its lines, their device counts and
 * the load expected on each (what its devices send plus what couplers pass
 * into it, from the engine's bench topology), and each line's coupler. A
 * trainer or engineer adds areas, lines and couplers here; a coupler's
 * settings and filter table are edited when it is selected.
 */
export function TopologyPanel({
  bench,
  topology,
  readOnly,
  onOpenCoupler,
}: {
  bench: Bench;
  /** Shows a coupler's settings and filter table (the editor's selection panel). */
  onOpenCoupler: (deviceId: string) => void;
  /** Null while the bench does not load (its check findings say why). */
  topology: BenchTopology | null;
  readOnly: boolean;
}) {
  const store = useEditorStoreApi();
  const [area, setArea] = useState("1");
  const [line, setLine] = useState("1");
  const [name, setName] = useState("");
  const [newArea, setNewArea] = useState("");

  const select = (deviceId: string) => {
    store.getState().revealNode({ kind: "device", id: deviceId });
    onOpenCoupler(deviceId);
  };

  const addLineNow = () => {
    let added: string | undefined;
    store.getState().apply((b) => {
      const result = addLine(b, { area: Number(area), line: Number(line), name });
      if (!result.ok) return result;
      added = result.value.lineId;
      return { ok: true, value: result.value.bench };
    }, `Added line ${area}.${line}`);
    if (added) setName("");
  };

  const addAreaNow = () =>
    store.getState().apply((b) => {
      const result = addArea(b, { area: Number(newArea) });
      return result.ok ? { ok: true, value: result.value.bench } : result;
    }, `Added area ${newArea} with its main line ${newArea}.0`);

  const addCouplerTo = (lineId: string, address: string) => {
    let added: string | undefined;
    store.getState().apply((b) => {
      const result = addCoupler(b, lineId);
      if (!result.ok) return result;
      added = result.value.deviceId;
      return { ok: true, value: result.value.bench };
    }, `Added coupler ${address}`);
    if (added) select(added);
  };

  if (topology === null)
    return (
      <p className="text-sm text-ink-soft">
        The bench does not load, so its topology cannot be worked out: see the Checks tab.
      </p>
    );

  return (
    <div className="flex flex-col gap-4" aria-label="Topology">
      {topology.areas.map((a) => (
        <section key={a.number} aria-label={`Area ${a.number}`}>
          <h3 className="mb-1 text-sm font-semibold">
            Area <Mono>{a.number}</Mono> {a.name}
          </h3>
          <table className="w-full text-xs">
            <caption className="sr-only">Lines of area {a.number}</caption>
            <thead>
              <tr className="text-left text-ink-soft">
                <th scope="col" className="py-1 font-medium">
                  Line
                </th>
                <th scope="col" className="font-medium">
                  Devices
                </th>
                <th
                  scope="col"
                  className="font-medium"
                  title="Expected load, with what couplers pass into the line"
                >
                  Load
                </th>
                <th scope="col" className="font-medium">
                  Coupler
                </th>
              </tr>
            </thead>
            <tbody>
              {a.lines.map((l) => {
                const proposed = proposedCouplerAddress({
                  id: l.id,
                  address: l.address,
                  name: l.name,
                });
                const coupler =
                  l.couplerId === undefined
                    ? undefined
                    : bench.devices.find((d) => d.id === l.couplerId);
                return (
                  <tr key={l.id} className="border-t border-paper-line align-top">
                    <th scope="row" className="py-1 pr-2 text-left font-normal">
                      <Mono>{l.address}</Mono> {l.name}
                      <span className="block text-[11px] text-ink-soft">{KIND_LABEL[l.kind]}</span>
                    </th>
                    <td className="tabular-nums">{l.deviceCount}</td>
                    <td className="tabular-nums">{l.expectedLoadPercent.toFixed(1)} %</td>
                    <td>
                      {coupler ? (
                        <button
                          type="button"
                          className="text-left text-copper-deep underline"
                          onClick={() => select(coupler.id)}
                          aria-label={`Coupler ${coupler.individualAddress ?? ""} ${coupler.name}: edit its settings and filter table`}
                        >
                          <Mono>{coupler.individualAddress}</Mono> {coupler.name}
                        </button>
                      ) : proposed === undefined ? (
                        <span className="text-ink-soft">none (top of the topology)</span>
                      ) : readOnly ? (
                        <span className="text-ink-soft">none</span>
                      ) : (
                        <Button
                          variant="secondary"
                          className="px-2 py-1 text-xs"
                          onClick={() => addCouplerTo(l.id, proposed)}
                          aria-label={`Add coupler ${proposed} to line ${l.address}`}
                        >
                          Add coupler <Mono>{proposed}</Mono>
                        </Button>
                      )}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </section>
      ))}
      <p className="text-[11px] leading-snug text-ink-soft">
        A line coupler <Mono>a.l.0</Mono> joins line <Mono>a.l</Mono> to its area&apos;s main line{" "}
        <Mono>a.0</Mono>; an area coupler <Mono>a.0.0</Mono> joins a main line to the backbone{" "}
        <Mono>0.0</Mono>. Load is the share of the line&apos;s capacity the bench is expected to
        use.
      </p>
      <p className="text-[11px] leading-snug text-ink-soft">
        A simulated topology, for planning and training: it does not replace the manufacturers&apos;
        instructions, local codes or licensed practice on a real installation.
      </p>
      {readOnly ? null : (
        <>
          <form
            aria-label="Add a line"
            className="flex flex-wrap items-end gap-2"
            onSubmit={(e) => {
              e.preventDefault();
              addLineNow();
            }}
          >
            <label className="flex flex-col text-xs text-ink-soft">
              Area
              <input
                className={fieldClass}
                inputMode="numeric"
                value={area}
                onChange={(e) => setArea(e.target.value)}
              />
            </label>
            <label className="flex flex-col text-xs text-ink-soft">
              Line
              <input
                className={fieldClass}
                inputMode="numeric"
                value={line}
                onChange={(e) => setLine(e.target.value)}
              />
            </label>
            <label className="flex min-w-32 flex-1 flex-col text-xs text-ink-soft">
              Name
              <input
                className="rounded border border-paper-line bg-white px-2 py-1 text-sm"
                value={name}
                placeholder={`Line ${area}.${line}`}
                onChange={(e) => setName(e.target.value)}
              />
            </label>
            <Button type="submit" variant="secondary">
              Add line
            </Button>
          </form>
          <form
            aria-label="Add an area"
            className="flex flex-wrap items-end gap-2"
            onSubmit={(e) => {
              e.preventDefault();
              addAreaNow();
            }}
          >
            <label className="flex flex-col text-xs text-ink-soft">
              Area
              <input
                className={fieldClass}
                inputMode="numeric"
                value={newArea}
                placeholder="2"
                onChange={(e) => setNewArea(e.target.value)}
              />
            </label>
            <Button type="submit" variant="secondary" disabled={newArea.trim() === ""}>
              Add area with its main line
            </Button>
          </form>
        </>
      )}
    </div>
  );
}
