import { loadBench, type Bench, type BenchError } from "@/engine";
import { parseScenario } from "@/engine";
import type { Scenario } from "@/engine";

/** Largest bench or scenario file the editor imports; the API's document limit is the same. */
export const IMPORT_LIMIT_BYTES = 1024 * 1024;

/** One problem in an imported file, with the JSON path of the field at fault. */
export interface ImportIssue {
  readonly path: string;
  readonly message: string;
}

export type ImportCheck =
  | { readonly ok: true; readonly kind: "bench"; readonly bench: Bench; readonly document: unknown }
  | {
      readonly ok: true;
      readonly kind: "scenario";
      readonly scenario: Scenario;
      readonly document: unknown;
    }
  | { readonly ok: false; readonly issues: readonly ImportIssue[] };

function benchIssues(errors: readonly BenchError[]): ImportIssue[] {
  return errors.map((e) => ({
    path: e.path,
    message: e.message.startsWith(`${e.path}: `) ? e.message.slice(e.path.length + 2) : e.message,
  }));
}

/**
 * Checks a file's text as a Benchline bench or scenario before anything is
 * sent: size, JSON syntax, then the engine's own validation, returning every
 * problem with the path of the field at fault. A document with `steps` is a
 * scenario; anything else is read as a bench.
 */
export function checkImportText(text: string, sizeBytes: number): ImportCheck {
  if (sizeBytes > IMPORT_LIMIT_BYTES) {
    return {
      ok: false,
      issues: [
        {
          path: "(file)",
          message: `the file is ${Math.ceil(sizeBytes / 1024)} KiB; the limit is ${IMPORT_LIMIT_BYTES / 1024} KiB`,
        },
      ],
    };
  }
  let document: unknown;
  try {
    document = JSON.parse(text);
  } catch (cause) {
    return {
      ok: false,
      issues: [{ path: "(file)", message: `not valid JSON: ${(cause as Error).message}` }],
    };
  }
  if (typeof document === "object" && document !== null && "steps" in document) {
    const parsed = parseScenario(document);
    return parsed.ok
      ? { ok: true, kind: "scenario", scenario: parsed.value, document }
      : { ok: false, issues: parsed.error.issues };
  }
  const loaded = loadBench(document);
  return loaded.ok
    ? { ok: true, kind: "bench", bench: loaded.value.bench, document }
    : { ok: false, issues: benchIssues(loaded.error) };
}
