import type { Metadata } from "next";
import Link from "next/link";
import { requireCapability } from "@/app/_lib/dal";
import { benchCan, listReadableBenches } from "@/app/_lib/policy/bench";
import { SimulatorCaution } from "@/components/console/simulator-caution";
import { PageHeader } from "@/components/ui/page-header";
import { StatusBadge } from "@/components/ui/status-badge";

export const metadata: Metadata = { title: "Live console" };

/**
 * Pick a bench to run live. Apprentices hold the live console only on their
 * own copies (assigned lab benches and sandboxes), so they see only those.
 */
export default async function ConsolePage() {
  const session = await requireCapability("console.use");
  const benches = listReadableBenches(session).filter((bench) => benchCan(session, bench).run);
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title="Live console"
        lead="Run a bench in the browser, send telegrams from the control pad and watch the bus answer."
      />
      {benches.length === 0 ? (
        <p className="text-sm text-ink-soft">
          {session.scope === "own"
            ? "No lab or sandbox bench of yours yet. Open an assigned lab first."
            : "No benches in this workspace yet."}
        </p>
      ) : (
        <ul className="flex flex-col gap-2" aria-label="Benches">
          {benches.map((bench) => (
            <li
              key={bench.id}
              className="flex flex-wrap items-center justify-between gap-3 rounded-lg border border-paper-line bg-paper p-4"
            >
              <div className="min-w-0">
                <div className="font-medium">{bench.name}</div>
                {bench.description ? (
                  <div className="text-sm text-ink-soft">{bench.description}</div>
                ) : null}
              </div>
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
                >
                  Open live
                </Link>
              </div>
            </li>
          ))}
        </ul>
      )}
      <SimulatorCaution />
    </div>
  );
}
