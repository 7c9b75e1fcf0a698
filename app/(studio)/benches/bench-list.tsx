"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import type { BenchOffers } from "@/app/_lib/bench-offers";
import { BENCH_FORMAT, type Bench } from "@/engine";
import { Button } from "@/components/ui/button";
import { StatusBadge } from "@/components/ui/status-badge";
import { errorText, sendJson } from "../_shell/api-client";
import { startPracticeCopy } from "../_shell/practice-copy";
import { Timestamp } from "@/components/ui/timestamp";

export interface BenchListItem {
  readonly id: string;
  readonly name: string;
  readonly description: string;
  readonly private: boolean;
  readonly updatedAt: string;
  /** What this member may do on this bench (app/_lib/bench-offers.ts). */
  readonly offers: BenchOffers;
}

/** A new bench: one line, the test tool on it, nothing else yet. */
function emptyBench(name: string): Bench {
  return {
    format: BENCH_FORMAT,
    name,
    lines: [{ id: "main", address: "1.1", name: "Main line" }],
    testToolAddress: "1.1.250",
    groupAddresses: [],
    devices: [],
    links: [],
    unitLinks: [],
  };
}

/** The bench list with create, and per bench what the member may do: copy, duplicate, delete (after confirmation). */
export function BenchList({
  benches,
  canEdit,
}: {
  benches: readonly BenchListItem[];
  canEdit: boolean;
}) {
  const router = useRouter();
  const [name, setName] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [confirming, setConfirming] = useState<string | null>(null);

  const run = async (action: () => Promise<void>) => {
    setBusy(true);
    setError(null);
    try {
      await action();
    } catch (cause) {
      setError(errorText(cause));
    } finally {
      setBusy(false);
    }
  };

  return (
    <div className="flex flex-col gap-4">
      {canEdit ? (
        <form
          aria-label="Create a bench"
          className="flex flex-wrap items-end gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            void run(async () => {
              const created = await sendJson<{ bench: { id: string } }>("/api/benches", "POST", {
                name,
                document: emptyBench(name.trim()),
              });
              router.push(`/benches/${created.bench.id}`);
            });
          }}
        >
          <label className="flex flex-1 flex-col gap-1 text-sm">
            New bench name
            <input
              value={name}
              onChange={(e) => setName(e.target.value)}
              required
              maxLength={120}
              className="rounded-md border border-paper-line bg-paper px-3 py-2"
            />
          </label>
          <Button type="submit" disabled={busy || name.trim() === ""}>
            Create bench
          </Button>
        </form>
      ) : null}
      {error ? (
        <p role="alert" className="rounded-md bg-fault-soft px-3 py-2 text-sm text-fault">
          {error}
        </p>
      ) : null}
      {benches.length === 0 ? (
        <p className="text-ink-soft">No benches in this workspace yet.</p>
      ) : (
        <ul
          className="divide-y divide-paper-line rounded-lg border border-paper-line bg-paper"
          aria-label="Benches"
        >
          {benches.map((bench) => (
            <li key={bench.id} className="flex flex-wrap items-center gap-3 px-4 py-3">
              <div className="min-w-0 flex-1">
                <Link
                  href={`/benches/${bench.id}`}
                  className="font-medium text-ink hover:text-copper-deep"
                >
                  {bench.name}
                </Link>
                {bench.private ? (
                  <span className="ml-2">
                    <StatusBadge tone="neutral">private copy</StatusBadge>
                  </span>
                ) : null}
                {bench.description ? (
                  <p className="truncate text-sm text-ink-soft">{bench.description}</p>
                ) : null}
                <p className="text-xs text-ink-soft">
                  updated <Timestamp value={bench.updatedAt} relative />
                </p>
              </div>
              <div className="flex gap-2">
                {bench.offers.practiceCopy ? (
                  <Button
                    variant="secondary"
                    disabled={busy}
                    aria-label={`Practice copy of ${bench.name}`}
                    onClick={() =>
                      void run(async () => {
                        router.push(`/benches/${await startPracticeCopy(bench)}`);
                      })
                    }
                  >
                    Practice copy
                  </Button>
                ) : null}
                {bench.offers.duplicate ? (
                  <Button
                    variant="secondary"
                    disabled={busy}
                    onClick={() =>
                      void run(async () => {
                        await sendJson(`/api/benches/${bench.id}/duplicate`, "POST", {});
                        router.refresh();
                      })
                    }
                  >
                    Duplicate
                  </Button>
                ) : null}
                {!bench.offers.delete ? null : confirming === bench.id ? (
                  <>
                    <Button
                      variant="danger"
                      disabled={busy}
                      onClick={() =>
                        void run(async () => {
                          await sendJson(`/api/benches/${bench.id}`, "DELETE");
                          setConfirming(null);
                          router.refresh();
                        })
                      }
                    >
                      Delete “{bench.name}”
                    </Button>
                    <Button variant="secondary" onClick={() => setConfirming(null)}>
                      Keep
                    </Button>
                  </>
                ) : (
                  <Button variant="secondary" onClick={() => setConfirming(bench.id)}>
                    Delete
                  </Button>
                )}
              </div>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
