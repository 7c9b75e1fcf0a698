import { defineConfig } from "drizzle-kit";

// Used only by `npm run db:generate` (drizzle-kit generate): SQL migrations are
// generated from db/schema.ts, committed under db/migrations and never edited
// after they land. The app applies them itself at start-up (db/migrate.ts).
export default defineConfig({
  dialect: "sqlite",
  schema: "./db/schema.ts",
  out: "./db/migrations",
  dbCredentials: { url: process.env.DATABASE_URL ?? "data/benchline.db" },
  strict: true,
  verbose: true,
});
