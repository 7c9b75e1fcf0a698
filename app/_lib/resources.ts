import { z } from "zod";
import { loadBench } from "@/engine";
import { parseScenario } from "@/engine";
import { AppError } from "./errors";

/**
 * Ids and documents at the edge: the id schema every route parses ids with, and
 * the engine checks of bench and scenario documents. Loading a row for a
 * session, and deciding what the session may do with it, is the resource
 * policies' job (app/_lib/policy/).
 */

/** An id in a URL or body: opaque, bounded. */
export const resourceIdSchema = z
  .string()
  .min(1, "give an id")
  .max(100, "an id has at most 100 characters");

/**
 * Check a bench document with the engine's loader (schema, format migration
 * and every cross-reference). Returns the JSON text to store. The first error
 * is reported with its path inside the body ("document.devices[2].type").
 */
export function checkedBenchDocument(document: unknown): { text: string; name: string } {
  const loaded = loadBench(document);
  if (!loaded.ok) {
    const first = loaded.error[0];
    const path = first ? `document${first.path === "$" ? "" : `.${first.path}`}` : "document";
    const count = loaded.error.length;
    throw new AppError(
      "invalid_input",
      `${path}: ${first?.message ?? "not a bench"}${count > 1 ? ` (and ${count - 1} more problems)` : ""}`,
      { field: path },
    );
  }
  return { text: JSON.stringify(loaded.value.bench), name: loaded.value.bench.name };
}

/** Check a scenario document with the engine's scenario schema; returns the JSON text to store. */
export function checkedScenarioDocument(document: unknown): { text: string; name: string } {
  const parsed = parseScenario(document);
  if (!parsed.ok) {
    const first = parsed.error.issues[0];
    const path = first && first.path !== "(document)" ? `document.${first.path}` : "document";
    throw new AppError("invalid_input", `${path}: ${first?.message ?? "not a scenario"}`, {
      field: path,
    });
  }
  return { text: JSON.stringify(document), name: parsed.value.name };
}
