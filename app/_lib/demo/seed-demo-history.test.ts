import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { type Db, openDatabase } from "@/db/client";
import { findBench, latestRevision } from "@/db/queries/benches";
import { listAttempts } from "@/db/queries/labs";
import { listRunHistory, listSuiteRuns } from "@/db/queries/runs";
import { labAssignments, labs, runs } from "@/db/schema";
import { findUserByEmail } from "@/db/queries/users";
import { findWorkspaceBySlug } from "@/db/queries/workspaces";
import { seedDemoWorld } from "@/db/seed";
import { runScenario } from "@/engine";
import { parseScenarioText } from "@/engine";
import { shippedSuiteScenarioFiles } from "@/test/harness/shipped-suite";
import { parseStoredResult, verdictOf } from "../runs/stored-result";
import { practiceCopyName } from "../practice-copy-name";
import { demoLab, demoSuiteReplays, seedDemoHistory } from "./seed-demo-history";

describe("the demo history seed on a fresh database", () => {
  let dir: string;
  let db: Db;
  const seededAt = new Date("2026-12-02T04:30:00Z");

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), "benchline-history-"));
    db = openDatabase(path.join(dir, "test.db"));
    seedDemoWorld(db);
    const first = await seedDemoHistory(db, { now: seededAt });
    expect(first).toEqual({
      labsCreated: 1,
      labCopiesCreated: 1,
      practiceCopiesCreated: 1,
      attemptsCreated: 1,
      suiteRunsCreated: demoSuiteReplays.seeds.length,
    });
    // bcrypt at cost 12 for five people and 40 replays: a guard against hanging, not a speed check.
  }, 120_000);

  afterAll(() => {
    db.$client.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it("adds nothing when run again", async () => {
    expect(await seedDemoHistory(db, { now: seededAt })).toEqual({
      labsCreated: 0,
      labCopiesCreated: 0,
      practiceCopiesCreated: 0,
      attemptsCreated: 0,
      suiteRunsCreated: 0,
    });
  });

  it("assigns the apprentice the lab, due a week after seeding, on a copy with the hidden fault", () => {
    const apprentice = findUserByEmail({ db, email: demoLab.apprenticeEmail })!;
    const fernhill = findWorkspaceBySlug({ db, slug: "fernhill" })!;
    const lab = db.select().from(labs).where(eq(labs.title, demoLab.title)).get()!;
    const assignment = db
      .select()
      .from(labAssignments)
      .where(and(eq(labAssignments.labId, lab.id), eq(labAssignments.apprenticeId, apprentice.id)))
      .get()!;
    expect(assignment.dueAt?.toISOString()).toBe("2026-12-09T04:30:00.000Z");
    const copy = findBench({ db, workspaceId: fernhill.id, benchId: assignment.privateBenchId! })!;
    expect(copy.privateOwnerId).toBe(apprentice.id);
    const links = JSON.parse(latestRevision({ db, benchId: copy.id })!.document).links as {
      device: string;
      object: number;
      groupAddress: string;
    }[];
    // The hidden fault: the actuator's status object no longer sends on 1/1/1.
    expect(links).not.toContainEqual({ device: "act-lab", object: 1, groupAddress: "1/1/1" });
    const shared = findBench({ db, workspaceId: fernhill.id, benchId: lab.benchId })!;
    const sharedLinks = JSON.parse(latestRevision({ db, benchId: shared.id })!.document).links;
    expect(sharedLinks).toContainEqual({ device: "act-lab", object: 1, groupAddress: "1/1/1" });

    const names = db.$client
      .prepare("select name from benches where private_owner_id = ?")
      .all(apprentice.id)
      .map((row) => (row as { name: string }).name)
      .sort();
    expect(names).toEqual([`${lab.title} (${apprentice.name})`, practiceCopyName(shared.name)]);
  });

  it("grades the apprentice's attempt with a real replay that fails on the hidden fault", () => {
    const lab = db.select().from(labs).where(eq(labs.title, demoLab.title)).get()!;
    const assignment = db
      .select()
      .from(labAssignments)
      .where(eq(labAssignments.labId, lab.id))
      .get()!;
    const [attempt] = listAttempts({ db, assignmentIds: [assignment.id] });
    expect(attempt?.runVerdict).toBe("fail");
    const result = parseStoredResult(attempt!.runResults)!;
    const failed = result.steps.filter((step) => step.status === "fail");
    expect(failed[0]?.label).toContain("1/1/1");
  });

  it("stores verdicts that a fresh replay of the same revision, scenario and seed reproduces", () => {
    const fernhill = findWorkspaceBySlug({ db, slug: "fernhill" })!;
    const history = listRunHistory({ db, workspaceId: fernhill.id });
    // The shipped suite's Fernhill part, replayed once per seed, plus the apprentice's attempt.
    const fernhillScenarios = shippedSuiteScenarioFiles().filter((file) =>
      file.startsWith("fernhill/"),
    ).length;
    expect(history.length).toBe(fernhillScenarios * demoSuiteReplays.seeds.length + 1);
    expect(new Set(history.map((row) => row.verdict))).toEqual(new Set(["pass", "fail"]));
    const suiteRuns = listSuiteRuns({ db, workspaceId: fernhill.id });
    expect(suiteRuns.map((row) => row.suiteRun.status)).toEqual([
      "finished",
      "finished",
      "finished",
    ]);

    for (const row of db.select().from(runs).all()) {
      const scenario = parseScenarioText(row.scenarioDocument!);
      if (!scenario.ok) throw new Error(scenario.error.message);
      const revision = db.$client
        .prepare("select document from bench_revisions where id = ?")
        .get(row.benchRevisionId) as { document: string };
      const graded = row.startedBy === findUserByEmail({ db, email: demoLab.apprenticeEmail })!.id;
      const replay = runScenario(
        graded ? { ...scenario.value, expectedToFail: false } : scenario.value,
        JSON.parse(revision.document),
        { seed: row.seed },
      );
      expect(verdictOf(replay), row.scenarioName).toBe(row.verdict);
      expect(parseStoredResult(row.results)?.outcome).toBe(replay.outcome);
    }
  }, 60_000);
});
