import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { benchOffersFor } from "@/app/_lib/bench-offers";
import { can } from "@/app/_lib/capabilities";
import { requireCapability } from "@/app/_lib/dal";
import { loadBench } from "@/app/_lib/policy/bench";
import { orNotFound } from "@/app/_lib/policy/for-page";
import { findReadableFloorPlan } from "@/app/_lib/policy/upload";
import { benchSchema } from "@/engine";
import { latestRevision } from "@/db/queries/benches";
import { EditorPage } from "./editor-page";

export const metadata: Metadata = { title: "Bench editor" };

/** Loads the bench's latest revision on the server and hands the document to the client editor. */
export default async function BenchEditorPage({
  params,
}: {
  params: Promise<{ benchId: string }>;
}) {
  const { benchId } = await params;
  const session = await requireCapability("benches.read");
  const bench = orNotFound(() => loadBench(session, benchId));
  const revision = latestRevision({ benchId: bench.id });
  if (!revision) notFound();
  // Stored documents were checked on the way in; parse again so the editor gets the defaults filled.
  const document = benchSchema.parse(JSON.parse(revision.document));
  const offers = benchOffersFor(session, bench);
  const plan = findReadableFloorPlan(session, bench);
  return (
    <EditorPage
      benchId={bench.id}
      bench={document}
      revision={{
        number: revision.number,
        summary: revision.summary,
        createdAt: revision.createdAt.toISOString(),
      }}
      canEdit={offers.edit}
      links={{
        live: offers.live ? `/benches/${bench.id}/live` : null,
        // Scenarios are listed per bench on one page; there is no page per bench.
        scenarios: can(session.role, "scenarios.read") ? "/scenarios" : null,
      }}
      floorPlanUrl={
        plan ? `/api/benches/${bench.id}/floor-plan?v=${plan.sha256.slice(0, 12)}` : null
      }
    />
  );
}
