"use client";

import { Handle, Position, type NodeProps } from "@xyflow/react";
import { memo } from "react";
import type { CheckSeverity } from "@/engine";
import { cx } from "@/components/ui/cx";
import { deviceAddressLabel, type DeviceNode } from "./bench-graph";
import { dptFamily } from "./dpt-family";
import { flagLetters } from "./flag-letters";
import { objectHandleId, UNIT_LINK_HANDLE } from "./node-ids";

const severityRing = {
  error: "ring-2 ring-fault-bright",
  warning: "ring-2 ring-copper-bright",
  info: "",
} as const;

/**
 * A device card: header with name, type and individual address, then one row
 * per group object with a port on the right tinted by the object's DPT family.
 * An object's sending address is printed on its row; devices wired to a unit
 * link get a second port on the header for the unit link.
 */
function DeviceNodeView({ data, selected }: NodeProps<DeviceNode>) {
  const { device, objects, faults } = data;
  const faulty = faults !== undefined && faults.length > 0;
  return (
    <div
      className={cx(
        "relative w-[248px] rounded-md border bg-graphite-raised text-graphite-text shadow-md",
        selected ? "border-copper-bright" : "border-graphite-line",
        faulty ? "ring-2 ring-fault-bright" : data.severity ? severityRing[data.severity] : "",
      )}
      data-testid={`device-card-${device.id}`}
      data-faults={faulty ? faults.join(" ") : undefined}
    >
      {faulty ? (
        // Above the card, in the gap between cards, so the card keeps its laid-out height.
        <ul
          className="absolute bottom-full left-0 mb-1 flex max-w-full flex-wrap gap-1"
          aria-label={`Faults of ${device.name}`}
        >
          {faults.map((fault) => (
            <li
              key={fault}
              className="rounded bg-fault px-1.5 py-0.5 font-mono text-[11px] text-white"
            >
              <span aria-hidden="true">⚠ </span>
              {fault}
            </li>
          ))}
        </ul>
      ) : null}
      <div className="relative flex h-[52px] flex-col justify-center border-b border-graphite-line px-3">
        <div className="flex items-baseline justify-between gap-2">
          <span className="truncate text-sm font-semibold">{device.name}</span>
          <span className="shrink-0 font-mono text-[11px] text-copper-bright">
            {deviceAddressLabel(device)}
          </span>
        </div>
        <span className="truncate text-[11px] text-graphite-muted">{data.typeLabel}</span>
        {data.unitLinkPort ? (
          <Handle
            type="source"
            id={UNIT_LINK_HANDLE}
            position={Position.Left}
            title="Unit link: drag to another HVAC device to wire them"
            className="!h-3 !w-3 !rounded-sm !border-2 !border-graphite-text !bg-graphite"
          />
        ) : null}
      </div>
      {objects.length === 0 ? (
        <div className="px-3 py-1 text-[11px] text-graphite-muted">no group objects</div>
      ) : (
        <ul>
          {objects.map((object) => {
            const family = dptFamily(object.dpt);
            return (
              <li
                key={object.number}
                className={cx(
                  "relative flex h-6 items-center gap-2 pr-4 pl-3 text-[11px]",
                  data.focusObject === object.number && "bg-copper/25",
                  object.severity === "error" && "text-fault-soft",
                )}
                title={`${object.number} ${object.name} · DPT ${object.dpt} · flags ${flagLetters(object.flags)}`}
              >
                <span className="w-4 shrink-0 font-mono text-graphite-muted">{object.number}</span>
                <span className="min-w-0 flex-1 truncate">{object.name}</span>
                {object.sendingAddress !== undefined ? (
                  <span className="shrink-0 font-mono text-copper-bright" title="Sending address">
                    ▸{object.sendingAddress}
                    {object.linkCount > 1 ? (
                      <span className="text-graphite-muted"> +{object.linkCount - 1}</span>
                    ) : null}
                  </span>
                ) : (
                  <span className="shrink-0 font-mono text-graphite-muted">{object.dpt}</span>
                )}
                <SeverityMark severity={object.severity} />
                {/* A port is a drag target, not a control: its name lives in the row's title. */}
                <Handle
                  type="source"
                  id={objectHandleId(object.number)}
                  position={Position.Right}
                  data-testid={`port-${device.id}-${object.number}`}
                  style={{ background: family.color, borderColor: "#24272c" }}
                  className="!h-3 !w-3 !border-2"
                />
              </li>
            );
          })}
        </ul>
      )}
    </div>
  );
}

export const DeviceNodeComponent = memo(DeviceNodeView);

/**
 * A check finding on a row or bar: a shape as well as a colour (✖ error,
 * ▲ warning), with the word for screen readers.
 */
export function SeverityMark({ severity }: { severity: CheckSeverity | undefined }) {
  if (severity !== "error" && severity !== "warning") return null;
  return (
    <span className={severity === "error" ? "text-fault-bright" : "text-copper-bright"}>
      <span aria-hidden="true">{severity === "error" ? "✖" : "▲"}</span>
      <span className="sr-only">check {severity}</span>
    </span>
  );
}
