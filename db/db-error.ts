/**
 * Driver failures the app expects and handles, as one closed set of codes
 * (`kind:surface`), so callers never inspect SQLite's own error strings.
 * Anything not listed here is a bug and is rethrown unchanged.
 */
export type DbErrorCode = "conflict:database" | "not_found:database" | "invalid_reference:database";

export class DbError extends Error {
  readonly code: DbErrorCode;
  constructor(code: DbErrorCode, message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = "DbError";
    this.code = code;
  }
}

/** Map a better-sqlite3 constraint error onto a DbError; rethrow anything else. */
export function wrapDriverError(error: unknown, what: string): never {
  const code = (error as { code?: unknown } | null)?.code;
  if (code === "SQLITE_CONSTRAINT_UNIQUE" || code === "SQLITE_CONSTRAINT_PRIMARYKEY") {
    throw new DbError("conflict:database", `${what}: already exists`, { cause: error });
  }
  if (code === "SQLITE_CONSTRAINT_FOREIGNKEY") {
    throw new DbError(
      "invalid_reference:database",
      `${what}: refers to a row that does not exist`,
      {
        cause: error,
      },
    );
  }
  throw error;
}
