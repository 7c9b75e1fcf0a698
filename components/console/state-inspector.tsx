"use client";

import { memo, useRef } from "react";
import { useSimState } from "@/components/sim/sim-context";
import type { BenchDeviceSummary } from "@/components/sim/sim-protocol";
import type { DeviceView } from "@/components/sim/sim-store";
import { Mono } from "@/components/ui/mono";
import { StatusBadge } from "@/components/ui/status-badge";
import { Flash } from "./flash";
import { formatVirtualTime } from "./format-time";
import { ShownValue } from "./shown-value";
import { useDeferredSimState } from "./use-deferred-sim-state";
import { useOnScreen } from "./use-on-screen";

/** Plain fields of a device's state (numbers, text, flags) for a compact summary. */
function stateFields(state: unknown): [string, string][] {
  if (typeof state !== "object" || state === null) return [];
  const fields: [string, string][] = [];
  for (const [key, value] of Object.entries(state)) {
    if (typeof value === "number") fields.push([key, String(Math.round(value * 100) / 100)]);
    else if (typeof value === "boolean" || typeof value === "string")
      fields.push([key, String(value)]);
    else if (value === null) fields.push([key, "–"]);
    else if (Array.isArray(value) && value.every((v) => typeof v !== "object"))
      fields.push([key, value.join(", ") || "–"]);
  }
  return fields;
}

/**
 * Each device's state and group object values, highlighted as they change,
 * with the latest transition's name. It follows the store four times a
 * second as an interruptible transition, only while on screen, and a device
 * whose snapshot did not change is not drawn again.
 */
export function StateInspector() {
  const bench = useSimState((s) => s.bench);
  const list = useRef<HTMLUListElement>(null);
  const devices = useDeferredSimState((s) => s.devices, 250, useOnScreen(list));
  if (bench === null) return null;
  return (
    <ul ref={list} className="space-y-3" aria-label="Devices">
      {bench.devices.map((device) => (
        <DeviceCard key={device.id} device={device} view={devices[device.id]} />
      ))}
    </ul>
  );
}

const DeviceCard = memo(function DeviceCard({
  device,
  view,
}: {
  device: BenchDeviceSummary;
  view: DeviceView | undefined;
}) {
  return (
    <li
      className="rounded-md border border-paper-line bg-white/70 p-3"
      aria-label={device.name}
      data-device={device.id}
    >
      <div className="flex flex-wrap items-center gap-2">
        <span className="font-medium">{device.name}</span>
        <span className="text-xs text-ink-soft">{device.typeLabel}</span>
        {device.individualAddress ? (
          <Mono className="text-xs text-ink-soft">{device.individualAddress}</Mono>
        ) : null}
        {device.role ? <StatusBadge tone="accent">{device.role}</StatusBadge> : null}
        {view?.faults.map((fault) => (
          <StatusBadge key={fault} tone="fault">
            <span aria-hidden="true">⚠&nbsp;</span>
            {fault}
          </StatusBadge>
        ))}
      </div>
      {view?.transition ? (
        <p className="mt-1 text-xs text-ink-soft">
          last transition{" "}
          <Flash version={view.stateVersion} className="rounded px-1 font-mono text-ink">
            {view.transition}
          </Flash>{" "}
          at {formatVirtualTime(view.transitionAtUs ?? 0)}
        </p>
      ) : null}
      {device.objects.length > 0 ? (
        <table className="mt-2 w-full text-xs">
          <tbody>
            {device.objects.map((object) => {
              const value = view?.objects.find((o) => o.number === object.number)?.value ?? null;
              return (
                <tr key={object.number} data-object={object.number}>
                  <td className="w-6 font-mono text-ink-soft">{object.number}</td>
                  <td className="py-0.5">{object.name}</td>
                  <td className="font-mono text-copper-deep">{object.groupAddresses.join(" ")}</td>
                  <td className="text-right">
                    <Flash
                      version={view?.objectVersions[object.number] ?? 0}
                      className="rounded px-1 font-mono"
                    >
                      <ShownValue value={value} />
                    </Flash>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      ) : null}
      {view ? (
        <details className="mt-2 text-xs">
          <summary className="cursor-pointer text-ink-soft">State</summary>
          <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 font-mono">
            {stateFields(view.state).map(([key, value]) => (
              <div key={key} className="contents">
                <dt className="text-ink-soft">{key}</dt>
                <dd>{value}</dd>
              </div>
            ))}
          </dl>
        </details>
      ) : null}
    </li>
  );
});
