"use client";

import { useEffect } from "react";
import { ConsoleCharts } from "@/components/charts/console-charts";
import { SimProvider, useSimState, useSimStore } from "@/components/sim/sim-context";
import { Panel } from "@/components/ui/panel";
import { ControlPad } from "./control-pad";
import { FaultsPanel } from "./faults-panel";
import { LiveCanvas } from "./live-canvas";
import { RecordPanel } from "./record-panel";
import { SceneDryRun } from "./scene-dry-run";
import { StateInspector } from "./state-inspector";
import { TelegramLog } from "./telegram-log";
import { TimeControls } from "./time-controls";

/**
 * The live console for one bench revision: the engine runs in a Web Worker
 * (components/sim) and every panel here reads the store it feeds.
 */
export function LiveConsole({
  benchId,
  document,
  seed = 1,
}: {
  benchId: string;
  document: unknown;
  seed?: number;
}) {
  return (
    <SimProvider bench={document} seed={seed}>
      <ConsoleBody benchId={benchId} document={document} />
    </SimProvider>
  );
}

function ConsoleBody({ benchId, document }: { benchId: string; document: unknown }) {
  const status = useSimState((s) => s.status);
  const loadErrors = useSimState((s) => s.loadErrors);
  if (status === "failed") {
    return (
      <Panel title="This bench does not run">
        <ul className="list-disc pl-5 text-sm text-fault">
          {loadErrors.map((error, i) => (
            <li key={i}>
              {error.path ? <span className="font-mono">{error.path}: </span> : null}
              {error.message}
            </li>
          ))}
        </ul>
      </Panel>
    );
  }
  if (status === "idle") return <p className="text-sm text-ink-soft">Starting the simulation…</p>;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <TimeControls />
        <RecordPanel benchId={benchId} />
      </div>
      <ErrorLine />
      <div className="grid gap-4 xl:grid-cols-[22rem_minmax(0,1fr)_24rem]">
        <div className="space-y-4">
          <Panel title="Control pad">
            <ControlPad />
          </Panel>
          <Panel title="Faults">
            <FaultsPanel />
          </Panel>
          <Panel title="Scene dry-run">
            <SceneDryRun />
          </Panel>
        </div>
        <div className="min-w-0 space-y-4">
          {/* Stacked, not side by side: both need the column's width to be readable. */}
          <Panel title="Bench">
            <LiveCanvas key={benchId} document={document} />
          </Panel>
          <Panel title="Telegram log">
            <TelegramLog />
          </Panel>
          <Panel title="Charts">
            <ConsoleCharts />
          </Panel>
        </div>
        <Panel title="State inspector">
          <StateInspector />
        </Panel>
      </div>
    </div>
  );
}

/** The latest refused command, with the field at fault; it fades after a while. */
function ErrorLine() {
  const error = useSimState((s) => s.lastError);
  const store = useSimStore();
  useEffect(() => {
    if (error === null) return;
    const timer = setTimeout(() => store.getState().clearError(), 8000);
    return () => clearTimeout(timer);
  }, [error, store]);
  if (error === null) return null;
  return (
    <p role="alert" className="rounded-md bg-fault-soft px-3 py-2 text-sm text-fault">
      {error.command}: {error.message}
      {error.field ? <span className="ml-1 font-mono text-xs">({error.field})</span> : null}
    </p>
  );
}
