import path from "node:path";
import { pathToFileURL } from "node:url";
import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import type { Db } from "./client";
import { demoPeople, demoWorkspaces, passwordHashCost } from "./demo-world";
import { memberships, users, workspaces } from "./schema";

export interface SeedSummary {
  readonly workspacesCreated: number;
  readonly usersCreated: number;
  readonly membershipsCreated: number;
}

/**
 * Create the demo world if it is missing. Idempotent: rows are matched by their
 * natural keys (workspace slug, user e-mail, user + workspace) and inserted with
 * ON CONFLICT DO NOTHING, so running it again adds nothing and never changes a
 * password someone has since set.
 */
export function seedDemoWorld(db: Db): SeedSummary {
  let workspacesCreated = 0;
  let usersCreated = 0;
  let membershipsCreated = 0;

  // Hash only for people not there yet: bcrypt at cost 12 is deliberately slow.
  const existingEmails = new Set(
    db
      .select({ email: users.email })
      .from(users)
      .all()
      .map((row) => row.email),
  );
  const hashes = new Map(
    demoPeople
      .filter((person) => !existingEmails.has(person.email))
      .map((person) => [person.email, bcrypt.hashSync(person.password, passwordHashCost)]),
  );

  db.transaction((tx) => {
    const workspaceIds = new Map<string, string>();
    for (const workspace of demoWorkspaces) {
      const inserted = tx
        .insert(workspaces)
        .values(workspace)
        .onConflictDoNothing({ target: workspaces.slug })
        .run();
      workspacesCreated += inserted.changes;
      const row = tx
        .select({ id: workspaces.id })
        .from(workspaces)
        .where(eq(workspaces.slug, workspace.slug))
        .get();
      if (!row) throw new Error(`seed: workspace ${workspace.slug} missing after insert`);
      workspaceIds.set(workspace.slug, row.id);
    }

    for (const person of demoPeople) {
      const passwordHash = hashes.get(person.email);
      if (passwordHash) {
        const inserted = tx
          .insert(users)
          .values({ email: person.email, name: person.name, passwordHash })
          .onConflictDoNothing({ target: users.email })
          .run();
        usersCreated += inserted.changes;
      }
      const user = tx
        .select({ id: users.id })
        .from(users)
        .where(eq(users.email, person.email))
        .get();
      if (!user) throw new Error(`seed: user ${person.email} missing after insert`);

      for (const membership of person.memberships) {
        const workspaceId = workspaceIds.get(membership.workspace);
        if (!workspaceId) throw new Error(`seed: unknown workspace ${membership.workspace}`);
        const inserted = tx
          .insert(memberships)
          .values({ userId: user.id, workspaceId, role: membership.role })
          .onConflictDoNothing({ target: [memberships.userId, memberships.workspaceId] })
          .run();
        membershipsCreated += inserted.changes;
      }
    }
  });

  return { workspacesCreated, usersCreated, membershipsCreated };
}

// `tsx db/seed.ts` (npm run db:seed): seed the configured database.
if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  const { getDb, closeDb, databasePathFrom } = await import("./client");
  const summary = seedDemoWorld(getDb());
  closeDb();
  console.log(
    `seeded ${databasePathFrom(process.env.DATABASE_URL)}: ` +
      `${summary.workspacesCreated} workspaces, ${summary.usersCreated} users, ` +
      `${summary.membershipsCreated} memberships created`,
  );
}
