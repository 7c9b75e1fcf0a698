import path from "node:path";
import { pathToFileURL } from "node:url";
import { and, eq, isNull } from "drizzle-orm";
import type { Db } from "@/db/client";
import { duplicateBench } from "@/db/queries/bench-history";
import { latestRevision } from "@/db/queries/benches";
import {
  createAssignments,
  createAttempt,
  createLab,
  listAttempts,
  setAssignmentBench,
} from "@/db/queries/labs";
import { listSuiteRuns } from "@/db/queries/runs";
import { listSuiteScenarios } from "@/db/queries/suites";
import { benches, labAssignments, labs, scenarios, suites, users, workspaces } from "@/db/schema";
import { practiceCopyName } from "../practice-copy-name";
import { applyHiddenFaults, type HiddenFault } from "../labs/hidden-faults";
import { createRunPool, type RunPool } from "../runs/run-pool";
import { startScenarioRun, startSuiteRun } from "../runs/run-service";

/**
 * What a first visit to the demo finds besides the shipped benches: the
 * apprentice has a lab (with a fault the trainer hid in their copy) and a
 * practice copy, and the run history holds a few replays of the demo suite and
 * the apprentice's first graded attempt. Every verdict here comes from the
 * real runner (run-service on an inline pool, the path the app takes), never
 * from written-down results.
 *
 * It lives in app/ because it stores runs in the app's result format through
 * run-service; db/ may not import app/. `npm run db:seed` runs it after
 * db/seed.ts, and the browser tests' setup calls it after seedDemoWorld.
 */

export const demoLab = {
  workspace: "fernhill",
  title: "Ceiling lights without feedback",
  brief:
    "The door rocker switches the ceiling lights, but its indicator and the status never follow. " +
    "Find out why the status goes nowhere, fix the wiring and submit.",
  trainerEmail: "ada.trainer@fernhill.example",
  apprenticeEmail: "leo.apprentice@fernhill.example",
  gradingScenarioName: "Door push-button toggles the ceiling lights",
  /** The actuator's ceiling-lights status object no longer sends on 1/1/1. */
  hiddenFaults: [
    { kind: "unlink", device: "act-lab", object: 1, groupAddress: "1/1/1" },
  ] satisfies HiddenFault[],
  /** Due a week after seeding. */
  dueInDays: 7,
} as const;

/** Who replays the demo suite, and with which seeds (null: each scenario's own). */
export const demoSuiteReplays = {
  workspace: "fernhill",
  startedByEmail: "priya.qa@fernhill.example",
  seeds: [null, 7, 42] as const,
} as const;

export interface DemoHistorySummary {
  readonly labsCreated: number;
  readonly labCopiesCreated: number;
  readonly practiceCopiesCreated: number;
  readonly attemptsCreated: number;
  readonly suiteRunsCreated: number;
}

function required<T>(value: T | undefined, what: string): T {
  if (value === undefined) throw new Error(`seed history: ${what} missing; run db/seed.ts first`);
  return value;
}

/**
 * Seed the lab, the copies, the attempt and the suite replays if they are
 * missing. Idempotent: the lab is matched by title, the copies by owner and
 * name, the attempt by assignment, the replays by any suite run existing in
 * the workspace.
 */
export async function seedDemoHistory(
  db: Db,
  options: { now?: Date; pool?: RunPool } = {},
): Promise<DemoHistorySummary> {
  const now = options.now ?? new Date();
  const pool = options.pool ?? createRunPool({ mode: "inline", size: 1 });
  try {
    return await seed(db, now, pool);
  } finally {
    if (!options.pool) await pool.close();
  }
}

async function seed(db: Db, now: Date, pool: RunPool): Promise<DemoHistorySummary> {
  const workspace = required(
    db.select().from(workspaces).where(eq(workspaces.slug, demoLab.workspace)).get(),
    `workspace ${demoLab.workspace}`,
  );
  const person = (email: string) =>
    required(db.select().from(users).where(eq(users.email, email)).get(), `user ${email}`);
  const trainer = person(demoLab.trainerEmail);
  const apprentice = person(demoLab.apprenticeEmail);
  const grading = required(
    db
      .select()
      .from(scenarios)
      .where(
        and(
          eq(scenarios.workspaceId, workspace.id),
          eq(scenarios.name, demoLab.gradingScenarioName),
        ),
      )
      .get(),
    `scenario "${demoLab.gradingScenarioName}"`,
  );
  const sharedBench = required(
    db.select().from(benches).where(eq(benches.id, grading.benchId)).get(),
    "the lab bench",
  );
  const sharedRevision = required(latestRevision({ db, benchId: sharedBench.id }), "revision");

  let labsCreated = 0;
  let labCopiesCreated = 0;
  let practiceCopiesCreated = 0;
  let attemptsCreated = 0;
  let suiteRunsCreated = 0;

  // The lab, made by the trainer, with the fault checked against the bench as the app does.
  const faulty = applyHiddenFaults(JSON.parse(sharedRevision.document), demoLab.hiddenFaults);
  if (!faulty.ok)
    throw new Error(`seed history: hidden fault does not fit: ${faulty.error.message}`);
  let lab = db
    .select()
    .from(labs)
    .where(and(eq(labs.workspaceId, workspace.id), eq(labs.title, demoLab.title)))
    .get();
  if (!lab) {
    lab = required(
      createLab({
        db,
        values: {
          workspaceId: workspace.id,
          title: demoLab.title,
          brief: demoLab.brief,
          benchId: sharedBench.id,
          gradingScenarioId: grading.id,
          hiddenFaults: JSON.stringify(demoLab.hiddenFaults),
          createdBy: trainer.id,
        },
      }),
      "the lab after insert",
    );
    labsCreated += 1;
  }

  // Assigned to the apprentice, due a week from now (to the minute).
  const dueAt = new Date(
    Math.floor((now.getTime() + demoLab.dueInDays * 86_400_000) / 60_000) * 60_000,
  );
  createAssignments({
    db,
    labId: lab.id,
    apprenticeIds: [apprentice.id],
    dueAt,
    assignedBy: trainer.id,
  });
  const assignment = required(
    db
      .select()
      .from(labAssignments)
      .where(and(eq(labAssignments.labId, lab.id), eq(labAssignments.apprenticeId, apprentice.id)))
      .get(),
    "the assignment",
  );

  // The apprentice's lab copy with the hidden fault, as opening the lab would make it.
  let labBenchId = assignment.privateBenchId;
  if (!labBenchId) {
    const copy = duplicateBench({
      db,
      source: sharedBench,
      document: JSON.stringify(faulty.value),
      name: `${lab.title} (${apprentice.name})`,
      createdBy: apprentice.id,
      privateOwnerId: apprentice.id,
    });
    setAssignmentBench({ db, assignmentId: assignment.id, benchId: copy.bench.id });
    labBenchId = copy.bench.id;
    labCopiesCreated += 1;
  }

  // A practice copy of the shared bench, to try things without a lab.
  const practiceName = practiceCopyName(sharedBench.name);
  const practice = db
    .select({ id: benches.id })
    .from(benches)
    .where(
      and(
        eq(benches.workspaceId, workspace.id),
        eq(benches.privateOwnerId, apprentice.id),
        eq(benches.name, practiceName),
        isNull(benches.archivedAt),
      ),
    )
    .get();
  if (!practice) {
    duplicateBench({
      db,
      source: sharedBench,
      document: sharedRevision.document,
      name: practiceName,
      createdBy: apprentice.id,
      privateOwnerId: apprentice.id,
    });
    practiceCopiesCreated += 1;
  }

  // The demo suite, replayed a few times by QA on the shipped benches.
  if (listSuiteRuns({ db, workspaceId: workspace.id, limit: 1 }).length === 0) {
    const replayer = person(demoSuiteReplays.startedByEmail);
    const suite = db.select().from(suites).where(eq(suites.workspaceId, workspace.id)).get();
    if (suite) {
      const entries = listSuiteScenarios({ db, suiteId: suite.id }).map(({ scenario }) => ({
        scenario,
        revision: required(latestRevision({ db, benchId: scenario.benchId }), "revision"),
      }));
      for (const seed of demoSuiteReplays.seeds) {
        const { done } = startSuiteRun(
          {
            workspaceId: workspace.id,
            startedBy: replayer.id,
            suite: { id: suite.id, name: suite.name },
            entries,
            ...(seed === null ? {} : { seed }),
          },
          { db, pool },
        );
        await done;
        suiteRunsCreated += 1;
      }
    }
  }

  // The apprentice's first attempt: the copy submitted as given, graded as written.
  if (listAttempts({ db, assignmentIds: [assignment.id] }).length === 0) {
    const revision = required(latestRevision({ db, benchId: labBenchId }), "lab copy revision");
    const { run, done } = startScenarioRun(
      {
        workspaceId: workspace.id,
        startedBy: apprentice.id,
        scenario: grading,
        revision,
        gradeAsWritten: true,
      },
      { db, pool },
    );
    createAttempt({
      db,
      values: { assignmentId: assignment.id, benchRevisionId: revision.id, runId: run.id },
    });
    await done;
    attemptsCreated += 1;
  }

  return {
    labsCreated,
    labCopiesCreated,
    practiceCopiesCreated,
    attemptsCreated,
    suiteRunsCreated,
  };
}

// `tsx app/_lib/demo/seed-demo-history.ts` (the second half of npm run db:seed).
if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  const { getDb, closeDb, databasePathFrom } = await import("@/db/client");
  const summary = await seedDemoHistory(getDb());
  closeDb();
  console.log(
    `seeded history in ${databasePathFrom(process.env.DATABASE_URL)}: ` +
      `${summary.labsCreated} labs, ${summary.labCopiesCreated} lab copies, ` +
      `${summary.practiceCopiesCreated} practice copies, ${summary.suiteRunsCreated} suite runs, ` +
      `${summary.attemptsCreated} attempts created`,
  );
}
