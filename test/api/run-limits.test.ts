import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { findRun, findSuiteRun, interruptedRunMessage } from "@/db/queries/runs";
import { scenarios, suites } from "@/db/schema";
import { GET as runEvents } from "@/app/api/runs/[runId]/events/route";
import { GET as getRun } from "@/app/api/runs/[runId]/route";
import { POST as startRun } from "@/app/api/runs/route";
import type { RunJobOutcome } from "@/app/_lib/runs/run-job";
import { createRunScheduler, type RunPool } from "@/app/_lib/runs/run-scheduler";
import { register } from "@/instrumentation";
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

/**
 * Defect: server runs had no limits, no cap on one scenario, and runs left
 * queued or running by a killed server stayed so forever with their event
 * streams open. The run pool is replaced here by one whose jobs stay running
 * until the test ends them, so "queued or running" is decided by the test.
 */

const qa = "priya.qa@fernhill.example";
const engineer = "tomas.engineer@fernhill.example";
const trainer = "ada.trainer@fernhill.example";

const globalForPool = globalThis as typeof globalThis & { __benchlineRunPool?: RunPool };

/** A pool whose jobs never end by themselves; `release` ends every job in hand. */
function heldPool() {
  const held: { runId: string; resolve: (outcome: RunJobOutcome) => void }[] = [];
  const pool = createRunScheduler({
    slots: 2,
    mode: "inline",
    execute: (job) => new Promise((resolve) => held.push({ runId: job.runId, resolve })),
    close: async () => {},
  });
  const release = async () => {
    while (held.length > 0) {
      for (const { runId, resolve } of held.splice(0))
        resolve({ runId, kind: "error", message: "ended by the test" });
      await new Promise((r) => setImmediate(r));
    }
  };
  return { pool, release };
}

function scenarioId(name: string) {
  const row = getDb()
    .select()
    .from(scenarios)
    .where(and(eq(scenarios.workspaceId, workspaceIdOf("fernhill")), eq(scenarios.name, name)))
    .get();
  if (!row) throw new Error(`no scenario ${name}`);
  return row.id;
}

function suiteId() {
  return getDb()
    .select()
    .from(suites)
    .where(eq(suites.workspaceId, workspaceIdOf("fernhill")))
    .get()!.id;
}

const lightsToggle = "Door push-button toggles the ceiling lights";
const start = async (body: object, cookie: string) =>
  startRun(postJson("/api/runs", body, cookie), params({}));

let cleanup: () => void;
const cookies: Record<string, string> = {};

beforeAll(async () => {
  cleanup = useTempDatabase().cleanup;
  for (const email of [qa, engineer, trainer]) cookies[email] = await cookieFor(email);
}, 60_000);

afterAll(() => {
  delete globalForPool.__benchlineRunPool;
  cleanup?.();
});

beforeEach(() => {
  delete process.env.RUN_LIMIT_PER_MEMBER;
  delete process.env.RUN_LIMIT_PER_WORKSPACE;
  delete process.env.RUN_VIRTUAL_TIME_CAP_MINUTES;
});

describe("run limits per member and per workspace", () => {
  it("answers 429 naming the limit once a member, then the workspace, has as many runs queued or running as allowed", async () => {
    const held = heldPool();
    globalForPool.__benchlineRunPool = held.pool;
    process.env.RUN_LIMIT_PER_MEMBER = "2";
    process.env.RUN_LIMIT_PER_WORKSPACE = "3";
    const scenario = { scenarioId: scenarioId(lightsToggle) };

    expect((await start(scenario, cookies[qa]!)).status).toBe(202);
    // A suite run counts as one run, however many scenarios it holds.
    expect((await start({ suiteId: suiteId() }, cookies[qa]!)).status).toBe(202);
    const overMember = await start(scenario, cookies[qa]!);
    expect(overMember.status).toBe(429);
    const memberBody = (await overMember.json()) as { error: { code: string; message: string } };
    expect(memberBody.error.code).toBe("rate_limited");
    expect(memberBody.error.message).toMatch(/you already have 2 runs queued or running/);
    expect(memberBody.error.message).toMatch(/RUN_LIMIT_PER_MEMBER = 2/);

    expect((await start(scenario, cookies[engineer]!)).status).toBe(202);
    const overWorkspace = await start(scenario, cookies[trainer]!);
    expect(overWorkspace.status).toBe(429);
    const workspaceBody = (await overWorkspace.json()) as { error: { message: string } };
    expect(workspaceBody.error.message).toMatch(/this workspace already has 3 runs/);
    expect(workspaceBody.error.message).toMatch(/RUN_LIMIT_PER_WORKSPACE = 3/);

    // Once the runs end, the member may start again.
    await held.release();
    expect((await start(scenario, cookies[qa]!)).status).toBe(202);
    await held.release();
    delete globalForPool.__benchlineRunPool;
  });
});

describe("caps on one scenario run", () => {
  it("ends a scenario over the virtual-time cap with a failed verdict whose message names the cap", async () => {
    process.env.RUN_VIRTUAL_TIME_CAP_MINUTES = "1";
    const response = await start(
      { scenarioId: scenarioId("Presence switches the bench lights and holds them") },
      cookies[qa]!,
    );
    expect(response.status).toBe(202);
    const { runId } = (await response.json()) as { runId: string };
    await waitForRun(runId);
    const stored = findRun({ workspaceId: workspaceIdOf("fernhill"), runId })!;
    expect(stored.status).toBe("finished");
    expect(stored.verdict).toBe("fail");
    expect(stored.errorMessage).toMatch(/virtual-time cap/);

    const read = await getRun(getRequest(`/api/runs/${runId}`, cookies[qa]), params({ runId }));
    const body = (await read.json()) as { run: { verdict: string; errorMessage: string } };
    expect(body.run.verdict).toBe("fail");
    expect(body.run.errorMessage).toMatch(/RUN_VIRTUAL_TIME_CAP_MINUTES/);
  });
});

describe("runs interrupted by a server stop", () => {
  it("are ended at start-up as interrupted, and their event streams close with that final state", async () => {
    // Runs left behind: one running, one queued, and a suite run, as after kill -9.
    const held = heldPool();
    globalForPool.__benchlineRunPool = held.pool;
    const scenario = { scenarioId: scenarioId(lightsToggle) };
    const running = (await (await start(scenario, cookies[qa]!)).json()) as { runId: string };
    const suite = (await (await start({ suiteId: suiteId() }, cookies[engineer]!)).json()) as {
      suiteRunId: string;
      runIds: string[];
    };
    const fernhill = workspaceIdOf("fernhill");
    expect(findRun({ workspaceId: fernhill, runId: running.runId })!.status).toBe("running");
    expect(findRun({ workspaceId: fernhill, runId: suite.runIds.at(-1)! })!.status).toBe("queued");
    // The process that held them is gone: a new server process starts with a fresh pool.
    delete globalForPool.__benchlineRunPool;

    const runtime = process.env.NEXT_RUNTIME;
    process.env.NEXT_RUNTIME = "nodejs";
    const quiet = console.warn;
    console.warn = () => {};
    try {
      await register();
    } finally {
      console.warn = quiet;
      if (runtime === undefined) delete process.env.NEXT_RUNTIME;
      else process.env.NEXT_RUNTIME = runtime;
    }

    for (const runId of [running.runId, ...suite.runIds]) {
      const run = findRun({ workspaceId: fernhill, runId })!;
      expect(run.status).toBe("errored");
      expect(run.errorMessage).toBe(interruptedRunMessage);
    }
    expect(findSuiteRun({ workspaceId: fernhill, suiteRunId: suite.suiteRunId })!.status).toBe(
      "errored",
    );

    // Each stream answers with the final state and ends (text() resolves only at the end).
    for (const [id, cookie] of [
      [running.runId, cookies[qa]!],
      [suite.suiteRunId, cookies[engineer]!],
    ] as const) {
      const events = await readEventStream(
        await runEvents(getRequest(`/api/runs/${id}/events`, cookie), params({ runId: id })),
      );
      expect(events).toEqual([
        {
          event: "run.finished",
          data: expect.objectContaining({ status: "errored", message: interruptedRunMessage }),
        },
      ]);
    }
  });
});
