import type { BenchRevision } from "@/db/queries/benches";

// A bench as the API shows it comes from the bench policy (benchView), which
// decides what the asking member may see of it, such as where it was copied from.
export { benchView } from "@/app/_lib/policy/bench";

/** A revision with its document parsed back to JSON. */
export function revisionJson(revision: BenchRevision) {
  return {
    id: revision.id,
    number: revision.number,
    authorId: revision.authorId,
    summary: revision.summary,
    createdAt: revision.createdAt.toISOString(),
    document: JSON.parse(revision.document) as unknown,
  };
}
