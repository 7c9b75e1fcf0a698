import type { Metadata } from "next";
import { requireCapability } from "@/app/_lib/dal";
import { liveSessions } from "@/app/_lib/live/live-session-registry";
import { orNotFound } from "@/app/_lib/policy/for-page";
import { ServerLiveConsole } from "@/components/console/live-console";
import { SimulatorCaution } from "@/components/console/simulator-caution";
import { PageHeader } from "@/components/ui/page-header";

export const metadata: Metadata = { title: "Live console on the server" };

/**
 * A live session hosted by the server, attached to from this page: its owner
 * controls it, a member who may watch it (a trainer and an apprentice's lab
 * copy) sees the same state stream. A session the member may not see, or one
 * that no longer runs, is answered as not found.
 */
export default async function ServerSessionPage({
  params,
}: {
  params: Promise<{ sessionId: string }>;
}) {
  const { sessionId } = await params;
  const session = await requireCapability("console.use");
  const view = orNotFound(() => liveSessions().view(session, sessionId));
  return (
    <div className="flex flex-col gap-4 px-4 py-6 md:px-6">
      <PageHeader
        title={view.benchName}
        lead={`Live console on the server · revision ${view.revision}`}
      />
      <ServerLiveConsole session={view} memberId={session.userId} />
      <SimulatorCaution />
    </div>
  );
}
