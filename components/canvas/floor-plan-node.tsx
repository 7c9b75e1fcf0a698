"use client";

import type { NodeProps } from "@xyflow/react";
import { memo } from "react";
import type { FloorPlanNode } from "./bench-graph";

/** The uploaded floor plan, drawn under everything else and moving with the canvas. */
function FloorPlanNodeView({ data }: NodeProps<FloorPlanNode>) {
  return (
    // eslint-disable-next-line @next/next/no-img-element -- a user upload at its own size; next/image adds nothing here
    <img
      src={data.url}
      alt="Floor plan"
      width={data.width}
      height={data.height}
      draggable={false}
      className="pointer-events-none opacity-40 select-none"
      style={{ width: data.width, height: data.height, maxWidth: "none" }}
    />
  );
}

export const FloorPlanNodeComponent = memo(FloorPlanNodeView);
