"use client";

import type { NodeProps } from "@xyflow/react";
import { memo } from "react";
import type { LineRegionNode } from "./bench-graph";

const KIND_LABEL = { line: "line", main: "main line", backbone: "backbone" } as const;

/**
 * One line of the topology drawn as a region around its devices' cards,
 * titled with the line's address, name and device count (and expected load
 * when known). Not selectable or draggable: it follows its cards.
 */
function LineRegionNodeView({ data }: NodeProps<LineRegionNode>) {
  const title = `${KIND_LABEL[data.kind]} ${data.address} ${data.name}: ${data.deviceCount} devices${
    data.expectedLoadPercent === undefined
      ? ""
      : `, expected load ${data.expectedLoadPercent.toFixed(1)} %`
  }`;
  return (
    <section
      aria-label={`Line ${data.address} ${data.name}`}
      data-testid={`line-region-${data.address}`}
      title={title}
      className={
        data.kind === "line"
          ? "rounded-xl border border-graphite-line bg-graphite-raised/25"
          : "rounded-xl border-2 border-copper/60 bg-graphite-raised/35"
      }
      style={{ width: data.width, height: data.height }}
    >
      <div className="flex items-baseline gap-1.5 px-3 pt-2 text-xs text-graphite-muted">
        <span className="font-mono font-semibold text-copper-bright">{data.address}</span>
        <span className="min-w-0 truncate text-graphite-text" style={{ maxWidth: 96 }}>
          {data.name}
        </span>
      </div>
      <div className="px-3 text-[10px] text-graphite-muted">
        {data.deviceCount} dev
        {data.expectedLoadPercent === undefined
          ? ""
          : ` · ${data.expectedLoadPercent.toFixed(1)} %`}
      </div>
    </section>
  );
}

export const LineRegionNodeComponent = memo(LineRegionNodeView);
