import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requireCapability } from "@/app/_lib/dal";
import { loadBench } from "@/app/_lib/policy/bench";
import { orNotFound } from "@/app/_lib/policy/for-page";
import { latestRevision } from "@/db/queries/benches";
import { LiveConsole } from "@/components/console/live-console";
import { SimulatorCaution } from "@/components/console/simulator-caution";
import { StartSessionButton } from "@/components/live-session/start-session-button";
import { PageHeader } from "@/components/ui/page-header";

export const metadata: Metadata = { title: "Live console" };

/**
 * A bench's latest revision running live. The document is read on the server
 * and handed to the console, which runs it in a Web Worker (or, from the
 * header, starts it on the server instead). A bench the member
 * may not open live is answered as not found, never as forbidden.
 */
export default async function LiveBenchPage({ params }: { params: Promise<{ benchId: string }> }) {
  const { benchId } = await params;
  const session = await requireCapability("console.use");
  // The bench policy's "run": "own" scope (apprentices) only on their own copies.
  const bench = orNotFound(() => loadBench(session, benchId, "run"));
  const revision = latestRevision({ benchId: bench.id });
  if (!revision) notFound();
  let document: unknown;
  try {
    document = JSON.parse(revision.document);
  } catch {
    document = null;
  }
  return (
    <div className="flex flex-col gap-4 px-4 py-6 md:px-6">
      <PageHeader
        title={bench.name}
        lead={`Live console in this browser · revision ${revision.number}`}
        actions={<StartSessionButton bench={{ id: bench.id, name: bench.name }} />}
      />
      <LiveConsole benchId={bench.id} document={document} memberId={session.userId} />
      <SimulatorCaution />
    </div>
  );
}
