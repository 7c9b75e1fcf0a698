"use client";

import { useEffect, useMemo } from "react";
import { ConsoleCharts } from "@/components/charts/console-charts";
import type { LiveSessionView } from "@/app/_lib/live/live-session-view";
import { EndpointPanel } from "@/components/live-session/endpoint-panel";
import { SessionBar } from "@/components/live-session/session-bar";
import {
  ServerSimProvider,
  SimProvider,
  useLiveLink,
  useLiveLinkState,
  useSimState,
  useSimStore,
} from "@/components/sim/sim-context";
import { Panel } from "@/components/ui/panel";
import { COUPLER_TYPE_ID } from "@/engine";
import { LAYOUT_BOUNDS } from "./console-layout";
import { ControlPad } from "./control-pad";
import { CouplersPanel } from "./couplers-panel";
import { DockPanel } from "./dock-panel";
import { FaultsPanel } from "./faults-panel";
import { lineLabels } from "./line-labels";
import { LiveCanvas } from "./live-canvas";
import { RecordPanel } from "./record-panel";
import { ResizeHandle } from "./resize-handle";
import { SceneDryRun } from "./scene-dry-run";
import { StateInspector } from "./state-inspector";
import { TelegramLog } from "./telegram-log";
import { TimeControls } from "./time-controls";
import { useConsoleLayout } from "./use-console-layout";

/**
 * The live console for one bench revision: the engine runs in a Web Worker
 * (components/sim) and every panel here reads the store it feeds. `memberId`
 * keys the remembered layout, so each member gets back their own.
 */
export function LiveConsole({
  benchId,
  document,
  memberId,
  seed = 1,
}: {
  benchId: string;
  document: unknown;
  memberId?: string;
  seed?: number;
}) {
  return (
    <SimProvider bench={document} seed={seed}>
      <ConsoleBody benchId={benchId} document={document} memberId={memberId} />
    </SimProvider>
  );
}

/**
 * The live console attached to a session hosted by the server: the same
 * panels, fed by the session's event stream, with the session's line on top
 * and its KNXnet/IP endpoint in the dock instead of the scene dry-run (which
 * runs ahead of real time). What the member may do there (`canControl`) is in
 * the session view, decided by the server for this member.
 */
export function ServerLiveConsole({
  session,
  memberId,
}: {
  session: LiveSessionView;
  memberId: string;
}) {
  return (
    <ServerSimProvider session={session}>
      <div className="space-y-3">
        <SessionBar viewerId={memberId} />
        <ConsoleBody benchId={session.benchId} document={null} memberId={memberId} />
      </div>
    </ServerSimProvider>
  );
}

function ConsoleBody({
  benchId,
  document,
  memberId,
}: {
  benchId: string;
  document: unknown;
  memberId?: string;
}) {
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
  if (status === "idle") return <Starting />;
  return <ConsoleWorkbench benchId={benchId} document={document} memberId={memberId} />;
}

/**
 * The log is the wide main area, full width under the time controls so every
 * column fits; the other panels sit in a dock below it: control pad, faults
 * and scene dry-run on the left, the canvas and charts in the middle, the
 * inspector on the right on wide screens (under the canvas on narrower ones,
 * one column on a tablet). The log's height and the side columns' widths
 * resize with the handles between them; every dock panel folds.
 */
function ConsoleWorkbench({
  benchId,
  document,
  memberId,
}: {
  benchId: string;
  document: unknown;
  memberId?: string;
}) {
  const { layout, resize, toggle } = useConsoleLayout(memberId);
  // A server session's document arrives on the stream; a browser run's is the page's.
  const simulated = useSimState((s) => s.benchDocument);
  const lines = useMemo(() => lineLabels(document ?? simulated), [document, simulated]);
  const onServer = useLiveLink() !== null;
  const hasCouplers = useSimState(
    (s) => s.bench?.devices.some((d) => d.type === COUPLER_TYPE_ID) ?? false,
  );
  const collapsed = layout.collapsed;
  const columns = {
    "--console-left": `${layout.leftWidthPx}px`,
    "--console-right": `${layout.rightWidthPx}px`,
  } as React.CSSProperties;

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <TimeControls />
        <OwnerControls>
          <RecordPanel benchId={benchId} />
        </OwnerControls>
      </div>
      <ErrorLine />
      <div>
        <Panel title="Telegram log" className="p-3 md:p-4">
          <TelegramLog heightPx={layout.logHeightPx} />
        </Panel>
        <ResizeHandle
          label="Height of the telegram log"
          orientation="horizontal"
          valuePx={layout.logHeightPx}
          minPx={LAYOUT_BOUNDS.logHeightPx.min}
          maxPx={LAYOUT_BOUNDS.logHeightPx.max}
          onResize={(px) => resize("logHeightPx", px)}
          className="w-full"
        />
      </div>
      <div
        style={columns}
        className="grid items-start gap-y-4 xl:grid-cols-[var(--console-left)_0.75rem_minmax(0,1fr)] 2xl:grid-cols-[var(--console-left)_0.75rem_minmax(0,1fr)_0.75rem_var(--console-right)]"
      >
        <div className="min-w-0 space-y-4 xl:col-start-1 xl:row-span-2 xl:row-start-1">
          <DockPanel
            title="Control pad"
            collapsed={collapsed["control-pad"] === true}
            onToggle={() => toggle("control-pad")}
          >
            <OwnerControls>
              <ControlPad />
            </OwnerControls>
          </DockPanel>
          <DockPanel
            title="Faults"
            collapsed={collapsed.faults === true}
            onToggle={() => toggle("faults")}
          >
            <OwnerControls>
              <FaultsPanel />
            </OwnerControls>
          </DockPanel>
          {onServer ? (
            <DockPanel
              title="KNXnet/IP endpoint"
              collapsed={collapsed.endpoint === true}
              onToggle={() => toggle("endpoint")}
            >
              <EndpointPanel />
            </DockPanel>
          ) : (
            <DockPanel
              title="Scene dry-run"
              collapsed={collapsed["scene-dry-run"] === true}
              onToggle={() => toggle("scene-dry-run")}
            >
              <SceneDryRun />
            </DockPanel>
          )}
        </div>
        <ResizeHandle
          label="Width of the control pad column"
          orientation="vertical"
          valuePx={layout.leftWidthPx}
          minPx={LAYOUT_BOUNDS.leftWidthPx.min}
          maxPx={LAYOUT_BOUNDS.leftWidthPx.max}
          onResize={(px) => resize("leftWidthPx", px)}
          className="hidden self-stretch xl:col-start-2 xl:row-span-2 xl:row-start-1 xl:flex"
        />
        <div className="min-w-0 space-y-4 xl:col-start-3 xl:row-start-1">
          <DockPanel
            title="Bench"
            collapsed={collapsed.bench === true}
            onToggle={() => toggle("bench")}
          >
            <LiveCanvas key={benchId} />
          </DockPanel>
          {hasCouplers ? (
            <DockPanel
              title="Couplers"
              collapsed={collapsed.couplers === true}
              onToggle={() => toggle("couplers")}
            >
              <CouplersPanel />
            </DockPanel>
          ) : null}
          <DockPanel
            title="Charts"
            collapsed={collapsed.charts === true}
            onToggle={() => toggle("charts")}
          >
            <ConsoleCharts lineLabels={lines} />
          </DockPanel>
        </div>
        <ResizeHandle
          label="Width of the state inspector column"
          orientation="vertical"
          direction={-1}
          valuePx={layout.rightWidthPx}
          minPx={LAYOUT_BOUNDS.rightWidthPx.min}
          maxPx={LAYOUT_BOUNDS.rightWidthPx.max}
          onResize={(px) => resize("rightWidthPx", px)}
          className="hidden self-stretch 2xl:col-start-4 2xl:row-span-2 2xl:row-start-1 2xl:flex"
        />
        <div className="min-w-0 xl:col-start-3 xl:row-start-2 2xl:col-start-5 2xl:row-span-2 2xl:row-start-1">
          <DockPanel
            title="State inspector"
            collapsed={collapsed.inspector === true}
            onToggle={() => toggle("inspector")}
          >
            <StateInspector />
          </DockPanel>
        </div>
      </div>
    </div>
  );
}

/**
 * Controls that send commands, disabled (a native disabled fieldset) for a
 * member who watches someone else's server session: the API would refuse
 * them anyway, and a pad that only ever fails says less than a greyed one.
 */
function OwnerControls({ children }: { children: React.ReactNode }) {
  const link = useLiveLink();
  if (link === null || link.canControl) return children;
  return (
    <fieldset disabled className="contents" title="Only the session's owner sends commands">
      {children}
    </fieldset>
  );
}

/** Before the first state arrives; a server session that ended before that says so above. */
function Starting() {
  const onServer = useLiveLink() !== null;
  const ended = useLiveLinkState((s) => s.status === "ended", false);
  if (ended) return null;
  return (
    <p className="text-sm text-ink-soft">
      {onServer ? "Attaching to the session on the server…" : "Starting the simulation…"}
    </p>
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
