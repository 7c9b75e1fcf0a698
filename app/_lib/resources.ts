import { z } from "zod";
import { loadBench } from "@/engine";
import { parseScenario } from "@/engine";
import { findBench } from "@/db/queries/benches";
import { findRun } from "@/db/queries/runs";
import { findScenario } from "@/db/queries/scenarios";
import { findSuite } from "@/db/queries/suites";
import { maySeeBench, scopeOf } from "./capabilities";
import type { VerifiedSession } from "./dal";
import { AppError } from "./errors";

/**
 * Loading workspace resources for route handlers. Everything is looked up
 * inside the session's workspace, so an id from another workspace is simply
 * not found (404), never forbidden: nothing reveals that it exists.
 */

type Who = Pick<VerifiedSession, "workspaceId" | "userId" | "role">;

/** An id in a URL or body: opaque, bounded. */
export const resourceIdSchema = z
  .string()
  .min(1, "give an id")
  .max(100, "an id has at most 100 characters");

/**
 * A bench the member may see: in the workspace, not archived, and (for a
 * private copy) their own or reviewed by a lab manager.
 */
export function loadVisibleBench(session: Who, benchId: string) {
  const bench = findBench({ workspaceId: session.workspaceId, benchId });
  if (!bench || bench.archivedAt !== null) throw new AppError("not_found", "no such bench");
  if (!maySeeBench(session, bench)) throw new AppError("not_found", "no such bench");
  return bench;
}

/** A scenario the member may see: in the workspace, on a bench they may see. */
export function loadVisibleScenario(session: Who, scenarioId: string) {
  const scenario = findScenario({ workspaceId: session.workspaceId, scenarioId });
  if (!scenario) throw new AppError("not_found", "no such scenario");
  loadVisibleBench(session, scenario.benchId);
  return scenario;
}

export function loadSuite(session: Who, suiteId: string) {
  const suite = findSuite({ workspaceId: session.workspaceId, suiteId });
  if (!suite) throw new AppError("not_found", "no such suite");
  return suite;
}

/** A run in the workspace; with "own" scope only the member's own runs (others: 403). */
export function loadVisibleRun(session: Who, runId: string) {
  const run = findRun({ workspaceId: session.workspaceId, runId });
  if (!run) throw new AppError("not_found", "no such run");
  // Someone else's run is hidden as if absent, as its event stream and share routes do.
  if (scopeOf(session.role, "runs.read") === "own" && run.startedBy !== session.userId) {
    throw new AppError("not_found", "no such run");
  }
  return run;
}

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
