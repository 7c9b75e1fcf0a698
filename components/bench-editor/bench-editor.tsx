"use client";

import { useQueryClient } from "@tanstack/react-query";
import { ReactFlowProvider } from "@xyflow/react";
import { useEffect, useMemo, useRef, useState } from "react";
import { useStore } from "zustand";
import type { Bench } from "@/engine";
import { benchTopology, checkBench, loadBench } from "@/engine";
import { BenchCanvas } from "@/components/canvas/bench-canvas";
import type { FloorPlanNodeData } from "@/components/canvas/bench-graph";
import { dptFamilies } from "@/components/canvas/dpt-family";
import { Button } from "@/components/ui/button";
import { Mono } from "@/components/ui/mono";
import { AddressTable } from "./address-table";
import { CheckList } from "./check-list";
import { CouplerPanel } from "./coupler-panel";
import { isCouplerDevice } from "./model/topology";
import { TopologyPanel } from "./topology-panel";
import { DeviceShelf } from "./device-shelf";
import { checkImportText, type ImportCheck, type ImportIssue } from "./import-file";
import { renameDevice, setDeviceRoom, setIndividualAddress } from "./model/devices";
import { summarizeChanges } from "./model/summarize-changes";
import { ObjectList } from "./object-list";
import { ParameterPanel } from "./parameter-panel";
import { RevisionHistory, revisionQueryKeys, type RevisionEntry } from "./revision-history";
import { RevisionView } from "./revision-view";
import { RoomsPanel } from "./rooms-panel";
import { EditorStoreProvider, useEditor, useEditorStoreApi } from "./store/editor-context";
import { createEditorStore } from "./store/editor-store";

/** What the page does for the editor: the server calls, so the editor stays free of fetching. */
export interface BenchEditorActions {
  /** Saves a new revision; resolves to its number, rejects with a readable message. */
  save(bench: Bench, summary: string): Promise<{ revision: number }>;
  /** Sends a checked import to the server (a bench becomes a revision, a scenario is stored on this bench). */
  importDocument(
    check: Extract<ImportCheck, { ok: true }>,
    fileName: string,
  ): Promise<{ message: string; issues?: readonly ImportIssue[] }>;
  /** Uploads a floor-plan image; resolves to the URL to draw. */
  uploadFloorPlan(file: File): Promise<string>;
  /** The bench's saved revisions, newest first. */
  listRevisions(): Promise<readonly RevisionEntry[]>;
  /** One saved revision's bench; rejects with a readable message. */
  loadRevision(number: number): Promise<Bench>;
}

/** Where the editor links to; null when the member may not open the page. */
export interface BenchEditorLinks {
  /** This bench running in the live console. */
  readonly live: string | null;
  /** The scenarios written against this bench. */
  readonly scenarios: string | null;
}

export interface BenchEditorProps {
  /** The stored bench's id (query keys for its history). */
  readonly benchId: string;
  readonly bench: Bench;
  readonly revision: {
    readonly number: number;
    readonly summary: string;
    readonly createdAt: string;
  } | null;
  readonly canEdit: boolean;
  readonly floorPlanUrl: string | null;
  readonly actions: BenchEditorActions;
  readonly links: BenchEditorLinks;
}

type SideTab = "selection" | "topology" | "addresses" | "rooms" | "checks" | "history";

/** Floor plans are drawn at their natural size, or this when an SVG has none. */
const DEFAULT_PLAN_SIZE = { width: 1600, height: 1000 };

/**
 * The bench editor: device shelf on the left, the wiring canvas in the middle,
 * and the selection (parameters, objects), the address table and the bench
 * checks on the right. The bench lives in one zustand store with undo/redo.
 */
export function BenchEditor(props: BenchEditorProps) {
  const [store] = useState(() => createEditorStore(props.bench));
  return (
    <EditorStoreProvider store={store}>
      <ReactFlowProvider>
        <EditorLayout {...props} />
      </ReactFlowProvider>
    </EditorStoreProvider>
  );
}

function useFloorPlan(url: string | null): FloorPlanNodeData | null {
  const [plan, setPlan] = useState<FloorPlanNodeData | null>(null);
  useEffect(() => {
    if (url === null) return;
    const image = new Image();
    image.onload = () =>
      setPlan({
        url,
        width: image.naturalWidth || DEFAULT_PLAN_SIZE.width,
        height: image.naturalHeight || DEFAULT_PLAN_SIZE.height,
      });
    image.onerror = () => setPlan(null);
    image.src = url;
  }, [url]);
  return url === null ? null : plan;
}

function EditorLayout({
  benchId,
  revision: initialRevision,
  canEdit,
  floorPlanUrl: initialPlanUrl,
  actions,
  links,
}: BenchEditorProps) {
  const storeApi = useEditorStoreApi();
  const queryClient = useQueryClient();
  const bench = useEditor((s) => s.bench);
  const savedBench = useEditor((s) => s.savedBench);
  const selection = useEditor((s) => s.selection);
  const canUndo = useStore(storeApi, (s) => s.past.length > 0);
  const canRedo = useStore(storeApi, (s) => s.future.length > 0);
  const [tab, setTab] = useState<SideTab>("selection");
  const [revision, setRevision] = useState(initialRevision);
  const [saving, setSaving] = useState(false);
  const [saveError, setSaveError] = useState<string | null>(null);
  const [importState, setImportState] = useState<{
    message: string;
    issues: readonly ImportIssue[];
    failed: boolean;
  } | null>(null);
  const [planUrl, setPlanUrl] = useState(initialPlanUrl);
  const [planError, setPlanError] = useState<string | null>(null);
  // An earlier revision on view (read only) instead of the editing canvas.
  const [viewing, setViewing] = useState<number | null>(null);
  const [restoring, setRestoring] = useState(false);
  const importInput = useRef<HTMLInputElement>(null);
  const planInput = useRef<HTMLInputElement>(null);
  const floorPlan = useFloorPlan(planUrl);
  const findings = useMemo(() => checkBench(bench), [bench]);
  const topology = useMemo(() => {
    const loaded = loadBench(bench);
    return loaded.ok ? benchTopology(loaded.value) : null;
  }, [bench]);
  const lineLoads = useMemo(
    () =>
      new Map(
        (topology?.areas ?? []).flatMap((a) =>
          a.lines.map((l) => [l.id, l.expectedLoadPercent] as const),
        ),
      ),
    [topology],
  );
  const dirty = bench !== savedBench;
  const summary = useMemo(
    () => (dirty ? summarizeChanges(savedBench, bench) : ""),
    [dirty, savedBench, bench],
  );
  const selectedDevice =
    selection.devices.length === 1
      ? bench.devices.find((d) => d.id === selection.devices[0])
      : undefined;
  const errors = findings.filter((f) => f.severity === "error").length;

  // Leaving with unsaved edits asks first.
  useEffect(() => {
    if (!dirty) return;
    const warn = (event: BeforeUnloadEvent) => event.preventDefault();
    window.addEventListener("beforeunload", warn);
    return () => window.removeEventListener("beforeunload", warn);
  }, [dirty]);

  const save = async () => {
    setSaving(true);
    setSaveError(null);
    try {
      const saved = await actions.save(bench, summary);
      storeApi.getState().markSaved(bench);
      setRevision({ number: saved.revision, summary, createdAt: new Date().toISOString() });
      void queryClient.invalidateQueries({ queryKey: revisionQueryKeys.list(benchId) });
      storeApi
        .getState()
        .notify({ tone: "info", text: `Saved revision ${saved.revision}: ${summary}` });
    } catch (error) {
      setSaveError(error instanceof Error ? error.message : "the bench could not be saved");
    } finally {
      setSaving(false);
    }
  };

  // Restoring saves the old document as a new revision; the history itself is never rewritten.
  const restore = async (number: number, restored: Bench) => {
    if (
      dirty &&
      !window.confirm(
        `Restoring revision ${number} replaces the bench in the editor. Discard your unsaved changes?`,
      )
    )
      return;
    const restoreSummary = `Restored revision ${number}`;
    setRestoring(true);
    setSaveError(null);
    try {
      const saved = await actions.save(restored, restoreSummary);
      storeApi.getState().replaceBench(restored, restoreSummary);
      storeApi.getState().markSaved(restored);
      setRevision({
        number: saved.revision,
        summary: restoreSummary,
        createdAt: new Date().toISOString(),
      });
      setViewing(null);
      void queryClient.invalidateQueries({ queryKey: revisionQueryKeys.list(benchId) });
      storeApi.getState().notify({
        tone: "info",
        text: `Saved revision ${saved.revision}: ${restoreSummary}`,
      });
    } catch (error) {
      setSaveError(error instanceof Error ? error.message : "the revision could not be restored");
    } finally {
      setRestoring(false);
    }
  };

  const exportBench = () => {
    const blob = new Blob([`${JSON.stringify(bench, null, 2)}\n`], { type: "application/json" });
    const url = URL.createObjectURL(blob);
    const link = document.createElement("a");
    link.href = url;
    link.download = `${bench.name.replace(/[^\w.-]+/g, "-").toLowerCase() || "bench"}.bench.json`;
    document.body.append(link);
    link.click();
    link.remove();
    URL.revokeObjectURL(url);
  };

  const importFile = async (file: File) => {
    const check = checkImportText(await file.text(), file.size);
    if (!check.ok) {
      setImportState({
        message: `${file.name} was not imported; nothing was saved.`,
        issues: check.issues,
        failed: true,
      });
      return;
    }
    if (
      check.kind === "bench" &&
      dirty &&
      !window.confirm(
        "Importing replaces the bench and saves it as a new revision. Discard your unsaved changes?",
      )
    )
      return;
    try {
      const outcome = await actions.importDocument(check, file.name);
      if (check.kind === "bench") {
        storeApi.getState().replaceBench(check.bench, `Imported ${file.name}`);
        storeApi.getState().markSaved(check.bench);
      }
      setImportState({ message: outcome.message, issues: [], failed: false });
    } catch (error) {
      setImportState({
        message: `${file.name} was not imported; nothing was saved.`,
        issues: [{ path: "(server)", message: error instanceof Error ? error.message : "refused" }],
        failed: true,
      });
    }
  };

  const uploadPlan = async (file: File) => {
    setPlanError(null);
    try {
      setPlanUrl(await actions.uploadFloorPlan(file));
    } catch (error) {
      setPlanError(error instanceof Error ? error.message : "the floor plan could not be uploaded");
    }
  };

  return (
    <div className="flex h-[calc(100vh-0px)] min-h-[640px] flex-col">
      <div className="flex flex-wrap items-center gap-2 border-b border-paper-line bg-paper px-4 py-2">
        <h1 className="mr-2 text-lg font-semibold tracking-tight">{bench.name}</h1>
        <span className="text-xs text-ink-soft" data-testid="revision-label">
          {revision ? `revision ${revision.number}` : "not saved yet"}
          {dirty ? " · unsaved changes" : ""}
        </span>
        <span className="text-xs text-ink-soft">
          {bench.devices.length} devices · {bench.groupAddresses.length} addresses · {errors} check
          errors
        </span>
        <div className="ml-auto flex flex-wrap items-center gap-2">
          {/* Plain links on purpose: a full navigation lets the unsaved-changes prompt speak. */}
          {links.live ? (
            <a
              href={links.live}
              className="rounded-md px-2 py-1 text-sm text-copper-deep underline"
              title="Opens the live console on the last saved revision"
            >
              Run live
            </a>
          ) : null}
          {links.scenarios ? (
            <a
              href={links.scenarios}
              className="rounded-md px-2 py-1 text-sm text-copper-deep underline"
              title="Scenarios are listed by bench"
            >
              Bench scenarios
            </a>
          ) : null}
          <Button
            variant="secondary"
            onClick={() => storeApi.getState().undo()}
            disabled={!canUndo}
            title="Undo (Ctrl+Z)"
          >
            Undo
          </Button>
          <Button
            variant="secondary"
            onClick={() => storeApi.getState().redo()}
            disabled={!canRedo}
            title="Redo (Ctrl+Shift+Z)"
          >
            Redo
          </Button>
          <Button
            variant="secondary"
            onClick={() => importInput.current?.click()}
            disabled={!canEdit}
          >
            Import
          </Button>
          <Button variant="secondary" onClick={exportBench}>
            Export
          </Button>
          <Button
            variant="secondary"
            onClick={() => planInput.current?.click()}
            disabled={!canEdit}
          >
            Floor plan
          </Button>
          <Button
            onClick={() => void save()}
            disabled={!canEdit || !dirty || saving}
            title={summary}
          >
            {saving ? "Saving…" : "Save"}
          </Button>
          <input
            ref={importInput}
            type="file"
            accept=".json,application/json"
            className="hidden"
            aria-label="Import a bench or scenario file"
            data-testid="import-input"
            onChange={(e) => {
              const file = e.target.files?.[0];
              e.target.value = "";
              if (file) void importFile(file);
            }}
          />
          <input
            ref={planInput}
            type="file"
            accept="image/png,image/jpeg,image/svg+xml"
            className="hidden"
            aria-label="Upload a floor plan"
            data-testid="floor-plan-input"
            onChange={(e) => {
              const file = e.target.files?.[0];
              e.target.value = "";
              if (file) void uploadPlan(file);
            }}
          />
        </div>
      </div>
      {saveError || planError ? (
        <p
          role="alert"
          className="border-b border-fault/30 bg-fault-soft px-4 py-1.5 text-sm text-fault"
        >
          {saveError ?? planError}
        </p>
      ) : null}
      {importState ? (
        <div
          role={importState.failed ? "alert" : "status"}
          aria-label="Import result"
          className={`border-b px-4 py-2 text-sm ${importState.failed ? "border-fault/30 bg-fault-soft text-fault" : "border-paper-line bg-paper-deep"}`}
        >
          <div className="flex justify-between gap-2">
            <span>{importState.message}</span>
            <button
              type="button"
              onClick={() => setImportState(null)}
              aria-label="Dismiss import result"
            >
              ×
            </button>
          </div>
          {importState.issues.length > 0 ? (
            <ul className="mt-1 max-h-32 overflow-auto">
              {importState.issues.slice(0, 20).map((issue, i) => (
                <li key={i}>
                  <Mono>{issue.path}</Mono>: {issue.message}
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
      <div className="flex min-h-0 flex-1">
        <aside className="w-56 shrink-0 overflow-y-auto border-r border-paper-line bg-paper p-3">
          <h2 className="mb-2 text-sm font-semibold">Device shelf</h2>
          {canEdit ? (
            <DeviceShelf bench={bench} />
          ) : (
            <p className="text-xs text-ink-soft">Read only.</p>
          )}
          <h2 className="mt-4 mb-1 text-sm font-semibold">Port colours</h2>
          <ul className="flex flex-col gap-0.5 text-[11px]">
            {dptFamilies.map((f) => (
              <li key={f.key} className="flex items-center gap-2">
                <span
                  className="inline-block size-2.5 rounded-full"
                  style={{ background: f.color }}
                  aria-hidden="true"
                />
                {f.label}
              </li>
            ))}
          </ul>
          {canEdit ? (
            <p className="mt-4 text-[11px] leading-snug text-ink-soft">
              Drag a port onto a bus-bar to link it; an object&apos;s first link is its sending
              address (solid wire). Del deletes, Ctrl+C / Ctrl+V copy devices, F fits the view, /
              searches.
            </p>
          ) : (
            <p className="mt-4 text-[11px] leading-snug text-ink-soft">
              Your role may look at this bench but not change it. An object&apos;s first link is its
              sending address (solid wire). F fits the view, / searches.
            </p>
          )}
        </aside>
        <div className="min-w-0 flex-1">
          {viewing !== null ? (
            <RevisionView
              key={viewing}
              benchId={benchId}
              number={viewing}
              loadRevision={actions.loadRevision}
              current={bench}
              floorPlan={floorPlan}
              canRestore={canEdit}
              restoring={restoring}
              onRestore={(restored) => void restore(viewing, restored)}
              onClose={() => setViewing(null)}
            />
          ) : (
            <BenchCanvas
              findings={findings}
              floorPlan={floorPlan}
              readOnly={!canEdit}
              lineLoads={lineLoads}
            />
          )}
        </div>
        <aside className="flex w-[26rem] shrink-0 flex-col border-l border-paper-line bg-paper">
          <div
            role="tablist"
            aria-label="Editor panels"
            className="flex border-b border-paper-line text-sm"
          >
            {(
              [
                ["selection", "Selection"],
                ["topology", `Topology (${bench.lines.length})`],
                ["addresses", `Addresses (${bench.groupAddresses.length})`],
                ["rooms", `Rooms (${bench.rooms?.length ?? 0})`],
                ["checks", `Checks (${findings.length})`],
                ["history", "History"],
              ] as const
            ).map(([key, label]) => (
              <button
                key={key}
                role="tab"
                type="button"
                aria-selected={tab === key}
                onClick={() => {
                  setTab(key);
                  // The other panels speak of the bench in the editor, so its canvas comes back.
                  if (key !== "history") setViewing(null);
                }}
                className={`flex-1 px-2 py-2 ${tab === key ? "border-b-2 border-copper font-semibold" : "text-ink-soft"}`}
              >
                {label}
              </button>
            ))}
          </div>
          <div className="min-h-0 flex-1 overflow-y-auto p-3">
            {tab === "selection" ? (
              selectedDevice ? (
                <DevicePanel
                  key={selectedDevice.id}
                  deviceId={selectedDevice.id}
                  readOnly={!canEdit}
                />
              ) : (
                <p className="text-sm text-ink-soft">
                  Select a device on the canvas to {canEdit ? "edit" : "see"} its parameters and
                  group objects.
                </p>
              )
            ) : tab === "topology" ? (
              <TopologyPanel
                bench={bench}
                topology={topology}
                readOnly={!canEdit}
                onOpenCoupler={() => setTab("selection")}
              />
            ) : tab === "addresses" ? (
              <AddressTable bench={bench} findings={findings} readOnly={!canEdit} />
            ) : tab === "rooms" ? (
              <RoomsPanel bench={bench} readOnly={!canEdit} />
            ) : tab === "checks" ? (
              <CheckList findings={findings} />
            ) : (
              <RevisionHistory
                benchId={benchId}
                listRevisions={actions.listRevisions}
                currentNumber={revision?.number ?? null}
                openNumber={viewing}
                onOpen={setViewing}
              />
            )}
          </div>
        </aside>
      </div>
    </div>
  );
}

/** The selected device's name, address, parameters and objects; shown, not editable, when `readOnly`. */
function DevicePanel({ deviceId, readOnly }: { deviceId: string; readOnly: boolean }) {
  const storeApi = useEditorStoreApi();
  const bench = useEditor((s) => s.bench);
  const device = bench.devices.find((d) => d.id === deviceId);
  if (device === undefined) return null;
  return (
    <div className="flex flex-col gap-4">
      <section aria-label="Device" className="flex flex-col gap-2">
        <label className="flex flex-col gap-1 text-xs text-ink-soft">
          Name
          <input
            key={`name:${device.name}`}
            defaultValue={device.name}
            readOnly={readOnly}
            onBlur={(e) =>
              e.target.value !== device.name &&
              storeApi.getState().apply((b) => renameDevice(b, device.id, e.target.value))
            }
            className="rounded border border-paper-line bg-paper px-2 py-1 text-sm text-ink"
          />
        </label>
        {device.individualAddress !== undefined ? (
          <label className="flex flex-col gap-1 text-xs text-ink-soft">
            Individual address
            <input
              key={`ia:${device.individualAddress}`}
              defaultValue={device.individualAddress}
              readOnly={readOnly}
              onBlur={(e) =>
                e.target.value !== device.individualAddress &&
                storeApi
                  .getState()
                  .apply(
                    (b) => setIndividualAddress(b, device.id, e.target.value),
                    `Individual address ${e.target.value}`,
                  )
              }
              onKeyDown={(e) => e.key === "Enter" && e.currentTarget.blur()}
              className="rounded border border-paper-line bg-paper px-2 py-1 font-mono text-sm text-ink"
            />
          </label>
        ) : (
          <p className="text-xs text-ink-soft">Sits on a unit link only: no individual address.</p>
        )}
        {(bench.rooms ?? []).length > 0 ? (
          <label className="flex flex-col gap-1 text-xs text-ink-soft">
            Room
            <select
              value={device.room ?? ""}
              disabled={readOnly}
              onChange={(e) =>
                storeApi
                  .getState()
                  .apply(
                    (b) => setDeviceRoom(b, device.id, e.target.value || undefined),
                    e.target.value ? `Room ${e.target.value}` : "No room",
                  )
              }
              className="rounded border border-paper-line bg-paper px-2 py-1 text-sm text-ink"
            >
              <option value="">none (a room of its own)</option>
              {(bench.rooms ?? []).map((room) => (
                <option key={room.id} value={room.id}>
                  {room.name}
                </option>
              ))}
            </select>
          </label>
        ) : null}
        <p className="text-xs text-ink-soft">
          Id <Mono>{device.id}</Mono> · type <Mono>{device.type}</Mono>
        </p>
      </section>
      {isCouplerDevice(device) ? (
        <section aria-label="Coupler">
          <h3 className="mb-2 text-sm font-semibold">Coupler</h3>
          <CouplerPanel bench={bench} device={device} readOnly={readOnly} />
        </section>
      ) : (
        <section aria-label="Parameters">
          <h3 className="mb-2 text-sm font-semibold">Parameters</h3>
          <ParameterPanel device={device} readOnly={readOnly} />
        </section>
      )}
      {isCouplerDevice(device) ? null : (
        <section aria-label="Group objects">
          <h3 className="mb-2 text-sm font-semibold">Group objects</h3>
          <ObjectList device={device} bench={bench} readOnly={readOnly} />
        </section>
      )}
    </div>
  );
}
