import type { Metadata } from "next";
import Link from "next/link";
import type { ReactNode } from "react";
import { benchOffersFor } from "@/app/_lib/bench-offers";
import { requireCapability } from "@/app/_lib/dal";
import { liveSessions } from "@/app/_lib/live/live-session-registry";
import { listReadableBenches } from "@/app/_lib/policy/bench";
import { SimulatorCaution } from "@/components/console/simulator-caution";
import { ServerSessionList } from "@/components/live-session/server-session-list";
import { StartSessionButton } from "@/components/live-session/start-session-button";
import { PageHeader } from "@/components/ui/page-header";
import { StatusBadge } from "@/components/ui/status-badge";
import { PracticeCopyButton } from "./practice-copy-button";

export const metadata: Metadata = { title: "Live console" };

/** One bench in either list: its name and description, and what may be done with it. */
function BenchItem({
  bench,
  children,
}: {
  bench: { name: string; description: string };
  children: ReactNode;
}) {
  return (
    <li className="flex flex-wrap items-center justify-between gap-3 rounded-lg border border-paper-line bg-paper p-4">
      <div className="min-w-0">
        <div className="font-medium">{bench.name}</div>
        {bench.description ? (
          <div className="text-sm text-ink-soft">{bench.description}</div>
        ) : null}
      </div>
      {children}
    </li>
  );
}

/**
 * Pick a bench to run live. Apprentices hold the live console only on their
 * own copies (assigned lab benches and practice copies), so they see those,
 * and the shared benches they may copy in one click to practise on.
 */
export default async function ConsolePage() {
  const session = await requireCapability("console.use");
  const visible = listReadableBenches(session).map((bench) => ({
    bench,
    offers: benchOffersFor(session, bench),
  }));
  const benches = visible.filter(({ offers }) => offers.live).map(({ bench }) => bench);
  const running = liveSessions().list(session);
  const copyable = visible
    .filter(({ offers }) => !offers.live && offers.practiceCopy)
    .map(({ bench }) => bench);
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title="Live console"
        lead="Run a bench in the browser, or on the server in real time where KNX software can reach it over KNXnet/IP; send telegrams from the control pad and watch the bus answer."
      />
      <ServerSessionList sessions={running} memberId={session.userId} />
      {benches.length === 0 ? (
        <p className="text-sm text-ink-soft">
          {session.scope === "own"
            ? "No lab or practice bench of yours yet. Open an assigned lab, or start a practice copy below."
            : "No benches in this workspace yet."}
        </p>
      ) : (
        <ul className="flex flex-col gap-2" aria-label="Benches">
          {benches.map((bench) => (
            <BenchItem key={bench.id} bench={bench}>
              <div className="flex items-center gap-3">
                {bench.privateOwnerId !== null ? (
                  <StatusBadge tone="neutral">
                    {bench.privateOwnerId === session.userId ? "your copy" : "private copy"}
                  </StatusBadge>
                ) : null}
                <Link
                  href={`/benches/${bench.id}/live`}
                  className="rounded-md bg-copper px-3.5 py-2 text-sm font-medium text-white hover:bg-copper-deep"
                  aria-label={`Open ${bench.name} live`}
                  title="Runs in this browser, at any speed"
                >
                  Open live
                </Link>
                <StartSessionButton bench={{ id: bench.id, name: bench.name }} />
              </div>
            </BenchItem>
          ))}
        </ul>
      )}
      {copyable.length > 0 ? (
        <section aria-labelledby="practice-heading" className="flex flex-col gap-2">
          <h2 id="practice-heading" className="font-medium">
            Practise on a shared bench
          </h2>
          <p className="text-sm text-ink-soft">
            A practice copy is yours alone: change it, break it and run it live without touching the
            shared bench.
          </p>
          <ul className="flex flex-col gap-2" aria-label="Shared benches to practise on">
            {copyable.map((bench) => (
              <BenchItem key={bench.id} bench={bench}>
                <PracticeCopyButton bench={{ id: bench.id, name: bench.name }} />
              </BenchItem>
            ))}
          </ul>
        </section>
      ) : null}
      <SimulatorCaution />
    </div>
  );
}
