"use client";

import { ReactFlowProvider } from "@xyflow/react";
import { useEffect, useMemo, useState } from "react";
import { BenchCanvas } from "@/components/canvas/bench-canvas";
import { EditorStoreProvider, useEditor } from "@/components/bench-editor/store/editor-context";
import { createEditorStore } from "@/components/bench-editor/store/editor-store";
import { useSimState } from "@/components/sim/sim-context";
import { StatusBadge } from "@/components/ui/status-badge";
import type { Bench } from "@/engine";
import { faultsByDevice } from "./faults-by-device";
import { LocalButtons } from "./local-buttons";

/**
 * The bench canvas beside the log, read only: the bench editor's canvas over
 * the bench the simulation runs (the live session sends it on load and after
 * every parameter change), with devices that have active faults in fault red.
 * Clicking a card shows that device's local buttons.
 */
export function LiveCanvas() {
  const document = useSimState((s) => s.benchDocument);
  // Nothing to draw until the session has loaded a bench (or when it refused it).
  if (document === null) return null;
  return <LiveCanvasFor document={document} />;
}

function LiveCanvasFor({ document }: { document: Bench }) {
  const [store] = useState(() => createEditorStore(document));
  // A parameter change or a reset sends the bench again: follow it without losing the selection.
  useEffect(() => {
    if (store.getState().bench !== document)
      store.setState({ bench: document, savedBench: document, past: [], future: [] });
  }, [store, document]);
  return (
    <EditorStoreProvider store={store}>
      <ReactFlowProvider>
        <LiveCanvasBody />
      </ReactFlowProvider>
    </EditorStoreProvider>
  );
}

function LiveCanvasBody() {
  const bench = useSimState((s) => s.bench);
  const faults = useSimState((s) => s.faults);
  const selected = useEditor((s) => s.selection.devices);
  const byDevice = useMemo(
    () => (bench === null ? new Map<string, string[]>() : faultsByDevice(faults, bench)),
    [faults, bench],
  );
  if (bench === null) return null;
  const device =
    selected.length === 1 ? bench.devices.find((d) => d.id === selected[0]) : undefined;
  const deviceFaults = device === undefined ? [] : (byDevice.get(device.id) ?? []);

  return (
    <div className="space-y-2">
      <div className="h-[30rem] overflow-hidden rounded-md">
        <BenchCanvas readOnly label="Live bench canvas" faults={byDevice} />
      </div>
      <section aria-label="Selected device" className="text-sm">
        {device === undefined ? (
          <p className="text-xs text-ink-soft">
            Click a device card to press its local buttons. Devices with an active fault are ringed
            in red.
          </p>
        ) : (
          <div className="rounded-md border border-paper-line bg-white/60 p-2">
            <LocalButtons device={device} />
            {deviceFaults.length > 0 ? (
              <p className="mt-1 flex flex-wrap gap-1">
                {deviceFaults.map((fault) => (
                  <StatusBadge key={fault} tone="fault">
                    <span aria-hidden="true">⚠&nbsp;</span>
                    {fault}
                  </StatusBadge>
                ))}
              </p>
            ) : null}
          </div>
        )}
      </section>
    </div>
  );
}
