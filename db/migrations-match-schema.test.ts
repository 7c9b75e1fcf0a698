import { is } from "drizzle-orm";
import { getTableConfig, SQLiteTable } from "drizzle-orm/sqlite-core";
import { afterAll, describe, expect, it } from "vitest";
import { openDatabase } from "./client";
import * as schema from "./schema";

/*
 * drizzle-kit writes ALTER TABLE ... ADD ... REFERENCES without the ON DELETE
 * action, so a migration can leave the database with a different foreign key
 * than db/schema.ts declares. This compares what the migrations build with what
 * the schema says, for every foreign key.
 */
const db = openDatabase(":memory:");
afterAll(() => db.$client.close());

const tables: SQLiteTable[] = Object.values(schema as Record<string, unknown>).filter(
  (value): value is SQLiteTable => is(value, SQLiteTable),
);

interface ForeignKeyRow {
  table: string;
  from: string;
  to: string;
  on_delete: string;
}

describe("migrations build the database the schema declares", () => {
  it.each(tables.map((table) => [getTableConfig(table).name, table] as const))(
    "%s has the schema's foreign keys with their delete actions",
    (name, table) => {
      const declared = getTableConfig(table)
        .foreignKeys.map((foreignKey) => {
          const reference = foreignKey.reference();
          return {
            from: reference.columns.map((column) => column.name).join(","),
            table: getTableConfig(reference.foreignTable).name,
            to: reference.foreignColumns.map((column) => column.name).join(","),
            onDelete: (foreignKey.onDelete ?? "no action").toUpperCase(),
          };
        })
        .sort((a, b) => a.from.localeCompare(b.from));
      const built = (
        db.$client
          .prepare(`select "table", "from", "to", on_delete from pragma_foreign_key_list(?)`)
          .all(name) as ForeignKeyRow[]
      )
        .map((row) => ({ from: row.from, table: row.table, to: row.to, onDelete: row.on_delete }))
        .sort((a, b) => a.from.localeCompare(b.from));
      expect(built).toEqual(declared);
    },
  );
});
