/**
 * Child process of test/api/durability.test.ts: opens the database given as
 * the first argument the way the server does (openDatabase), then writes the
 * kinds of rows whose loss matters (accounts, bench revisions, run verdicts)
 * through the real query functions, one after another, and prints one line
 * "ack <kind> <id>" after each write returns. It never stops by itself: the
 * test kills it with SIGKILL in the middle of the burst.
 */
import { openDatabase } from "../../../db/client";
import { createBench, saveRevision } from "../../../db/queries/benches";
import { createRun, finishRun } from "../../../db/queries/runs";
import { createUser } from "../../../db/queries/users";
import { createWorkspace } from "../../../db/queries/workspaces";

const file = process.argv[2];
if (!file) throw new Error("usage: durability-writer.ts <database file>");
const db = openDatabase(file);

const workspace = createWorkspace({ db, values: { slug: "burst", name: "Burst" } })!;
const author = createUser({
  db,
  values: { email: "author@burst.example", name: "Author", passwordHash: "x" },
})!;
const { bench, revision } = createBench({
  db,
  values: { workspaceId: workspace.id, name: "Burst bench", createdBy: author.id },
  document: "{}",
})!;
process.stdout.write(`ready\n`);

// A safety stop in case the parent is gone and never kills us.
for (let i = 0; i < 1_000_000; i++) {
  const user = createUser({
    db,
    values: { email: `member-${i}@burst.example`, name: `Member ${i}`, passwordHash: "x" },
  })!;
  process.stdout.write(`ack user ${user.id}\n`);
  const saved = saveRevision({
    db,
    benchId: bench.id,
    document: JSON.stringify({ i }),
    authorId: author.id,
    summary: `save ${i}`,
  })!;
  process.stdout.write(`ack revision ${saved.id}\n`);
  const run = createRun({
    db,
    values: {
      workspaceId: workspace.id,
      benchRevisionId: revision.id,
      seed: i,
      startedBy: author.id,
    },
  })!;
  finishRun({
    db,
    runId: run.id,
    result: {
      verdict: "pass",
      stepsPassed: 1,
      stepsFailed: 0,
      stepsTotal: 1,
      results: "{}",
      durationMs: 1,
    },
  });
  process.stdout.write(`ack verdict ${run.id}\n`);
}
