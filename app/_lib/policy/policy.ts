import type { VerifiedSession } from "../dal";
import { AppError } from "../errors";

/**
 * What every resource policy (bench, scenario, suite, run, lab, member, upload)
 * shares. A policy module loads a row for a session and decides what the
 * session may do with it; route handlers, server actions and pages all ask
 * the policy, so "who may see or change this" is written once per resource.
 *
 * Two answers, always the same way:
 * - a row the session may not read is "not found" (404), exactly as if it did
 *   not exist, whether it is in another workspace or someone's private copy;
 * - a row the session may read but not act on is "forbidden" (403).
 * An id that came from a request body carries its field name in both answers.
 */

/** Who asks: enough of the verified session to decide. */
export type Who = Pick<VerifiedSession, "userId" | "workspaceId" | "role">;

/** What a session may do with one row. Pages pass it to the client to offer only these actions. */
export interface Can {
  readonly read: boolean;
  readonly edit: boolean;
  readonly run: boolean;
  readonly share: boolean;
  readonly delete: boolean;
}

export type Action = keyof Can;

export const nothing: Can = { read: false, edit: false, run: false, share: false, delete: false };

/** Where an id came from: a URL (no field) or a body field such as "scenarioIds[2]". */
export interface IdSource {
  readonly field?: string | undefined;
}

export function notFound(what: string, source: IdSource = {}): AppError {
  return new AppError(
    "not_found",
    source.field ? `${source.field}: no such ${what}` : `no such ${what}`,
    source.field ? { field: source.field } : undefined,
  );
}

export function forbidden(message: string, source: IdSource = {}): AppError {
  return new AppError(
    "forbidden",
    source.field ? `${source.field}: ${message}` : message,
    source.field ? { field: source.field } : undefined,
  );
}

/**
 * Throw unless `can` allows `action`: not found when the row may not even be
 * read, forbidden when it may be read but not acted on.
 */
export function ensure(
  can: Can,
  action: Action,
  what: string,
  refusal: string,
  source: IdSource = {},
): void {
  if (!can.read) throw notFound(what, source);
  if (!can[action]) throw forbidden(refusal, source);
}
