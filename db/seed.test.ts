import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import bcrypt from "bcryptjs";
import { count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { type Db, openDatabase } from "./client";
import { demoPeople, demoWorkspaces } from "./demo-world";
import { findMembership } from "./queries/memberships";
import { findUserByEmail } from "./queries/users";
import { findWorkspaceBySlug } from "./queries/workspaces";
import {
  benches,
  benchRevisions,
  memberships,
  roles,
  scenarios,
  suites,
  suiteScenarios,
  users,
  workspaces,
} from "./schema";
import { demoContent, demoContentRoot, demoSuiteFile, seedDemoWorld } from "./seed";

const shippedSuite = JSON.parse(
  readFileSync(path.join(demoContentRoot(), demoSuiteFile), "utf8"),
) as { name: string; scenarios: string[] };

// Seeding hashes every demo password with bcrypt at cost 12 (slow by design, about
// 0.25 s each on this machine's cores), so these tests get more than vitest's 5 s.
const bcryptTimeoutMs = 60_000;

describe("migrations and demo seed on a fresh database", () => {
  let dir: string;
  let db: Db;

  beforeAll(() => {
    dir = mkdtempSync(path.join(tmpdir(), "benchline-db-"));
    db = openDatabase(path.join(dir, "test.db"));
  });

  afterAll(() => {
    db.$client.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it("applies every migration with the connection settings the app relies on", () => {
    // SQLite docs (pragma.html): WAL journal, enforced foreign keys, busy timeout in ms.
    expect(db.$client.pragma("journal_mode", { simple: true })).toBe("wal");
    expect(db.$client.pragma("foreign_keys", { simple: true })).toBe(1);
    expect(db.$client.pragma("busy_timeout", { simple: true })).toBe(5000);
    const tables = db.$client
      .prepare("select name from sqlite_master where type = 'table'")
      .all()
      .map((row) => (row as { name: string }).name);
    expect(tables).toEqual(
      expect.arrayContaining(["workspaces", "users", "memberships", "benches", "bench_revisions"]),
    );
    expect(tables).toEqual(
      expect.arrayContaining(["scenarios", "runs", "uploads", "email_outbox", "lab_attempts"]),
    );
  });

  it(
    "seeds twice without duplicating anything",
    () => {
      const first = seedDemoWorld(db);
      expect(first).toEqual({
        workspacesCreated: demoWorkspaces.length,
        usersCreated: demoPeople.length,
        membershipsCreated: demoPeople.flatMap((p) => p.memberships).length,
        benchesCreated: demoContent.length,
        scenariosCreated: shippedSuite.scenarios.length,
        suitesCreated: demoContent.length,
      });
      const second = seedDemoWorld(db);
      expect(second).toEqual({
        workspacesCreated: 0,
        usersCreated: 0,
        membershipsCreated: 0,
        benchesCreated: 0,
        scenariosCreated: 0,
        suitesCreated: 0,
      });

      const countOf = (table: typeof workspaces | typeof users | typeof memberships) =>
        db.select({ n: count() }).from(table).get()?.n;
      expect(countOf(workspaces)).toBe(demoWorkspaces.length);
      expect(countOf(users)).toBe(demoPeople.length);
      expect(countOf(memberships)).toBe(demoPeople.flatMap((p) => p.memberships).length);
    },
    bcryptTimeoutMs,
  );

  it("gives Fernhill Training Centre one member per role, and the engineer a second workspace", () => {
    const fernhill = findWorkspaceBySlug({ db, slug: "fernhill" });
    expect(fernhill?.name).toBe("Fernhill Training Centre");
    const fernhillRoles = db
      .select({ role: memberships.role })
      .from(memberships)
      .where(eq(memberships.workspaceId, fernhill!.id))
      .all()
      .map((row) => row.role)
      .sort();
    expect(fernhillRoles).toEqual([...roles].sort());

    const quayside = findWorkspaceBySlug({ db, slug: "quayside-dental" });
    const engineer = findUserByEmail({ db, email: "Tomas.Engineer@fernhill.example " });
    expect(findMembership({ db, userId: engineer!.id, workspaceId: quayside!.id })?.role).toBe(
      "engineer",
    );
  });

  it("stores the shipped benches, scenarios and suite in the demo workspaces", () => {
    const fernhill = findWorkspaceBySlug({ db, slug: "fernhill" })!;
    const quayside = findWorkspaceBySlug({ db, slug: "quayside-dental" })!;
    const benchNames = (workspaceId: string) =>
      db
        .select({ name: benches.name })
        .from(benches)
        .where(eq(benches.workspaceId, workspaceId))
        .all()
        .map((row) => row.name);
    expect(benchNames(fernhill.id)).toEqual(["Fernhill Training Centre"]);
    expect(benchNames(quayside.id)).toEqual(["Quayside Dental, level 2"]);
    const wrenhallow = findWorkspaceBySlug({ db, slug: "wrenhallow" })!;
    expect(benchNames(wrenhallow.id)).toEqual(["Wrenhallow Hotel"]);
    // One revision per bench, holding the shipped file unchanged.
    const revisions = db.select().from(benchRevisions).all();
    expect(revisions.map((r) => r.number)).toEqual([1, 1, 1]);
    expect(JSON.parse(revisions[0]!.document).format).toBe(
      (
        JSON.parse(
          readFileSync(path.join(demoContentRoot(), demoContent[0]!.benchFile), "utf8"),
        ) as { format: number }
      ).format,
    );

    const scenarioCount = (workspaceId: string) =>
      db.select({ n: count() }).from(scenarios).where(eq(scenarios.workspaceId, workspaceId)).get()
        ?.n;
    const fernhillFiles = shippedSuite.scenarios.filter((f) => f.startsWith("fernhill/"));
    expect(scenarioCount(fernhill.id)).toBe(fernhillFiles.length);
    const inFolder = (folder: string) =>
      shippedSuite.scenarios.filter((f) => f.startsWith(folder)).length;
    expect(scenarioCount(quayside.id)).toBe(inFolder("quayside/"));
    expect(scenarioCount(wrenhallow.id)).toBe(inFolder("wrenhallow/"));
    expect(fernhillFiles.length + inFolder("quayside/") + inFolder("wrenhallow/")).toBe(
      shippedSuite.scenarios.length,
    );

    // The suite keeps the shipped order, per workspace.
    const suite = db.select().from(suites).where(eq(suites.workspaceId, fernhill.id)).get()!;
    expect(suite.name).toBe(shippedSuite.name);
    const ordered = db
      .select({ name: scenarios.name, document: scenarios.document })
      .from(suiteScenarios)
      .innerJoin(scenarios, eq(suiteScenarios.scenarioId, scenarios.id))
      .where(eq(suiteScenarios.suiteId, suite.id))
      .orderBy(suiteScenarios.position)
      .all();
    const expectedNames = fernhillFiles.map(
      (file) =>
        (JSON.parse(readFileSync(path.join(demoContentRoot(), file), "utf8")) as { name: string })
          .name,
    );
    expect(ordered.map((row) => row.name)).toEqual(expectedNames);
    // In the app a scenario names its bench by name, not by a file path.
    expect(JSON.parse(ordered[0]!.document).bench).toEqual({ name: "Fernhill Training Centre" });
  });

  it(
    "stores only bcrypt hashes of the demo passwords",
    () => {
      for (const person of demoPeople) {
        const user = findUserByEmail({ db, email: person.email });
        expect(user?.passwordHash).not.toContain(person.password);
        // bcrypt modular crypt format: $2a$/$2b$, two-digit cost, 53 more characters.
        expect(user?.passwordHash).toMatch(/^\$2[ab]\$12\$[./A-Za-z0-9]{53}$/);
        expect(bcrypt.compareSync(person.password, user!.passwordHash)).toBe(true);
      }
    },
    bcryptTimeoutMs,
  );

  it("refuses a second membership of the same user in the same workspace", () => {
    const fernhill = findWorkspaceBySlug({ db, slug: "fernhill" })!;
    const trainer = findUserByEmail({ db, email: "ada.trainer@fernhill.example" })!;
    expect(() =>
      db
        .insert(memberships)
        .values({ userId: trainer.id, workspaceId: fernhill.id, role: "qa" })
        .run(),
    ).toThrow(/UNIQUE/);
  });

  it("enforces foreign keys", () => {
    expect(() =>
      db
        .insert(memberships)
        .values({ userId: "no-such-user", workspaceId: "no-such-workspace", role: "qa" })
        .run(),
    ).toThrow(/FOREIGN KEY/);
  });
});
