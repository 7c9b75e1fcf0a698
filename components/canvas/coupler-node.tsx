"use client";

import type { NodeProps } from "@xyflow/react";
import { memo } from "react";
import { cx } from "@/components/ui/cx";
import type { CouplerNode } from "./bench-graph";
import { SeverityMark } from "./device-node";

const GROUP_WORD: Record<string, string> = {
  filter: "filter",
  forward: "pass all",
  block: "block all",
};

/**
 * A coupler as a badge across the border between its line and the line
 * above: its address, where it leads, and how it passes group telegrams
 * ("filter" with a stored table's size when the table was edited by hand).
 */
function CouplerNodeView({ data, selected }: NodeProps<CouplerNode>) {
  const { device } = data;
  const group = GROUP_WORD[data.groupTelegrams] ?? data.groupTelegrams;
  const table =
    data.groupTelegrams !== "filter"
      ? ""
      : data.storedEntries === undefined
        ? " · table from links"
        : ` · stored table ${data.storedEntries}`;
  return (
    <div
      role="group"
      aria-label={`Coupler ${data.address} ${device.name}${data.upperLine ? `, joins to line ${data.upperLine}` : ""}`}
      data-testid={`coupler-${device.id}`}
      title={`${device.name}: group telegrams ${group}, individual telegrams ${data.individualTelegrams}`}
      className={cx(
        "flex h-[40px] w-[168px] flex-col justify-center rounded-md border-2 bg-graphite px-2 text-graphite-text shadow-lg",
        selected ? "border-copper-bright" : "border-copper/70",
        data.severity === "error" && "ring-2 ring-fault-bright",
      )}
    >
      <div className="flex items-baseline gap-1.5 text-[11px]">
        <span aria-hidden="true" className="text-copper-bright">
          ⇅
        </span>
        <span className="font-mono font-semibold text-copper-bright">{data.address}</span>
        <span className="min-w-0 flex-1 truncate">{device.name}</span>
        <SeverityMark severity={data.severity} />
      </div>
      <div className="truncate text-[10px] text-graphite-muted">
        {data.upperLine ? `to ${data.upperLine} · ` : ""}
        {group}
        {table}
      </div>
    </div>
  );
}

export const CouplerNodeComponent = memo(CouplerNodeView);
