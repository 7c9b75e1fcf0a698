import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";

/**
 * Liveness and database check for deployments and the browser test: opens the
 * connection (which applies pending migrations) and runs one query. Says nothing
 * about workspaces or users, so it needs no session.
 */
export function GET() {
  const db = getDb();
  const row = db.get<{ migrations: number }>(
    sql`select count(*) as migrations from __drizzle_migrations`,
  );
  return Response.json(
    { ok: true, migrations: row.migrations },
    { headers: { "Cache-Control": "no-store" } },
  );
}
