import type { Bench, BenchRevision } from "@/db/queries/benches";

/** A bench as the API lists it (no document). */
export function benchSummary(bench: Bench) {
  return {
    id: bench.id,
    name: bench.name,
    description: bench.description,
    createdBy: bench.createdBy,
    privateOwnerId: bench.privateOwnerId,
    copiedFromBenchId: bench.copiedFromBenchId,
    createdAt: bench.createdAt.toISOString(),
    updatedAt: bench.updatedAt.toISOString(),
  };
}

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
