import { listRevisions } from "@/db/queries/bench-history";
import { latestRevision } from "@/db/queries/benches";
import type { EditorBench } from "@/components/scenario-editor/scenario-editor";

/** What the scenario editor needs from a bench: its addresses with DPTs, devices and revisions. */
export function editorBench(bench: { id: string; name: string }): EditorBench {
  const latest = latestRevision({ benchId: bench.id });
  let document: {
    groupAddresses?: { address: string; name: string; dpt: string }[];
    devices?: { id: string; name: string; type: string }[];
  } = {};
  try {
    document = latest ? (JSON.parse(latest.document) as typeof document) : {};
  } catch {
    document = {};
  }
  return {
    id: bench.id,
    name: bench.name,
    groupAddresses: (document.groupAddresses ?? []).map(({ address, name, dpt }) => ({
      address,
      name,
      dpt,
    })),
    devices: (document.devices ?? []).map(({ id, name, type }) => ({ id, name, type })),
    revisions: listRevisions({ benchId: bench.id }).map(({ id, number }) => ({ id, number })),
  };
}
