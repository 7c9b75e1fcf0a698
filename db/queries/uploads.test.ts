import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import { eq } from "drizzle-orm";
import { drizzle } from "drizzle-orm/better-sqlite3";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { type Db, migrationsFolder, openDatabase } from "../client";
import { benches, uploads } from "../schema";
import { createBench } from "./benches";
import { findFloorPlan, removeFloorPlan, replaceFloorPlan } from "./uploads";
import { createUser } from "./users";
import { createWorkspace } from "./workspaces";

// FIPS 180-2 appendix B.1: SHA-256("abc").
const ABC_SHA256 = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad";

describe("floor-plan uploads", () => {
  let dir: string;
  let db: Db;
  let workspaceId: string;
  let otherWorkspaceId: string;
  let benchId: string;
  let userId: string;

  beforeAll(() => {
    dir = mkdtempSync(path.join(tmpdir(), "benchline-uploads-"));
    db = openDatabase(path.join(dir, "test.db"));
    workspaceId = createWorkspace({ db, values: { slug: "north", name: "North" } }).id;
    otherWorkspaceId = createWorkspace({ db, values: { slug: "south", name: "South" } }).id;
    userId = createUser({
      db,
      values: { email: "drafter@north.example", name: "Drafter", passwordHash: "x" },
    }).id;
    benchId = createBench({
      db,
      values: { workspaceId, name: "Plant room", createdBy: userId },
      document: "{}",
    }).bench.id;
  });

  afterAll(() => {
    db.$client.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it("stores a plan on its bench with its hash, and a new one replaces it", () => {
    const first = replaceFloorPlan({
      db,
      workspaceId,
      benchId,
      uploadedBy: userId,
      contentType: "image/png",
      content: Buffer.from("abc"),
    });
    expect(first.sha256).toBe(ABC_SHA256);
    const stored = findFloorPlan({ db, workspaceId, benchId });
    expect(stored).toMatchObject({
      benchId,
      purpose: "floor-plan",
      fileName: "floor-plan.png",
      sizeBytes: 3,
    });
    replaceFloorPlan({
      db,
      workspaceId,
      benchId,
      uploadedBy: userId,
      contentType: "image/svg+xml",
      content: Buffer.from("<svg/>"),
    });
    const rows = db.select().from(uploads).where(eq(uploads.benchId, benchId)).all();
    expect(rows.map((r) => r.fileName)).toEqual(["floor-plan.svg"]);
  });

  it("never answers for another workspace", () => {
    expect(findFloorPlan({ db, workspaceId: otherWorkspaceId, benchId })).toBeUndefined();
    expect(removeFloorPlan({ db, workspaceId: otherWorkspaceId, benchId })).toBe(false);
    expect(findFloorPlan({ db, workspaceId, benchId })).toBeDefined();
  });

  it("refuses a second floor-plan row on one bench and a purpose without a bench", () => {
    const row = {
      workspaceId,
      fileName: "x.png",
      contentType: "image/png",
      sizeBytes: 1,
      sha256: "0",
      content: Buffer.from("x"),
    };
    expect(() =>
      db
        .insert(uploads)
        .values({ ...row, benchId, purpose: "floor-plan" })
        .run(),
    ).toThrow(/UNIQUE/);
    expect(() =>
      db
        .insert(uploads)
        .values({ ...row, purpose: "floor-plan" })
        .run(),
    ).toThrow(/CHECK/);
    // A plain upload (an import file) has neither.
    expect(() => db.insert(uploads).values(row).run()).not.toThrow();
  });

  it("removes the plan, and it goes with its bench", () => {
    expect(removeFloorPlan({ db, workspaceId, benchId })).toBe(true);
    expect(findFloorPlan({ db, workspaceId, benchId })).toBeUndefined();
    replaceFloorPlan({
      db,
      workspaceId,
      benchId,
      uploadedBy: userId,
      contentType: "image/jpeg",
      content: Buffer.from([0xff, 0xd8, 0xff]),
    });
    // SQLite docs (foreignkeys.html §4.3): ON DELETE CASCADE deletes the child rows.
    db.delete(benches).where(eq(benches.id, benchId)).run();
    expect(db.select().from(uploads).where(eq(uploads.benchId, benchId)).all()).toEqual([]);
  });
});

describe("migration 0002 on a database with floor plans kept by file name", () => {
  it("moves each plan onto its bench and drops one whose bench is gone", () => {
    const dir = mkdtempSync(path.join(tmpdir(), "benchline-migration-"));
    try {
      // The migrations folder with its journal cut back to before 0002.
      const folder = path.join(dir, "migrations");
      cpSync(migrationsFolder(), folder, { recursive: true });
      const journalPath = path.join(folder, "meta/_journal.json");
      const journalText = readFileSync(journalPath, "utf8");
      const journal = JSON.parse(journalText) as { entries: { tag: string }[] };
      const before = journal.entries.findIndex((e) => e.tag.startsWith("0002_"));
      expect(before).toBeGreaterThan(0);
      writeFileSync(
        journalPath,
        JSON.stringify({ ...journal, entries: journal.entries.slice(0, before) }),
      );
      const sqlite = new Database(path.join(dir, "old.db"));
      sqlite.pragma("foreign_keys = ON");
      const old = drizzle({ client: sqlite });
      migrate(old, { migrationsFolder: folder });
      sqlite.exec(`
        insert into workspaces (id, slug, name, created_at) values ('w1', 'w', 'W', 0);
        insert into benches (id, workspace_id, name, description, created_at, updated_at)
          values ('b1', 'w1', 'B', '', 0, 0);
        insert into uploads (id, workspace_id, file_name, content_type, size_bytes, sha256, content, created_at) values
          ('u1', 'w1', 'floor-plan:b1', 'image/png', 3, 's', x'616263', 1),
          ('u2', 'w1', 'floor-plan:gone', 'image/png', 3, 's', x'616263', 2),
          ('u3', 'w1', 'hall.bench.json', 'application/json', 2, 's', x'7b7d', 3);
      `);
      writeFileSync(journalPath, journalText);
      migrate(old, { migrationsFolder: folder });
      expect(
        sqlite.prepare("select id, bench_id, purpose, file_name from uploads order by id").all(),
      ).toEqual([
        { id: "u1", bench_id: "b1", purpose: "floor-plan", file_name: "floor-plan.png" },
        { id: "u3", bench_id: null, purpose: null, file_name: "hall.bench.json" },
      ]);
      sqlite.close();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
