import type { z } from "zod";
import { DbError } from "@/db/db-error";

/**
 * Every failure the app answers on purpose, as one closed set of codes. Each
 * code has exactly one HTTP status; anything that is not an AppError (or a
 * DbError the mapper knows) is a bug and becomes a 500 without details.
 */
export const appErrorStatus = {
  /** The body is not JSON at all. */
  invalid_json: 400,
  /** The body (or a query or form field) failed validation; `field` names it. */
  invalid_input: 400,
  /** The body is larger than the route accepts. */
  body_too_large: 413,
  /** A JSON route was sent something else. */
  unsupported_media_type: 415,
  /** No valid session (missing, tampered, expired or ended cookie). */
  unauthenticated: 401,
  /** Sign-in failed; deliberately says nothing about which part was wrong. */
  invalid_credentials: 401,
  /** A non-GET request from another origin. */
  bad_origin: 403,
  /** Signed in, but the role does not allow this. */
  forbidden: 403,
  /** Missing, or in another workspace (never told apart). */
  not_found: 404,
  /** The HTTP method is not served on this route. */
  method_not_allowed: 405,
  /** Clashes with existing data (duplicate, stale revision, in use). */
  conflict: 409,
  /** Too many attempts; try again later. */
  rate_limited: 429,
  /** A bug; details go to the server log only. */
  internal: 500,
} as const satisfies Record<string, number>;

export type AppErrorCode = keyof typeof appErrorStatus;

export interface AppErrorBody {
  readonly error: {
    readonly code: AppErrorCode;
    readonly message: string;
    /** The input field at fault, as a dotted path ("document.devices[2].name"). */
    readonly field?: string;
  };
}

export class AppError extends Error {
  readonly code: AppErrorCode;
  readonly field: string | undefined;
  constructor(code: AppErrorCode, message: string, options?: { field?: string; cause?: unknown }) {
    super(message, { cause: options?.cause });
    this.name = "AppError";
    this.code = code;
    this.field = options?.field;
  }

  get status(): number {
    return appErrorStatus[this.code];
  }

  toBody(): AppErrorBody {
    return {
      error: {
        code: this.code,
        message: this.message,
        ...(this.field === undefined ? {} : { field: this.field }),
      },
    };
  }
}

/** "document", 2, "name" -> "document[2].name"; the root is "(body)". */
export function fieldPath(path: readonly PropertyKey[]): string {
  let out = "";
  for (const part of path) {
    if (typeof part === "number") out += `[${part}]`;
    else out += out === "" ? String(part) : `.${String(part)}`;
  }
  return out === "" ? "(body)" : out;
}

/**
 * A zod failure as an AppError naming the first field at fault. Unknown keys
 * of a strict object are named individually ("unknown field \"colour\"").
 */
export function validationError(error: z.ZodError, prefix: readonly PropertyKey[] = []): AppError {
  const issue = error.issues[0];
  if (!issue) return new AppError("invalid_input", "invalid input");
  if (issue.code === "unrecognized_keys") {
    const key = issue.keys[0] ?? "";
    const field = fieldPath([...prefix, ...issue.path, key]);
    return new AppError("invalid_input", `${field}: unknown field "${key}"`, { field });
  }
  const field = fieldPath([...prefix, ...issue.path]);
  return new AppError("invalid_input", `${field}: ${issue.message}`, { field });
}

/** Turn a known DbError into the matching AppError. */
function fromDbError(error: DbError): AppError {
  switch (error.code) {
    case "conflict:database":
      return new AppError("conflict", error.message, { cause: error });
    case "not_found:database":
      return new AppError("not_found", error.message, { cause: error });
    case "invalid_reference:database":
      return new AppError("invalid_input", error.message, { cause: error });
  }
}

/** Anything thrown, as an AppError; unknown errors are logged and become "internal". */
export function toAppError(error: unknown): AppError {
  if (error instanceof AppError) return error;
  if (error instanceof DbError) return fromDbError(error);
  console.error("unexpected error in a request", error);
  return new AppError("internal", "something went wrong on the server");
}

/** The one mapper from an error to a JSON Response. Never includes a stack trace. */
export function errorResponse(error: unknown, init?: { headers?: HeadersInit }): Response {
  const appError = toAppError(error);
  const headers = new Headers(init?.headers);
  headers.set("Cache-Control", "no-store");
  return Response.json(appError.toBody(), { status: appError.status, headers });
}
