import { readFileSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import bcrypt from "bcryptjs";
import { and, eq, isNull } from "drizzle-orm";
import type { Db } from "./client";
import { demoPeople, demoWorkspaces, passwordHashCost, type DemoWorkspaceSlug } from "./demo-world";
import {
  benches,
  benchRevisions,
  memberships,
  scenarios,
  suites,
  suiteScenarios,
  users,
  workspaces,
} from "./schema";

export interface SeedSummary {
  readonly workspacesCreated: number;
  readonly usersCreated: number;
  readonly membershipsCreated: number;
  readonly benchesCreated: number;
  readonly scenariosCreated: number;
  readonly suitesCreated: number;
}

/**
 * Where the shipped demo benches and scenarios go: each bench file into one
 * workspace, with the scenarios of one folder, created by the member who would
 * have written them. Paths are relative to scenarios/.
 */
export const demoContent: readonly {
  readonly workspace: DemoWorkspaceSlug;
  readonly benchFile: string;
  readonly scenarioFolder: string;
  readonly authorEmail: string;
}[] = [
  {
    workspace: "fernhill",
    benchFile: "benches/fernhill-training-centre.bench.json",
    scenarioFolder: "fernhill/",
    authorEmail: "ada.trainer@fernhill.example",
  },
  {
    workspace: "quayside-dental",
    benchFile: "benches/quayside-dental-level-2.bench.json",
    scenarioFolder: "quayside/",
    authorEmail: "tomas.engineer@fernhill.example",
  },
  {
    workspace: "wrenhallow",
    benchFile: "benches/wrenhallow-hotel.bench.json",
    scenarioFolder: "wrenhallow/",
    authorEmail: "tomas.engineer@fernhill.example",
  },
];

/** The shipped suite file; each workspace gets the part of it that runs on its bench. */
export const demoSuiteFile = "demo.suite.json";

/** scenarios/ from the working directory (every entry point runs from the project root). */
export function demoContentRoot(): string {
  return path.resolve(process.env.DEMO_CONTENT_DIR ?? "scenarios");
}

function readJsonFile(file: string): Record<string, unknown> {
  return JSON.parse(readFileSync(file, "utf8")) as Record<string, unknown>;
}

/**
 * Store the shipped benches, scenarios and suite in the demo workspaces.
 * Idempotent by natural keys: a shared bench by workspace + name, a scenario
 * by bench + name, a suite by workspace + name; existing rows are left as they
 * are (a demo user's edits survive a re-seed). A scenario's `bench` reference
 * becomes the bench's name, since in the app the scenario row names its bench.
 */
export function seedDemoContent(
  db: Db,
  root: string = demoContentRoot(),
): Pick<SeedSummary, "benchesCreated" | "scenariosCreated" | "suitesCreated"> {
  let benchesCreated = 0;
  let scenariosCreated = 0;
  let suitesCreated = 0;
  const suite = readJsonFile(path.join(root, demoSuiteFile)) as {
    name: string;
    description?: string;
    scenarios: string[];
  };

  db.transaction((tx) => {
    for (const content of demoContent) {
      const workspace = tx
        .select({ id: workspaces.id })
        .from(workspaces)
        .where(eq(workspaces.slug, content.workspace))
        .get();
      if (!workspace) throw new Error(`seed: workspace ${content.workspace} missing`);
      const author = tx
        .select({ id: users.id })
        .from(users)
        .where(eq(users.email, content.authorEmail))
        .get();

      const benchText = readFileSync(path.join(root, content.benchFile), "utf8");
      const benchDocument = JSON.parse(benchText) as { name: string; description?: string };
      let bench = tx
        .select()
        .from(benches)
        .where(
          and(
            eq(benches.workspaceId, workspace.id),
            eq(benches.name, benchDocument.name),
            isNull(benches.privateOwnerId),
          ),
        )
        .get();
      if (!bench) {
        bench = tx
          .insert(benches)
          .values({
            workspaceId: workspace.id,
            name: benchDocument.name,
            description: benchDocument.description ?? "",
            createdBy: author?.id,
          })
          .returning()
          .get();
        tx.insert(benchRevisions)
          .values({
            benchId: bench.id,
            number: 1,
            document: benchText,
            authorId: author?.id,
            summary: "Shipped demo bench",
          })
          .run();
        benchesCreated += 1;
      }

      const scenarioIds: string[] = [];
      for (const file of suite.scenarios.filter((f) => f.startsWith(content.scenarioFolder))) {
        const document = readJsonFile(path.join(root, file));
        const name = String(document.name);
        const existing = tx
          .select({ id: scenarios.id })
          .from(scenarios)
          .where(and(eq(scenarios.benchId, bench.id), eq(scenarios.name, name)))
          .get();
        if (existing) {
          scenarioIds.push(existing.id);
          continue;
        }
        const stored = { ...document, bench: { name: benchDocument.name } };
        const row = tx
          .insert(scenarios)
          .values({
            workspaceId: workspace.id,
            benchId: bench.id,
            name,
            document: `${JSON.stringify(stored, null, 2)}\n`,
            createdBy: author?.id,
          })
          .returning({ id: scenarios.id })
          .get();
        scenarioIds.push(row.id);
        scenariosCreated += 1;
      }

      const existingSuite = tx
        .select({ id: suites.id })
        .from(suites)
        .where(and(eq(suites.workspaceId, workspace.id), eq(suites.name, suite.name)))
        .get();
      if (!existingSuite && scenarioIds.length > 0) {
        const created = tx
          .insert(suites)
          .values({
            workspaceId: workspace.id,
            name: suite.name,
            description: suite.description ?? "",
            createdBy: author?.id,
          })
          .returning({ id: suites.id })
          .get();
        scenarioIds.forEach((scenarioId, position) =>
          tx.insert(suiteScenarios).values({ suiteId: created.id, scenarioId, position }).run(),
        );
        suitesCreated += 1;
      }
    }
  });
  return { benchesCreated, scenariosCreated, suitesCreated };
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

  return { workspacesCreated, usersCreated, membershipsCreated, ...seedDemoContent(db) };
}

// `tsx db/seed.ts` (npm run db:seed): seed the configured database.
if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  const { getDb, closeDb, databasePathFrom } = await import("./client");
  const summary = seedDemoWorld(getDb());
  closeDb();
  console.log(
    `seeded ${databasePathFrom(process.env.DATABASE_URL)}: ` +
      `${summary.workspacesCreated} workspaces, ${summary.usersCreated} users, ` +
      `${summary.membershipsCreated} memberships, ${summary.benchesCreated} benches, ` +
      `${summary.scenariosCreated} scenarios, ${summary.suitesCreated} suites created`,
  );
}
