import type { Db } from "./client";

/**
 * A query prepared once per database connection and reused. Building a Drizzle
 * query (walking the schema objects, rendering SQL, asking SQLite to compile
 * it) cost more than running it on the hot read paths (every request checks
 * the session; lists run on every page), so those queries are built once with
 * placeholders. Keyed weakly by the connection: tests and scripts that reopen
 * the database get fresh statements, and a closed connection's are dropped.
 */
export function preparedPer<T>(build: (db: Db) => T): (db: Db) => T {
  const byDb = new WeakMap<Db, T>();
  return (db) => {
    let statement = byDb.get(db);
    if (statement === undefined) {
      statement = build(db);
      byDb.set(db, statement);
    }
    return statement;
  };
}
