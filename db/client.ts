import { mkdirSync } from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { type BetterSQLite3Database, drizzle } from "drizzle-orm/better-sqlite3";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import * as schema from "./schema";

/** The Drizzle database handle with the Benchline schema attached. */
export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

/**
 * The generated SQL migrations. Resolved from the working directory rather than
 * this file, because Next bundles server code into .next/ where the source
 * location is gone; every entry point (next, tsx scripts, vitest) runs from the
 * project root. MIGRATIONS_DIR overrides it.
 */
export function migrationsFolder(): string {
  return path.resolve(process.env.MIGRATIONS_DIR ?? "db/migrations");
}

/** Apply every migration not yet applied (drizzle records them in __drizzle_migrations). */
export function migrateDatabase(db: BetterSQLite3Database<Record<string, unknown>>): void {
  migrate(db, { migrationsFolder: migrationsFolder() });
}

/** Where the database lives unless DATABASE_URL says otherwise (relative to the working directory). */
export const defaultDatabasePath = "data/benchline.db";

/**
 * Turn DATABASE_URL into a file path. Accepts a plain path, `file:path` or
 * `file://path`, and `:memory:`.
 */
export function databasePathFrom(url: string | undefined): string {
  const value = url?.trim() || defaultDatabasePath;
  if (value === ":memory:") return value;
  if (value.startsWith("file://")) return value.slice("file://".length);
  if (value.startsWith("file:")) return value.slice("file:".length);
  return value;
}

/**
 * Open one SQLite connection with the settings every Benchline process relies on:
 * WAL so readers never block the writer, foreign keys enforced (SQLite leaves
 * them off by default), and a busy timeout so the dev server, the seed script
 * and tests can share a file without "database is locked" errors.
 *
 * Durability: `synchronous = FULL`, set explicitly rather than left to the
 * build default of the SQLite inside better-sqlite3 (FULL in 12.x, checked by
 * test/api/durability.test.ts). SQLite's synchronous setting belongs to the
 * connection, not to a table, and a Benchline process has one connection, so
 * the choice covers every table at once. In WAL mode NORMAL already survives a
 * crash or kill -9 of the process (a commit is in the WAL, in the OS's cache),
 * but a power cut or OS crash may roll back the last commits. FULL syncs the
 * WAL to disk at every commit, so an acknowledged write also survives those.
 * Nearly everything is written at the pace of people (a sign-up, a save, a
 * run started), where one fsync per commit (about 5 ms here) costs nothing.
 * The exception is the run pool's bookkeeping (run started, verdict stored,
 * suite progress: several commits per scenario, at machine pace), which
 * better-sqlite3 commits on the event loop: under FULL those fsyncs stalled
 * every request, so they are written with `withNormalSync`. A power cut can then
 * at worst lose a run's last progress; the run row itself was committed under
 * FULL when it was created, so at the next start it is ended as interrupted
 * (never shown with a wrong verdict), and a replay of the same revision,
 * scenario and seed gives the identical result. test/api/durability.test.ts
 * kills a writing process with SIGKILL and checks every acknowledged write.
 */
export function openDatabase(filePath: string, options: { migrate?: boolean } = {}): Db {
  if (filePath !== ":memory:") mkdirSync(path.dirname(path.resolve(filePath)), { recursive: true });
  const sqlite = new Database(filePath);
  sqlite.pragma("journal_mode = WAL");
  sqlite.pragma("synchronous = FULL");
  sqlite.pragma("foreign_keys = ON");
  sqlite.pragma("busy_timeout = 5000");
  const db = drizzle({ client: sqlite, schema });
  if (options.migrate ?? true) migrateDatabase(db);
  return db;
}

/**
 * Commit machine-paced writes (the run pool's progress and verdicts) with
 * synchronous = NORMAL, then restore FULL; see openDatabase for why. Inside an
 * open transaction the setting cannot change, so it writes as it is.
 */
export function withNormalSync<T>(db: Db, write: () => T): T {
  const client = db.$client;
  if (client.inTransaction) return write();
  client.pragma("synchronous = NORMAL");
  try {
    return write();
  } finally {
    client.pragma("synchronous = FULL");
  }
}

// Next's dev server re-evaluates modules on every edit; keeping the connection on
// globalThis stops each hot reload from opening (and leaking) another handle.
const globalForDb = globalThis as typeof globalThis & {
  __benchlineDb?: { path: string; db: Db };
};

/**
 * The process-wide connection, opened (and migrated) on first use. The path
 * comes from DATABASE_URL, default `data/benchline.db`; the folder is created.
 */
export function getDb(): Db {
  const filePath = databasePathFrom(process.env.DATABASE_URL);
  const cached = globalForDb.__benchlineDb;
  if (cached && cached.path === filePath) return cached.db;
  cached?.db.$client.close();
  const db = openDatabase(filePath);
  globalForDb.__benchlineDb = { path: filePath, db };
  return db;
}

/** Close the process-wide connection (scripts and tests call this before exiting). */
export function closeDb(): void {
  globalForDb.__benchlineDb?.db.$client.close();
  delete globalForDb.__benchlineDb;
}
