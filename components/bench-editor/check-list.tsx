"use client";

import type { CheckFinding } from "@/engine";
import { StatusBadge } from "@/components/ui/status-badge";
import { useEditorStoreApi } from "./store/editor-context";

/** Where a finding points on the canvas, if anywhere. */
function findingNode(finding: CheckFinding) {
  const { device, groupAddress, object } = finding.location;
  if (device !== undefined) return { node: { kind: "device" as const, id: device }, object };
  if (groupAddress !== undefined)
    return { node: { kind: "group-address" as const, address: groupAddress }, object: undefined };
  return undefined;
}

/** The bench checks' findings; clicking one selects and centres the device or bus-bar at fault. */
export function CheckList({ findings }: { findings: readonly CheckFinding[] }) {
  const store = useEditorStoreApi();
  if (findings.length === 0) {
    return (
      <p className="text-sm">
        <StatusBadge tone="healthy">no findings</StatusBadge> The bench passes every check.
      </p>
    );
  }
  return (
    <ul className="flex flex-col gap-1" aria-label="Bench check findings">
      {findings.map((finding, index) => {
        const target = findingNode(finding);
        return (
          <li key={`${finding.rule}-${index}`}>
            <button
              type="button"
              disabled={target === undefined}
              onClick={() => target && store.getState().revealNode(target.node, target.object)}
              className="flex w-full flex-col gap-0.5 rounded border border-paper-line bg-paper px-2 py-1.5 text-left text-xs hover:border-copper disabled:cursor-default"
            >
              <span className="flex items-center gap-2">
                <StatusBadge
                  tone={
                    finding.severity === "error"
                      ? "fault"
                      : finding.severity === "warning"
                        ? "accent"
                        : "neutral"
                  }
                >
                  {finding.severity}
                </StatusBadge>
                <span className="font-mono text-ink-soft">{finding.rule}</span>
              </span>
              <span>{finding.message}</span>
            </button>
          </li>
        );
      })}
    </ul>
  );
}
