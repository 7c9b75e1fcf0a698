"use client";

import { BaseEdge, getSmoothStepPath, type EdgeProps } from "@xyflow/react";
import { memo } from "react";
import type { LinkEdge, UnitLinkEdge } from "./bench-graph";

/** A wire away from the selection stays findable but no longer competes with the cards. */
const DIMMED_OPACITY = 0.12;

type EdgeEnds = Pick<
  EdgeProps,
  "sourceX" | "sourceY" | "targetX" | "targetY" | "sourcePosition" | "targetPosition"
>;

/** Where an edge starts and ends, picked from its props for xyflow's path functions. */
function edgeEnds({
  sourceX,
  sourceY,
  targetX,
  targetY,
  sourcePosition,
  targetPosition,
}: EdgeEnds): EdgeEnds {
  return { sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition };
}

/**
 * A link from an object's port to a bus-bar, in right angles: out of the port,
 * down its own channel (the x the layout routed it on, so wires in the gap sit
 * side by side rather than on top of each other), into the bar. The object's
 * sending link is a solid copper wire with an arrow into the bar; the
 * addresses it only listens to are dashed.
 */
function LinkEdgeView(props: EdgeProps<LinkEdge>) {
  const { id, data, selected } = props;
  const channelX = data?.channelX;
  const [path] = getSmoothStepPath({
    ...edgeEnds(props),
    borderRadius: 6,
    // Only while the channel still lies between the ends (nobody dragged a card past its bars).
    ...(channelX !== undefined && channelX > props.sourceX && channelX < props.targetX
      ? { centerX: channelX }
      : {}),
  });
  const sending = data?.sending ?? false;
  const dimmed = data?.dimmed === true && !selected;
  return (
    <BaseEdge
      id={id}
      path={path}
      markerEnd={sending && !dimmed ? "url(#benchline-sending)" : undefined}
      style={{
        stroke: selected ? "#f0b078" : sending ? "#d98b4e" : "#a3a7ae",
        strokeWidth: selected ? 3 : sending ? 2 : 1.5,
        strokeDasharray: sending ? undefined : "5 4",
        opacity: dimmed ? DIMMED_OPACITY : 1,
      }}
    />
  );
}

/** The HVAC wiring between a gateway, its indoor unit and wall controllers: a grey double-dotted cable. */
function UnitLinkEdgeView(props: EdgeProps<UnitLinkEdge>) {
  const [path] = getSmoothStepPath({ ...edgeEnds(props), offset: 28 });
  return (
    <BaseEdge
      id={props.id}
      path={path}
      style={{
        stroke: "#e7e3da",
        strokeWidth: 2.5,
        strokeDasharray: "1 5",
        strokeLinecap: "round",
        opacity: props.data?.dimmed === true ? DIMMED_OPACITY : 1,
      }}
    />
  );
}

export const LinkEdgeComponent = memo(LinkEdgeView);
export const UnitLinkEdgeComponent = memo(UnitLinkEdgeView);

/** Arrow marker for sending links; rendered once inside the canvas. */
export function EdgeMarkers() {
  return (
    <svg width="0" height="0" aria-hidden="true" style={{ position: "absolute" }}>
      <defs>
        <marker
          id="benchline-sending"
          viewBox="0 0 10 10"
          refX="8"
          refY="5"
          markerWidth="7"
          markerHeight="7"
          orient="auto-start-reverse"
        >
          <path d="M 0 0 L 10 5 L 0 10 z" fill="#d98b4e" />
        </marker>
      </defs>
    </svg>
  );
}
