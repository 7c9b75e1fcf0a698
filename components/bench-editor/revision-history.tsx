"use client";

import { useQuery } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { formatDateTime } from "@/components/ui/format-date";

/** One saved revision as the history lists it (no document). */
export interface RevisionEntry {
  readonly number: number;
  readonly summary: string;
  /** ISO 8601. */
  readonly createdAt: string;
  /** Null once the author's account is gone. */
  readonly authorName: string | null;
}

/** TanStack Query keys for a bench's revisions; a save invalidates the list. */
export const revisionQueryKeys = {
  list: (benchId: string) => ["benches", benchId, "revisions"] as const,
  one: (benchId: string, number: number) => ["benches", benchId, "revisions", number] as const,
};

/** "2026-12-01 22:49 UTC": the one date format (components/ui/format-date.ts). */
export const formatRevisionTime = formatDateTime;

export interface RevisionHistoryProps {
  readonly benchId: string;
  readonly listRevisions: () => Promise<readonly RevisionEntry[]>;
  /** The revision the editor builds on (the newest one it knows). */
  readonly currentNumber: number | null;
  /** The earlier revision on view, if any. */
  readonly openNumber: number | null;
  readonly onOpen: (number: number) => void;
}

/**
 * The bench's revision history, newest first: who saved, when, and what
 * changed. An earlier revision opens read-only, from where it can be restored.
 */
export function RevisionHistory({
  benchId,
  listRevisions,
  currentNumber,
  openNumber,
  onOpen,
}: RevisionHistoryProps) {
  const revisions = useQuery({
    queryKey: revisionQueryKeys.list(benchId),
    queryFn: listRevisions,
  });
  if (revisions.isPending) return <p className="text-sm text-ink-soft">Loading the history…</p>;
  if (revisions.isError)
    return (
      <p role="alert" className="text-sm text-fault">
        The history could not be loaded: {revisions.error.message}
      </p>
    );
  if (revisions.data.length === 0)
    return <p className="text-sm text-ink-soft">This bench has no saved revisions.</p>;
  return (
    <ol aria-label="Revision history" className="flex flex-col gap-2">
      {revisions.data.map((revision) => {
        const current = revision.number === currentNumber;
        const open = revision.number === openNumber;
        return (
          <li
            key={revision.number}
            aria-label={`Revision ${revision.number}`}
            aria-current={open ? "true" : undefined}
            className={`rounded-md border px-3 py-2 text-sm ${open ? "border-copper bg-copper/5" : "border-paper-line"}`}
          >
            <div className="flex items-baseline justify-between gap-2">
              <span className="font-semibold">
                Revision {revision.number}
                {current ? (
                  <span className="ml-2 text-xs font-normal text-ink-soft">current</span>
                ) : null}
              </span>
              <time dateTime={revision.createdAt} className="text-xs text-ink-soft">
                {formatRevisionTime(revision.createdAt)}
              </time>
            </div>
            <p className="text-xs text-ink-soft">{revision.authorName ?? "a former member"}</p>
            <p className="mt-1">{revision.summary || <span className="text-ink-soft">—</span>}</p>
            {current ? null : (
              <Button
                variant="secondary"
                className="mt-2 px-2.5 py-1 text-xs"
                onClick={() => onOpen(revision.number)}
                disabled={open}
                aria-label={`Open revision ${revision.number} read-only`}
              >
                {open ? "On view" : "Open read-only"}
              </Button>
            )}
          </li>
        );
      })}
    </ol>
  );
}
