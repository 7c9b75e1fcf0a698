import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { wrapDriverError } from "../db-error";
import { preparedPer } from "../prepared";
import {
  benches,
  benchRevisions,
  labAssignments,
  labAttempts,
  labs,
  runs,
  scenarios,
  users,
} from "../schema";

export type Lab = typeof labs.$inferSelect;
export type NewLab = typeof labs.$inferInsert;
export type LabAssignment = typeof labAssignments.$inferSelect;
export type LabAttempt = typeof labAttempts.$inferSelect;

export function createLab({ db = getDb(), values }: { db?: Db; values: NewLab }) {
  try {
    return db.insert(labs).values(values).returning().get();
  } catch (error) {
    wrapDriverError(error, `lab "${values.title}"`);
  }
}

/** A workspace's labs (not archived) with their bench and grading scenario names, newest first. */
export function listLabs({ db = getDb(), workspaceId }: { db?: Db; workspaceId: string }) {
  return db
    .select({
      lab: labs,
      benchName: benches.name,
      gradingScenarioName: scenarios.name,
    })
    .from(labs)
    .innerJoin(benches, eq(labs.benchId, benches.id))
    .innerJoin(scenarios, eq(labs.gradingScenarioId, scenarios.id))
    .where(and(eq(labs.workspaceId, workspaceId)))
    .orderBy(desc(labs.createdAt))
    .all()
    .filter((row) => row.lab.archivedAt === null);
}

export function findLab({
  db = getDb(),
  workspaceId,
  labId,
}: {
  db?: Db;
  workspaceId: string;
  labId: string;
}) {
  return db
    .select({ lab: labs, benchName: benches.name, gradingScenarioName: scenarios.name })
    .from(labs)
    .innerJoin(benches, eq(labs.benchId, benches.id))
    .innerJoin(scenarios, eq(labs.gradingScenarioId, scenarios.id))
    .where(and(eq(labs.id, labId), eq(labs.workspaceId, workspaceId)))
    .get();
}

/**
 * Assign a lab to apprentices; one assignment per apprentice and lab (assigning
 * again changes nothing). Returns the assignments created now.
 */
export function createAssignments({
  db = getDb(),
  labId,
  apprenticeIds,
  dueAt,
  assignedBy,
}: {
  db?: Db;
  labId: string;
  apprenticeIds: readonly string[];
  dueAt: Date | null;
  assignedBy: string;
}) {
  return apprenticeIds.flatMap((apprenticeId) =>
    db
      .insert(labAssignments)
      .values({ labId, apprenticeId, dueAt, assignedBy })
      .onConflictDoNothing({ target: [labAssignments.labId, labAssignments.apprenticeId] })
      .returning()
      .all(),
  );
}

/** One assignment with its lab, only if the lab belongs to the workspace. */
export function findAssignment({
  db = getDb(),
  workspaceId,
  assignmentId,
}: {
  db?: Db;
  workspaceId: string;
  assignmentId: string;
}) {
  return db
    .select({
      assignment: labAssignments,
      lab: labs,
      apprenticeName: users.name,
      benchName: benches.name,
      gradingScenarioName: scenarios.name,
    })
    .from(labAssignments)
    .innerJoin(labs, eq(labAssignments.labId, labs.id))
    .innerJoin(users, eq(labAssignments.apprenticeId, users.id))
    .innerJoin(benches, eq(labs.benchId, benches.id))
    .innerJoin(scenarios, eq(labs.gradingScenarioId, scenarios.id))
    .where(and(eq(labAssignments.id, assignmentId), eq(labs.workspaceId, workspaceId)))
    .get();
}

/** A lab's assignments with the apprentice's name, by name. */
export function listLabAssignments({ db = getDb(), labId }: { db?: Db; labId: string }) {
  return db
    .select({
      assignment: labAssignments,
      apprenticeName: users.name,
      apprenticeEmail: users.email,
    })
    .from(labAssignments)
    .innerJoin(users, eq(labAssignments.apprenticeId, users.id))
    .where(eq(labAssignments.labId, labId))
    .orderBy(asc(users.name))
    .all();
}

/** An apprentice's assignments in a workspace with their lab, soonest due first. */
export function listAssignmentsOf({
  db = getDb(),
  workspaceId,
  apprenticeId,
}: {
  db?: Db;
  workspaceId: string;
  apprenticeId: string;
}) {
  return db
    .select({ assignment: labAssignments, lab: labs, benchName: benches.name })
    .from(labAssignments)
    .innerJoin(labs, eq(labAssignments.labId, labs.id))
    .innerJoin(benches, eq(labs.benchId, benches.id))
    .where(and(eq(labs.workspaceId, workspaceId), eq(labAssignments.apprenticeId, apprenticeId)))
    .orderBy(asc(labAssignments.dueAt), desc(labAssignments.createdAt))
    .all();
}

export function setAssignmentBench({
  db = getDb(),
  assignmentId,
  benchId,
}: {
  db?: Db;
  assignmentId: string;
  benchId: string;
}) {
  return db
    .update(labAssignments)
    .set({ privateBenchId: benchId })
    .where(eq(labAssignments.id, assignmentId))
    .returning()
    .get();
}

export function createAttempt({
  db = getDb(),
  values,
}: {
  db?: Db;
  values: typeof labAttempts.$inferInsert;
}) {
  return db.insert(labAttempts).values(values).returning().get();
}

/** Attempts of these assignments with their grading run and revision number, newest first. */
export function listAttempts({
  db = getDb(),
  assignmentIds,
}: {
  db?: Db;
  assignmentIds: readonly string[];
}) {
  if (assignmentIds.length === 0) return [];
  return db
    .select({
      attempt: labAttempts,
      revisionNumber: benchRevisions.number,
      runStatus: runs.status,
      runVerdict: runs.verdict,
      runResults: runs.results,
      stepsPassed: runs.stepsPassed,
      stepsTotal: runs.stepsTotal,
    })
    .from(labAttempts)
    .innerJoin(benchRevisions, eq(labAttempts.benchRevisionId, benchRevisions.id))
    .leftJoin(runs, eq(labAttempts.runId, runs.id))
    .where(inArray(labAttempts.assignmentId, [...assignmentIds]))
    .orderBy(desc(labAttempts.submittedAt))
    .all();
}

/** Which of these benches are the private copy of some lab assignment. */
// Asked for every bench list and bench read; one prepared statement takes the
// ids as a JSON array (json_each) instead of a query built per list length.
const labCopiesIn = preparedPer((db) =>
  db
    .select({ benchId: labAssignments.privateBenchId })
    .from(labAssignments)
    .where(
      sql`${labAssignments.privateBenchId} in (select value from json_each(${sql.placeholder("benchIds")}))`,
    )
    .prepare(),
);

export function listLabCopyBenchIds({
  db = getDb(),
  benchIds,
}: {
  db?: Db;
  benchIds: readonly string[];
}): string[] {
  if (benchIds.length === 0) return [];
  return labCopiesIn(db)
    .all({ benchIds: JSON.stringify(benchIds) })
    .flatMap((row) => (row.benchId === null ? [] : [row.benchId]));
}
