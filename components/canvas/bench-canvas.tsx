"use client";

import "@xyflow/react/dist/style.css";
import {
  applyEdgeChanges,
  applyNodeChanges,
  Background,
  BackgroundVariant,
  ConnectionMode,
  Controls,
  MiniMap,
  Panel,
  ReactFlow,
  useReactFlow,
  type Connection,
  type EdgeChange,
  type NodeChange,
  type NodeTypes,
  type EdgeTypes,
} from "@xyflow/react";
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import type { CheckFinding } from "@/engine";
import { connectObject, disconnectObject } from "@/components/bench-editor/model/links";
import { groupAddressKey } from "@/components/bench-editor/model/group-address-key";
import { moveNodes, type NodeMove, type NodeRef } from "@/components/bench-editor/model/move-nodes";
import { joinUnitLink } from "@/components/bench-editor/model/unit-links";
import { useEditor, useEditorStoreApi } from "@/components/bench-editor/store/editor-context";
import {
  benchGraph,
  type BenchEdge,
  type BenchNode,
  type FloorPlanNodeData,
  type LinkEdge,
} from "./bench-graph";
import { AddressGroupNodeComponent } from "./address-group-node";
import { BusBarNodeComponent } from "./bus-bar-node";
import { DeviceNodeComponent } from "./device-node";
import { FloorPlanNodeComponent } from "./floor-plan-node";
import { CouplerNodeComponent } from "./coupler-node";
import { LineRegionNodeComponent } from "./line-region-node";
import { EdgeMarkers, LinkEdgeComponent, UnitLinkEdgeComponent } from "./link-edges";
import {
  busBarNodeId,
  DEVICE_TYPE_DRAG,
  deviceNodeId,
  LINE_REGION_PREFIX,
  nodeRefOf,
  objectOfHandle,
  UNIT_LINK_HANDLE,
} from "./node-ids";
import { CanvasSearch } from "./canvas-search";
import { openingViewport, revealViewport } from "./opening-view";
import { useBenchLayout } from "./use-bench-layout";
import { addDevice } from "@/components/bench-editor/model/devices";

const nodeTypes: NodeTypes = {
  device: DeviceNodeComponent,
  busBar: BusBarNodeComponent,
  floorPlan: FloorPlanNodeComponent,
  addressGroup: AddressGroupNodeComponent,
  lineRegion: LineRegionNodeComponent,
  coupler: CouplerNodeComponent,
};
const edgeTypes: EdgeTypes = { link: LinkEdgeComponent, unitLink: UnitLinkEdgeComponent };

const EMPTY_GRAPH: { nodes: BenchNode[]; edges: BenchEdge[] } = { nodes: [], edges: [] };

/** Above this many nodes only what is on screen is rendered, so a 300-device bench pans smoothly. */
const VISIBLE_ONLY_THRESHOLD = 150;

function isTyping(target: EventTarget | null): boolean {
  return (
    target instanceof HTMLElement &&
    (target.isContentEditable || ["INPUT", "TEXTAREA", "SELECT"].includes(target.tagName))
  );
}

export interface BenchCanvasProps {
  readonly findings?: readonly CheckFinding[];
  readonly floorPlan?: FloorPlanNodeData | null;
  /**
   * An earlier revision on view: nodes can be selected, searched and fitted
   * but not moved, wired, dropped, deleted or pasted.
   */
  readonly readOnly?: boolean;
  /** The canvas's accessible name; two canvases on one page need different names. */
  readonly label?: string;
  /** Active fault ids per device id from a running simulation (live console), drawn in fault red. */
  readonly faults?: ReadonlyMap<string, readonly string[]>;
  /** Expected load per line id (percent), shown on the line regions. */
  readonly lineLoads?: ReadonlyMap<string, number>;
}

/**
 * The bench as a wiring canvas, a view over the editor store: every change
 * (connect, move, delete, paste) goes through the model's pure edits, so the
 * canvas never holds a second copy of the bench beyond the drag in progress.
 */
export function BenchCanvas({
  findings,
  floorPlan,
  readOnly = false,
  label = "Bench canvas",
  faults,
  lineLoads,
}: BenchCanvasProps) {
  const storeApi = useEditorStoreApi();
  const bench = useEditor((s) => s.bench);
  const selection = useEditor((s) => s.selection);
  const reveal = useEditor((s) => s.reveal);
  const flow = useReactFlow<BenchNode, BenchEdge>();
  const searchRef = useRef<HTMLInputElement>(null);
  const frameRef = useRef<HTMLDivElement>(null);
  const layout = useBenchLayout(bench);
  // On by default: a bench opens as cards and bars, and a selection lights up its own wires.
  const [focusWires, setFocusWires] = useState(true);

  const graph = useMemo(
    () =>
      layout === null
        ? EMPTY_GRAPH
        : benchGraph(bench, {
            ...(findings ? { findings } : {}),
            selectedDevices: new Set(selection.devices),
            selectedAddresses: new Set(selection.groupAddresses.map(groupAddressKey)),
            ...(selection.object === undefined ? {} : { focusObject: selection.object }),
            floorPlan: floorPlan ?? null,
            ...(faults ? { faults } : {}),
            layout,
            focusWires,
            ...(lineLoads ? { lineLoads } : {}),
          }),
    [bench, findings, selection, floorPlan, faults, layout, focusWires, lineLoads],
  );
  const [nodes, setNodes] = useState<BenchNode[]>(graph.nodes);
  const [edges, setEdges] = useState<BenchEdge[]>(graph.edges);
  // A new bench or selection replaces the drawn nodes (React's "adjust state on prop change" pattern).
  const [drawnGraph, setDrawnGraph] = useState(graph);
  if (drawnGraph !== graph) {
    setDrawnGraph(graph);
    setNodes(graph.nodes);
    setEdges(graph.edges);
  }

  const addressOfKey = useCallback(
    (key: string) => bench.groupAddresses.find((g) => groupAddressKey(g.address) === key)?.address,
    [bench],
  );

  const onNodesChange = useCallback(
    (changes: NodeChange<BenchNode>[]) => {
      setNodes((current) => {
        const next = applyNodeChanges(changes, current);
        if (changes.some((c) => c.type === "select")) {
          const devices: string[] = [];
          const groupAddresses: string[] = [];
          for (const node of next) {
            if (!node.selected) continue;
            const ref = nodeRefOf(node.id, addressOfKey);
            if (ref?.kind === "device") devices.push(ref.id);
            else if (ref?.kind === "group-address") groupAddresses.push(ref.address);
          }
          const current = storeApi.getState().selection;
          if (
            devices.join() !== current.devices.join() ||
            groupAddresses.join() !== current.groupAddresses.join()
          ) {
            // Deferred: the store update re-renders panels, which must not happen inside this state updater.
            queueMicrotask(() => storeApi.getState().select({ devices, groupAddresses }));
          }
        }
        return next;
      });
    },
    [storeApi, addressOfKey],
  );

  const onEdgesChange = useCallback((changes: EdgeChange<BenchEdge>[]) => {
    setEdges((current) =>
      applyEdgeChanges(
        changes.filter((c) => c.type !== "remove"),
        current,
      ),
    );
  }, []);

  const onNodeDragStop = useCallback(
    (_event: unknown, _node: BenchNode, dragged: BenchNode[]) => {
      const moves: NodeMove[] = [];
      for (const node of dragged) {
        const ref = nodeRefOf(node.id, addressOfKey);
        if (ref !== undefined) moves.push({ node: ref, position: node.position });
      }
      if (moves.length > 0) storeApi.getState().apply((b) => moveNodes(b, moves));
    },
    [storeApi, addressOfKey],
  );

  const onConnect = useCallback(
    (connection: Connection) => {
      const ends = [
        { node: connection.source, handle: connection.sourceHandle },
        { node: connection.target, handle: connection.targetHandle },
      ];
      const state = storeApi.getState();
      if (ends.every((end) => end.handle === UNIT_LINK_HANDLE)) {
        state.apply(
          (b) => joinUnitLink(b, ends[0]!.node.slice(2), ends[1]!.node.slice(2)),
          "Wired on the unit link",
        );
        return;
      }
      const port = ends.find(
        (end) => end.node.startsWith("d:") && objectOfHandle(end.handle) !== undefined,
      );
      const bar = ends.find((end) => end.node.startsWith("g:"));
      if (port === undefined || bar === undefined) {
        state.notify({
          tone: "refusal",
          text: "Connect a group object's port to a bus-bar, or two unit-link ports.",
        });
        return;
      }
      const address = addressOfKey(bar.node.slice(2));
      if (address === undefined) return;
      const device = port.node.slice(2);
      const object = objectOfHandle(port.handle)!;
      state.apply(
        (b) => connectObject(b, { device, object, groupAddress: address }),
        `Linked object ${object} of ${device} to ${address}`,
      );
    },
    [storeApi, addressOfKey],
  );

  const deleteSelected = useCallback(() => {
    const state = storeApi.getState();
    const links = edges.filter(
      (e): e is LinkEdge => e.type === "link" && e.selected === true && e.data !== undefined,
    );
    if (links.length > 0) {
      state.apply(
        (b) => {
          let next = b;
          for (const edge of links) {
            const result = disconnectObject(next, edge.data!);
            if (result.ok) next = result.value;
          }
          return next;
        },
        `Unlinked ${links.length} object${links.length === 1 ? "" : "s"}`,
      );
    }
    state.deleteSelection();
  }, [storeApi, edges]);

  const onKeyDown = useCallback(
    (event: React.KeyboardEvent) => {
      if (isTyping(event.target)) return;
      const state = storeApi.getState();
      const mod = event.ctrlKey || event.metaKey;
      const edits = event.key === "Delete" || event.key === "Backspace" || mod;
      if (readOnly && edits && !(mod && event.key.toLowerCase() === "f")) return;
      if (event.key === "Delete" || event.key === "Backspace") {
        event.preventDefault();
        deleteSelected();
      } else if (mod && event.key.toLowerCase() === "c") {
        state.copySelection();
      } else if (mod && event.key.toLowerCase() === "v") {
        event.preventDefault();
        state.paste();
      } else if (mod && event.key.toLowerCase() === "z") {
        event.preventDefault();
        if (event.shiftKey) state.redo();
        else state.undo();
      } else if (mod && event.key.toLowerCase() === "y") {
        event.preventDefault();
        state.redo();
      } else if (mod && event.key.toLowerCase() === "f") {
        event.preventDefault();
        searchRef.current?.focus();
      } else if (!mod && event.key === "/") {
        event.preventDefault();
        searchRef.current?.focus();
      } else if (!mod && (event.key === "f" || event.key === "F")) {
        void flow.fitView({ padding: 0.1, duration: 200 });
      }
    },
    [storeApi, deleteSelected, flow, readOnly],
  );

  // Open once, when the first layout is drawn: readable zoom, on the selection, a fault or the first line.
  const [initialised, setInitialised] = useState(false);
  const opened = useRef(false);
  useEffect(() => {
    if (opened.current || !initialised || graph === EMPTY_GRAPH) return;
    const frame = frameRef.current;
    opened.current = true;
    void flow
      .setViewport(
        openingViewport(graph.nodes, {
          width: frame?.clientWidth ?? 0,
          height: frame?.clientHeight ?? 0,
        }),
      )
      // A mark for tests and styles that the opening view is in place (not rendered by React).
      .then(() => frame?.setAttribute("data-view", "opened"));
  }, [initialised, graph, flow]);

  // A device that newly reports a fault (live console) is brought into view if it is off screen.
  const seenFaults = useRef<ReadonlySet<string>>(new Set());
  useEffect(() => {
    const now = new Set(
      [...(faults ?? new Map<string, readonly string[]>())]
        .filter(([, list]) => list.length > 0)
        .map(([id]) => id),
    );
    const fresh = [...now].filter((id) => !seenFaults.current.has(id));
    seenFaults.current = now;
    const frame = frameRef.current;
    if (!opened.current || fresh.length === 0 || frame === null) return;
    const nodes = fresh
      .map((id) => flow.getNode(deviceNodeId(id)))
      .filter((n): n is BenchNode => n !== undefined);
    const next = revealViewport(nodes, flow.getViewport(), {
      width: frame.clientWidth,
      height: frame.clientHeight,
    });
    if (next !== undefined) void flow.setViewport(next, { duration: 250 });
  }, [faults, flow]);

  // Centre a node another panel asked for (address table, check list, search).
  useEffect(() => {
    if (reveal === null) return;
    const id =
      reveal.node.kind === "device"
        ? deviceNodeId(reveal.node.id)
        : busBarNodeId(reveal.node.address);
    const node = flow.getNode(id);
    if (node === undefined) return;
    const width = node.measured?.width ?? 240;
    const height = node.measured?.height ?? 60;
    void flow.setCenter(node.position.x + width / 2, node.position.y + height / 2, {
      zoom: Math.max(flow.getZoom(), 0.9),
      duration: 250,
    });
  }, [reveal, flow]);

  const onDragOver = useCallback((event: React.DragEvent) => {
    if (event.dataTransfer.types.includes(DEVICE_TYPE_DRAG)) {
      event.preventDefault();
      event.dataTransfer.dropEffect = "copy";
    }
  }, []);

  const onDrop = useCallback(
    (event: React.DragEvent) => {
      const raw = event.dataTransfer.getData(DEVICE_TYPE_DRAG);
      if (raw === "") return;
      event.preventDefault();
      const dropped = JSON.parse(raw) as { type: string; line?: string };
      const position = flow.screenToFlowPosition({ x: event.clientX, y: event.clientY });
      // Dropped inside a line's region: the device goes on that line, whatever the shelf says.
      const region = nodes.find(
        (n) =>
          n.type === "lineRegion" &&
          position.x >= n.position.x &&
          position.x <= n.position.x + n.data.width &&
          position.y >= n.position.y &&
          position.y <= n.position.y + n.data.height,
      );
      const line = region === undefined ? dropped.line : region.id.slice(LINE_REGION_PREFIX.length);
      const type = dropped.type;
      let added: string | undefined;
      storeApi.getState().apply((b) => {
        const result = addDevice(b, { type, ...(line ? { line } : {}), position });
        if (!result.ok) return result;
        added = result.value.deviceId;
        return { ok: true, value: result.value.bench };
      }, "Added a device");
      if (added) storeApi.getState().selectNode({ kind: "device", id: added });
    },
    [flow, storeApi, nodes],
  );

  const onReveal = useCallback((node: NodeRef) => storeApi.getState().revealNode(node), [storeApi]);

  return (
    <div
      ref={frameRef}
      className="relative h-full w-full bg-graphite"
      onKeyDown={onKeyDown}
      {...(readOnly ? {} : { onDragOver, onDrop })}
      role="application"
      aria-label={label}
      tabIndex={-1}
    >
      <EdgeMarkers />
      <ReactFlow<BenchNode, BenchEdge>
        nodes={nodes}
        edges={edges}
        nodeTypes={nodeTypes}
        edgeTypes={edgeTypes}
        onNodesChange={onNodesChange}
        onEdgesChange={onEdgesChange}
        onNodeDragStop={onNodeDragStop}
        onConnect={onConnect}
        nodesDraggable={!readOnly}
        nodesConnectable={!readOnly}
        connectionMode={ConnectionMode.Loose}
        deleteKeyCode={null}
        onlyRenderVisibleElements={nodes.length > VISIBLE_ONLY_THRESHOLD}
        minZoom={0.05}
        maxZoom={2}
        onInit={() => setInitialised(true)}
        colorMode="dark"
        proOptions={{ hideAttribution: true }}
        connectionLineStyle={{ stroke: "#d98b4e", strokeWidth: 2 }}
        className="benchline-canvas"
      >
        <Background
          variant={BackgroundVariant.Dots}
          gap={24}
          size={1}
          color="#41464f"
          bgColor="#24272c"
        />
        <Controls showInteractive={false} />
        <Panel position="top-right">
          <button
            type="button"
            aria-pressed={focusWires}
            onClick={() => setFocusWires((on) => !on)}
            className="rounded-md border border-graphite-line bg-graphite-raised px-3 py-1.5 text-xs text-graphite-text hover:border-copper-bright"
            title="Fade the wires that do not touch the selected cards and bus-bars"
          >
            {focusWires ? "Wires: selection only" : "Wires: all"}
          </button>
        </Panel>
        {layout === null ? (
          <Panel position="top-center">
            <p role="status" className="text-sm text-graphite-muted">
              Laying out the bench…
            </p>
          </Panel>
        ) : null}
        {nodes.length <= VISIBLE_ONLY_THRESHOLD * 4 ? (
          <MiniMap
            pannable
            zoomable
            nodeColor={(n) =>
              n.type === "busBar"
                ? "#d98b4e" // --color-copper-bright
                : n.type === "device" && n.data.faults !== undefined
                  ? "#f07a70" // --color-fault-bright: a faulty device stays visible however far out
                  : n.type === "addressGroup" || n.type === "lineRegion"
                    ? "transparent"
                    : n.type === "coupler"
                      ? "#a3591f" // --color-copper
                      : "#41464f"
            }
            maskColor="rgba(36,39,44,0.7)"
            bgColor="#2f333a"
          />
        ) : null}
      </ReactFlow>
      <CanvasSearch bench={bench} inputRef={searchRef} onReveal={onReveal} />
      <CanvasNotice />
    </div>
  );
}

/** The notice line over the canvas: a refused edit in red with its reason, or what an edit did. */
function CanvasNotice() {
  const notice = useEditor((s) => s.notice);
  const notify = useEditor((s) => s.notify);
  if (notice === null) return null;
  const refusal = notice.tone === "refusal";
  return (
    <div
      role={refusal ? "alert" : "status"}
      className={`absolute bottom-4 left-1/2 z-10 flex max-w-[80%] -translate-x-1/2 items-start gap-3 rounded-md px-4 py-2 text-sm shadow-lg ${
        refusal
          ? "bg-fault text-white"
          : "bg-graphite-raised text-graphite-text ring-1 ring-graphite-line"
      }`}
      data-testid="canvas-notice"
    >
      <span>{notice.text}</span>
      <button
        type="button"
        className="opacity-80 hover:opacity-100"
        aria-label="Dismiss"
        onClick={() => notify(null)}
      >
        ×
      </button>
    </div>
  );
}
