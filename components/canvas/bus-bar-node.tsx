"use client";

import { Handle, Position, type NodeProps } from "@xyflow/react";
import { memo } from "react";
import { cx } from "@/components/ui/cx";
import { groupAddressKey } from "@/components/bench-editor/model/group-address-key";
import type { BusBarNode } from "./bench-graph";
import { SeverityMark } from "./device-node";
import { dptFamily } from "./dpt-family";
import { BUS_HANDLE } from "./node-ids";

/**
 * A group address drawn as a copper bus-bar. The label above it drags the
 * node; the bar itself is the port, so a port dropped anywhere on it connects.
 */
function BusBarNodeView({ data, selected }: NodeProps<BusBarNode>) {
  const { groupAddress } = data;
  const family = dptFamily(groupAddress.dpt);
  return (
    <div className="w-[300px]" data-testid={`bus-bar-${groupAddressKey(groupAddress.address)}`}>
      <div className="flex items-baseline gap-2 px-1 text-[11px] text-graphite-text">
        <span
          className={cx(
            "font-mono font-semibold",
            selected ? "text-copper-bright" : "text-graphite-text",
          )}
        >
          {groupAddress.address}
        </span>
        <span className="min-w-0 flex-1 truncate">{groupAddress.name}</span>
        <span className="font-mono" style={{ color: family.color }}>
          {groupAddress.dpt}
        </span>
        <SeverityMark severity={data.severity} />
      </div>
      <div
        className={cx(
          "relative mt-0.5 h-3 rounded-full bg-gradient-to-b from-copper-bright to-copper-deep shadow",
          selected && "outline-2 outline-offset-2 outline-copper-bright",
        )}
      >
        <Handle
          type="target"
          id={BUS_HANDLE}
          position={Position.Left}
          className="bus-bar-handle"
          style={{
            left: 0,
            top: 0,
            transform: "none",
            width: "100%",
            height: "100%",
            borderRadius: 9999,
            border: "none",
            background: "transparent",
          }}
        />
      </div>
    </div>
  );
}

export const BusBarNodeComponent = memo(BusBarNodeView);
