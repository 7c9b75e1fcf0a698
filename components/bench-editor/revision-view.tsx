"use client";

import { useQuery } from "@tanstack/react-query";
import { ReactFlowProvider } from "@xyflow/react";
import { useMemo } from "react";
import type { Bench } from "@/engine";
import { checkBench } from "@/engine";
import { BenchCanvas } from "@/components/canvas/bench-canvas";
import type { FloorPlanNodeData } from "@/components/canvas/bench-graph";
import { Button } from "@/components/ui/button";
import { summarizeChanges } from "./model/summarize-changes";
import { revisionQueryKeys } from "./revision-history";
import { EditorStoreProvider } from "./store/editor-context";

export interface RevisionViewProps {
  readonly benchId: string;
  readonly number: number;
  readonly loadRevision: (number: number) => Promise<Bench>;
  /** The bench in the editor now, to say what restoring would change. */
  readonly current: Bench;
  readonly floorPlan: FloorPlanNodeData | null;
  readonly canRestore: boolean;
  readonly restoring: boolean;
  readonly onRestore: (bench: Bench) => void;
  readonly onClose: () => void;
}

/**
 * An earlier revision drawn read-only in its own store, so the bench being
 * edited (with its undo history and unsaved changes) stays as it was.
 */
export function RevisionView({
  benchId,
  number,
  loadRevision,
  current,
  floorPlan,
  canRestore,
  restoring,
  onRestore,
  onClose,
}: RevisionViewProps) {
  const revision = useQuery({
    queryKey: revisionQueryKeys.one(benchId, number),
    queryFn: () => loadRevision(number),
    // A revision never changes once saved.
    staleTime: Infinity,
  });
  const bench = revision.data;
  const findings = useMemo(() => (bench ? checkBench(bench) : []), [bench]);
  const restoreWould = useMemo(
    () => (bench ? summarizeChanges(current, bench) : ""),
    [bench, current],
  );

  return (
    <section aria-label={`Revision ${number}, read only`} className="flex h-full flex-col">
      <div className="flex flex-wrap items-center gap-2 border-b border-copper/40 bg-copper/10 px-4 py-2 text-sm">
        <strong>Revision {number}</strong>
        <span className="text-ink-soft">read only</span>
        {bench ? (
          <span className="text-xs text-ink-soft">
            {bench.devices.length} devices · {bench.groupAddresses.length} addresses
            {restoreWould ? ` · restoring it: ${restoreWould}` : " · same as the editor"}
          </span>
        ) : null}
        <div className="ml-auto flex gap-2">
          <Button variant="secondary" onClick={onClose}>
            Back to the editor
          </Button>
          <Button
            onClick={() => bench && onRestore(bench)}
            disabled={!canRestore || !bench || restoring}
            title={canRestore ? undefined : "You may not edit this bench"}
          >
            {restoring ? "Restoring…" : "Restore as new revision"}
          </Button>
        </div>
      </div>
      <div className="min-h-0 flex-1">
        {revision.isPending ? (
          <p className="p-4 text-sm text-ink-soft">Loading revision {number}…</p>
        ) : revision.isError ? (
          <p role="alert" className="p-4 text-sm text-fault">
            Revision {number} could not be opened: {revision.error.message}
          </p>
        ) : (
          <EditorStoreProvider key={number} bench={revision.data}>
            <ReactFlowProvider>
              <BenchCanvas
                readOnly
                label={`Revision ${number} canvas`}
                findings={findings}
                floorPlan={floorPlan}
              />
            </ReactFlowProvider>
          </EditorStoreProvider>
        )}
      </div>
    </section>
  );
}
