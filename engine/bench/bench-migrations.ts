import { err, ok, type Result } from "../core/result";
import type { BenchError } from "./bench-error";
import { BENCH_FORMAT } from "./bench-schema";

/**
 * One step from format n to n + 1, keyed by n. A step receives the parsed JSON
 * of format n (not yet validated: older formats have no schema of their own any
 * more) and returns the document in format n + 1 with `format` updated.
 * Format 1 -> 2 added topology (optional `areas`, couplers as devices of type
 * "coupler"); every format-1 document is a valid format-2 document, so the
 * step only renumbers.
 */
export type BenchMigration = (document: Record<string, unknown>) => Record<string, unknown>;

export const benchMigrations: Readonly<Record<number, BenchMigration>> = {
  1: (document) => ({ ...document, format: 2 }),
};

/**
 * Brings a bench document of any known format to the current one. Refuses
 * documents without a format, from the future, or of a format with no path.
 */
export function migrateBench(
  document: unknown,
  migrations: Readonly<Record<number, BenchMigration>> = benchMigrations,
  targetFormat: number = BENCH_FORMAT,
): Result<Record<string, unknown>, BenchError> {
  if (typeof document !== "object" || document === null || Array.isArray(document)) {
    return err({ kind: "bench.not-an-object", path: "$", message: "a bench is a JSON object" });
  }
  let current = document as Record<string, unknown>;
  const format = current.format;
  if (typeof format !== "number" || !Number.isInteger(format) || format < 1) {
    return err({
      kind: "bench.format-missing",
      path: "format",
      message: `format must be a whole number from 1 to ${targetFormat}`,
    });
  }
  if (format > targetFormat) {
    return err({
      kind: "bench.format-unsupported",
      path: "format",
      message: `format ${format} is newer than this version of Benchline understands (${targetFormat})`,
    });
  }
  for (let step = format; step < targetFormat; step++) {
    const migrate = migrations[step];
    if (migrate === undefined) {
      return err({
        kind: "bench.format-unsupported",
        path: "format",
        message: `no migration from format ${step} to ${step + 1}`,
      });
    }
    current = migrate(current);
    if (current.format !== step + 1)
      throw new Error(`bench migration ${step} -> ${step + 1} did not set format to ${step + 1}`);
  }
  return ok(current);
}
