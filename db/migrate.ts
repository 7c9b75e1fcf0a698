import path from "node:path";
import { pathToFileURL } from "node:url";
import { closeDb, databasePathFrom, getDb } from "./client";

/**
 * `tsx db/migrate.ts` (npm run db:migrate): apply pending migrations to the
 * database named by DATABASE_URL. The app does the same on its first connection
 * (getDb), so this is for set-up scripts and deployments that migrate up front.
 */
export function migrateConfiguredDatabase(): string {
  getDb(); // opening the connection applies pending migrations
  closeDb();
  return databasePathFrom(process.env.DATABASE_URL);
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  console.log(`migrated ${migrateConfiguredDatabase()}`);
}
