"use client";

import type { NodeProps } from "@xyflow/react";
import { memo } from "react";
import type { AddressGroupNode } from "./bench-graph";

/**
 * The frame around one main/middle group's bus-bars, titled with the group,
 * so a run of addresses reads as the block it is on the plan. Not selectable
 * or draggable: it follows its bars.
 */
function AddressGroupNodeView({ data }: NodeProps<AddressGroupNode>) {
  return (
    <div
      className="rounded-lg border border-dashed border-graphite-line bg-graphite-raised/40"
      style={{ width: data.width, height: data.height }}
    >
      <div className="flex items-baseline gap-2 px-3 pt-1.5 text-xs text-graphite-muted">
        {data.range === "" ? null : (
          <span className="font-mono font-semibold text-graphite-text">{data.range}</span>
        )}
        <span>{data.label}</span>
      </div>
    </div>
  );
}

export const AddressGroupNodeComponent = memo(AddressGroupNodeView);
