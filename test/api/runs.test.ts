import { and, eq } from "drizzle-orm";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { duplicateBench } from "@/db/queries/bench-history";
import { createBench, latestRevision } from "@/db/queries/benches";
import { findUserByEmail } from "@/db/queries/users";
import { findRun, listSuiteRunRuns } from "@/db/queries/runs";
import { benches, scenarios, suites } from "@/db/schema";
import { main as cliMain } from "@/engine/cli/main";
import { shippedSuiteScenarioFiles } from "../harness/shipped-suite";
import { GET as runEvents } from "@/app/api/runs/[runId]/events/route";
import { POST as startRun } from "@/app/api/runs/route";
import { startScenarioRun } from "@/app/_lib/runs/run-service";
import { createRunPool } from "@/app/_lib/runs/run-pool";
import { parseStoredResult } from "@/app/_lib/runs/stored-result";
import {
  cookieFor,
  getRequest,
  params,
  postJson,
  readEventStream,
  useTempDatabase,
  waitForRun,
  workspaceIdOf,
} from "./runs-support";

const qa = "priya.qa@fernhill.example";
const engineer = "tomas.engineer@fernhill.example";
const apprentice = "leo.apprentice@fernhill.example";

let cleanup: () => void;
let qaCookie: string;

function scenarioByName(workspaceSlug: string, name: string) {
  const row = getDb()
    .select()
    .from(scenarios)
    .where(and(eq(scenarios.workspaceId, workspaceIdOf(workspaceSlug)), eq(scenarios.name, name)))
    .get();
  if (!row) throw new Error(`no scenario ${name}`);
  return row;
}

function demoSuite(workspaceSlug: string) {
  return getDb()
    .select()
    .from(suites)
    .where(eq(suites.workspaceId, workspaceIdOf(workspaceSlug)))
    .get()!;
}

beforeAll(async () => {
  cleanup = useTempDatabase().cleanup;
  qaCookie = await cookieFor(qa);
}, 60_000);

afterAll(() => cleanup?.());

describe("POST /api/runs", () => {
  it("starts a scenario run outside the request and stores verdicts, totals, duration, seed, revision and who ran it", async () => {
    const scenario = scenarioByName("fernhill", "Door push-button toggles the ceiling lights");
    const response = await startRun(
      postJson("/api/runs", { scenarioId: scenario.id, seed: 7 }, qaCookie),
      params({}),
    );
    expect(response.status).toBe(202);
    const body = (await response.json()) as { kind: string; runId: string; eventsUrl: string };
    expect(body.kind).toBe("scenario");
    expect(body.eventsUrl).toBe(`/api/runs/${body.runId}/events`);

    const run = await waitForRun(body.runId);
    const stored = findRun({ workspaceId: workspaceIdOf("fernhill"), runId: body.runId })!;
    expect(run.status).toBe("finished");
    expect(stored.verdict).toBe("pass");
    expect(stored.seed).toBe(7);
    expect(stored.benchRevisionId).toBe(latestRevision({ benchId: scenario.benchId })!.id);
    expect(stored.startedBy).not.toBeNull();
    expect(stored.durationMs).toBeGreaterThanOrEqual(0);
    const result = parseStoredResult(stored.results)!;
    expect(result.steps.length).toBe(stored.stepsTotal);
    expect(result.steps.every((step) => step.status === "pass")).toBe(true);
    expect(stored.stepsPassed).toBe(stored.stepsTotal);
    // Passing steps keep no trace slice; only failures carry theirs.
    expect(result.steps.every((step) => step.trace.length === 0)).toBe(true);
  });

  it("keeps the trace slice behind each failure", async () => {
    const scenario = scenarioByName(
      "fernhill",
      "Exercise: the door rocker should switch the bench lights",
    );
    const response = await startRun(
      postJson("/api/runs", { scenarioId: scenario.id }, qaCookie),
      params({}),
    );
    const { runId } = (await response.json()) as { runId: string };
    await waitForRun(runId);
    const stored = findRun({ workspaceId: workspaceIdOf("fernhill"), runId })!;
    // Marked expectedToFail: it fails as intended, which counts as passing (as in the CLI).
    expect(stored.verdict).toBe("pass");
    const result = parseStoredResult(stored.results)!;
    expect(result.outcome).toBe("expected-failure");
    const failed = result.steps.filter((step) => step.status === "fail");
    expect(failed.length).toBeGreaterThan(0);
    for (const step of failed) {
      expect(step.expected).toBeTruthy();
      expect(step.actual).toBeTruthy();
      expect(step.trace.length).toBeGreaterThan(0);
    }
    expect(stored.stepsFailed).toBe(failed.length);
  });

  it("names the field at fault and keeps other workspaces' scenarios out of reach", async () => {
    const call = async (body: unknown, cookie = qaCookie) => {
      const response = await startRun(postJson("/api/runs", body, cookie), params({}));
      return {
        status: response.status,
        body: (await response.json()) as { error: { code: string; field?: string } },
      };
    };
    expect((await call({})).body.error.field).toBe("scenarioId");
    expect((await call({ scenarioId: "a", suiteId: "b" })).status).toBe(400);
    const fernhillScenario = scenarioByName(
      "fernhill",
      "Door push-button toggles the ceiling lights",
    );
    const badSeed = await call({ scenarioId: fernhillScenario.id, seed: -1 });
    expect(badSeed).toMatchObject({ status: 400, body: { error: { field: "seed" } } });
    const unknownField = await call({ scenarioId: fernhillScenario.id, colour: "red" });
    expect(unknownField).toMatchObject({ status: 400, body: { error: { field: "colour" } } });
    expect((await call({ scenarioId: "no-such-scenario" })).status).toBe(404);

    const quaysideScenario = scenarioByName(
      "quayside-dental",
      "Each treatment room's push-button switches only its own light",
    );
    expect((await call({ scenarioId: quaysideScenario.id })).status).toBe(404);

    // A revision of another bench is refused, naming benchRevisionId.
    const quaysideBench = getDb()
      .select()
      .from(benches)
      .where(eq(benches.workspaceId, workspaceIdOf("quayside-dental")))
      .get()!;
    const foreignRevision = latestRevision({ benchId: quaysideBench.id })!;
    const wrongRevision = await call({
      scenarioId: fernhillScenario.id,
      benchRevisionId: foreignRevision.id,
    });
    expect(wrongRevision).toMatchObject({
      status: 404,
      body: { error: { field: "benchRevisionId" } },
    });

    // Not JSON, no session, wrong origin.
    const notJson = await startRun(postJson("/api/runs", "{", qaCookie), params({}));
    expect(notJson.status).toBe(400);
    const noSession = await startRun(
      postJson("/api/runs", { scenarioId: fernhillScenario.id }),
      params({}),
    );
    expect(noSession.status).toBe(401);
    const crossSite = await startRun(
      postJson("/api/runs", { scenarioId: fernhillScenario.id }, qaCookie, {
        origin: "http://elsewhere.example",
      }),
      params({}),
    );
    expect(crossSite.status).toBe(403);
  });

  it("runs a scenario on a copy of its bench, and refuses a revision of an unrelated bench", async () => {
    const db = getDb();
    const scenario = scenarioByName("fernhill", "Door push-button toggles the ceiling lights");
    const source = db.select().from(benches).where(eq(benches.id, scenario.benchId)).get()!;
    const leo = findUserByEmail({ email: apprentice })!;
    const copy = duplicateBench({
      source,
      document: latestRevision({ benchId: source.id })!.document,
      name: "Leo's sandbox",
      createdBy: leo.id,
      privateOwnerId: leo.id,
    });
    const cookie = await cookieFor(apprentice);
    const onCopy = await startRun(
      postJson("/api/runs", { scenarioId: scenario.id, benchRevisionId: copy.revision.id }, cookie),
      params({}),
    );
    expect(onCopy.status).toBe(202);
    const { runId } = (await onCopy.json()) as { runId: string };
    await waitForRun(runId);
    const stored = findRun({ workspaceId: workspaceIdOf("fernhill"), runId })!;
    expect(stored).toMatchObject({ verdict: "pass", benchRevisionId: copy.revision.id });

    const unrelated = createBench({
      values: { workspaceId: workspaceIdOf("fernhill"), name: "Unrelated", createdBy: leo.id },
      document: latestRevision({ benchId: source.id })!.document,
    });
    const refused = await startRun(
      postJson(
        "/api/runs",
        { scenarioId: scenario.id, benchRevisionId: unrelated.revision.id },
        qaCookie,
      ),
      params({}),
    );
    expect(refused.status).toBe(400);
    expect(((await refused.json()) as { error: { field: string } }).error.field).toBe(
      "benchRevisionId",
    );
  });

  it("lets an apprentice replay only on their own copies", async () => {
    const cookie = await cookieFor(apprentice);
    const scenario = scenarioByName("fernhill", "Door push-button toggles the ceiling lights");
    const response = await startRun(
      postJson("/api/runs", { scenarioId: scenario.id }, cookie),
      params({}),
    );
    expect(response.status).toBe(403);
    const suite = await startRun(
      postJson("/api/runs", { suiteId: demoSuite("fernhill").id }, cookie),
      params({}),
    );
    expect(suite.status).toBe(403);
  });
});

describe("GET /api/runs/:id/events", () => {
  it("streams a suite run's progress scenario by scenario to the end", async () => {
    const suite = demoSuite("fernhill");
    const started = await startRun(
      postJson("/api/runs", { suiteId: suite.id }, qaCookie),
      params({}),
    );
    expect(started.status).toBe(202);
    const { suiteRunId, runIds } = (await started.json()) as {
      suiteRunId: string;
      runIds: string[];
    };
    const response = await runEvents(
      getRequest(`/api/runs/${suiteRunId}/events`, qaCookie),
      params({ runId: suiteRunId }),
    );
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toMatch(/^text\/event-stream/);
    const events = await readEventStream(response);
    const kinds = events.map((e) => e.event);
    expect(kinds.at(-1)).toBe("run.finished");
    // On a busy machine the whole suite can finish before the stream opens; the
    // stream then answers with the final state alone, as for any finished run.
    if (kinds.length > 1) {
      expect(kinds[0]).toMatch(/^run\.(snapshot|started)$/);
      const finishedScenarios = events.filter((e) => e.event === "scenario.finished");
      // Every scenario is announced once (some may have finished before the stream opened).
      const snapshotDone = Number(events[0]!.data.done);
      expect(finishedScenarios.length + snapshotDone).toBe(runIds.length);
    }
    const last = events.at(-1)!.data;
    expect(last).toMatchObject({ done: runIds.length, total: runIds.length, verdict: "pass" });
  });

  it("answers a finished run at once, and 404 for a run of another workspace", async () => {
    const scenario = scenarioByName(
      "fernhill",
      "Front unit fan levels, clamping and automatic fan",
    );
    const started = await startRun(
      postJson("/api/runs", { scenarioId: scenario.id }, qaCookie),
      params({}),
    );
    const { runId } = (await started.json()) as { runId: string };
    await waitForRun(runId);
    const events = await readEventStream(
      await runEvents(getRequest(`/api/runs/${runId}/events`, qaCookie), params({ runId })),
    );
    expect(events).toEqual([
      {
        event: "run.finished",
        data: expect.objectContaining({ status: "finished", verdict: "pass", done: 1, total: 1 }),
      },
    ]);
    const otherWorkspace = await cookieFor(engineer, "quayside-dental");
    const foreign = await runEvents(
      getRequest(`/api/runs/${runId}/events`, otherWorkspace),
      params({ runId }),
    );
    expect(foreign.status).toBe(404);
    const signedOut = await runEvents(getRequest(`/api/runs/${runId}/events`), params({ runId }));
    expect(signedOut.status).toBe(401);
  });
});

describe("server runs and the CLI", () => {
  it("give identical verdicts for the shipped demo suite", async () => {
    // The CLI path: npm run scenarios -- scenarios/demo.suite.json
    let output = "";
    const exitCode = cliMain(["scenarios/demo.suite.json", "--quiet"], {
      stdout: (text) => (output += text),
      stderr: (text) => (output += text),
      cwd: process.cwd(),
    });
    expect(exitCode).toBe(0);
    const cliWord = new Map<string, string>();
    let cliVerbose = "";
    cliMain(["scenarios/demo.suite.json"], {
      stdout: (t) => (cliVerbose += t),
      stderr: () => {},
      cwd: process.cwd(),
    });
    for (const line of cliVerbose.split("\n")) {
      const match = /^\[\s*\d+\/\d+\] (PASS |XFAIL|FAIL |XPASS|ERROR) (.+?)  \(/.exec(line);
      if (match) cliWord.set(match[2]!, match[1]!.trim());
    }
    const suiteSize = shippedSuiteScenarioFiles().length;
    expect(cliWord.size).toBe(suiteSize);

    // The app path: the seeded suites of both demo workspaces through the API.
    const word = {
      passed: "PASS",
      "expected-failure": "XFAIL",
      failed: "FAIL",
      "unexpected-pass": "XPASS",
      error: "ERROR",
    } as const;
    const appWord = new Map<string, string>();
    for (const [slug, email] of [
      ["fernhill", qa],
      ["quayside-dental", engineer],
      ["wrenhallow", engineer],
    ] as const) {
      const cookie = await cookieFor(email, slug);
      const response = await startRun(
        postJson("/api/runs", { suiteId: demoSuite(slug).id }, cookie),
        params({}),
      );
      const { suiteRunId } = (await response.json()) as { suiteRunId: string };
      await waitForRun(suiteRunId);
      for (const run of listSuiteRunRuns({ suiteRunId })) {
        appWord.set(run.scenarioName, word[parseStoredResult(run.results)!.outcome]);
      }
    }
    expect(Object.fromEntries(appWord)).toEqual(Object.fromEntries(cliWord));
    expect([...appWord.values()].filter((w) => w === "XFAIL")).toHaveLength(1);
  });
});

describe("a stored run re-runs identically", () => {
  it("for any shipped scenario and seed (same revision, same seed, same result)", async () => {
    const db = getDb();
    const fernhill = workspaceIdOf("fernhill");
    const rows = db.select().from(scenarios).where(eq(scenarios.workspaceId, fernhill)).all();
    const startedBy = (await import("@/db/queries/users")).findUserByEmail({ email: qa })!.id;
    const pool = createRunPool({ mode: "inline" });
    const withoutWallClock = (text: string | null) => {
      const result = parseStoredResult(text)!;
      return { ...result, wallMs: 0 };
    };
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 0, max: rows.length - 1 }),
        fc.integer({ min: 0, max: 2 ** 31 - 1 }),
        async (index, seed) => {
          const scenario = rows[index]!;
          const revision = latestRevision({ db, benchId: scenario.benchId })!;
          const first = await startScenarioRun(
            { workspaceId: fernhill, startedBy, scenario, revision, seed },
            { db, pool },
          ).done;
          const again = await startScenarioRun(
            {
              workspaceId: fernhill,
              startedBy,
              scenario,
              revision: { ...revision },
              seed: first.seed,
            },
            { db, pool },
          ).done;
          expect(again.verdict).toBe(first.verdict);
          expect(again.stepsPassed).toBe(first.stepsPassed);
          expect(withoutWallClock(again.results)).toEqual(withoutWallClock(first.results));
        },
      ),
      { numRuns: 12 },
    );
  }, 120_000);

  it("runs a job even when worker threads cannot start (falls back inline)", async () => {
    const db = getDb();
    const scenario = scenarioByName(
      "fernhill",
      "Front unit mode command is confirmed on the mode status (DPT 20.105)",
    );
    const revision = latestRevision({ db, benchId: scenario.benchId })!;
    const startedBy = (await import("@/db/queries/users")).findUserByEmail({ email: qa })!.id;
    // Under vitest the worker URL is a raw .ts file, which Node cannot start as a worker.
    const pool = createRunPool({ mode: "workers", size: 1 });
    const quiet = console.error;
    console.error = () => {};
    try {
      const run = await startScenarioRun(
        { workspaceId: workspaceIdOf("fernhill"), startedBy, scenario, revision },
        { db, pool },
      ).done;
      expect(run.verdict).toBe("pass");
      expect(pool.mode).toBe("inline");
    } finally {
      console.error = quiet;
      await pool.close();
    }
  });
});
