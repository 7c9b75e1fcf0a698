"use client";

import { useRef } from "react";
import { benchSchema, type Bench } from "@/engine";
import {
  BenchEditor,
  type BenchEditorActions,
  type BenchEditorLinks,
} from "@/components/bench-editor/bench-editor";
import type { RevisionEntry } from "@/components/bench-editor/revision-history";
import { ApiError, getJson, sendJson } from "../../_shell/api-client";

interface EditorPageProps {
  readonly benchId: string;
  readonly bench: Bench;
  readonly revision: {
    readonly number: number;
    readonly summary: string;
    readonly createdAt: string;
  };
  readonly canEdit: boolean;
  readonly floorPlanUrl: string | null;
  readonly links: BenchEditorLinks;
}

function messageOf(error: unknown): string {
  if (error instanceof ApiError) return error.detail;
  return error instanceof Error ? error.message : "something went wrong";
}

/** Wires the editor to the bench API: save as a revision, import, floor-plan upload, history. */
export function EditorPage({
  benchId,
  bench,
  revision,
  canEdit,
  floorPlanUrl,
  links,
}: EditorPageProps) {
  // The revision the next save builds on; a save refused with 409 means someone else saved since.
  const baseRevision = useRef(revision.number);
  const actions: BenchEditorActions = {
    async save(next, summary) {
      try {
        const saved = await sendJson<{ revision: { number: number } }>(
          `/api/benches/${benchId}`,
          "PATCH",
          {
            document: next,
            summary: summary.slice(0, 200),
            baseRevision: baseRevision.current,
          },
        );
        baseRevision.current = saved.revision.number;
        return { revision: saved.revision.number };
      } catch (error) {
        throw new Error(messageOf(error));
      }
    },
    async importDocument(check, fileName) {
      try {
        const result = await sendJson<{
          kind: string;
          revision?: { number: number };
          scenario?: { name: string };
        }>(`/api/benches/${benchId}/import`, "POST", {
          kind: check.kind,
          fileName,
          document: check.document,
        });
        if (result.revision) {
          baseRevision.current = result.revision.number;
          return { message: `Imported ${fileName} as revision ${result.revision.number}.` };
        }
        return {
          message: `Imported scenario “${result.scenario?.name ?? fileName}” onto this bench.`,
        };
      } catch (error) {
        throw new Error(messageOf(error));
      }
    },
    async uploadFloorPlan(file) {
      const response = await fetch(`/api/benches/${benchId}/floor-plan`, {
        method: "PUT",
        headers: { "Content-Type": file.type || "application/octet-stream" },
        body: file,
      });
      const body = (await response.json()) as {
        floorPlan?: { url: string };
        error?: { message: string };
      };
      if (!response.ok || !body.floorPlan)
        throw new Error(body.error?.message ?? `the server answered ${response.status}`);
      return body.floorPlan.url;
    },
    async listRevisions() {
      try {
        const body = await getJson<{ revisions: RevisionEntry[] }>(
          `/api/benches/${benchId}/revisions`,
        );
        return body.revisions;
      } catch (error) {
        throw new Error(messageOf(error));
      }
    },
    async loadRevision(number) {
      let document: unknown;
      try {
        ({
          revision: { document },
        } = await getJson<{ revision: { document: unknown } }>(
          `/api/benches/${benchId}/revisions/${number}`,
        ));
      } catch (error) {
        throw new Error(messageOf(error));
      }
      // Parsed like the latest revision on the server, so the defaults are filled.
      const parsed = benchSchema.safeParse(document);
      if (!parsed.success) {
        const issue = parsed.error.issues[0];
        throw new Error(
          `it no longer reads as a bench${issue ? ` (${issue.path.join(".") || "document"}: ${issue.message})` : ""}`,
        );
      }
      return parsed.data;
    },
  };
  return (
    <BenchEditor
      benchId={benchId}
      bench={bench}
      revision={revision}
      canEdit={canEdit}
      floorPlanUrl={floorPlanUrl}
      actions={actions}
      links={links}
    />
  );
}
