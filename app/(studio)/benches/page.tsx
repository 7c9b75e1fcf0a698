import type { Metadata } from "next";
import { benchOffersFor } from "@/app/_lib/bench-offers";
import { can } from "@/app/_lib/capabilities";
import { requireCapability } from "@/app/_lib/dal";
import { listReadableBenches } from "@/app/_lib/policy/bench";
import { PageHeader } from "@/components/ui/page-header";
import { BenchList, type BenchListItem } from "./bench-list";

export const metadata: Metadata = { title: "Benches" };

/** The workspace's benches: open, create, duplicate, delete. */
export default async function BenchesPage() {
  const session = await requireCapability("benches.read");
  const benches: BenchListItem[] = listReadableBenches(session).map((bench) => ({
    id: bench.id,
    name: bench.name,
    description: bench.description,
    private: bench.privateOwnerId !== null,
    updatedAt: bench.updatedAt.toISOString(),
    offers: benchOffersFor(session, bench),
  }));
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title="Benches"
        lead="Installations built as a simulated KNX bus: devices, group addresses and the links between them."
      />
      <BenchList benches={benches} canEdit={can(session.role, "benches.edit")} />
      <aside
        role="note"
        aria-label="Caution"
        className="rounded-lg border border-l-4 border-copper/40 border-l-copper bg-paper-deep p-4 text-sm text-ink-soft"
      >
        A bench models an installation for planning, testing and training. It does not replace the
        manufacturer&apos;s instructions, local codes and regulations, or licensed practice on the
        real installation.
      </aside>
    </div>
  );
}
