import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { findRun } from "@/db/queries/runs";
import { findUserByEmail } from "@/db/queries/users";
import { benches, emailOutbox, labAssignments, scenarios } from "@/db/schema";
import { POST as assign } from "@/app/api/labs/[labId]/assignments/route";
import { POST as open } from "@/app/api/labs/assignments/[assignmentId]/open/route";
import { POST as submit } from "@/app/api/labs/assignments/[assignmentId]/submit/route";
import { POST as createLab } from "@/app/api/labs/route";
import { parseStoredResult } from "@/app/_lib/runs/stored-result";
import {
  cookieFor,
  params,
  postJson,
  useTempDatabase,
  waitForRun,
  workspaceIdOf,
} from "./runs-support";

const trainer = "ada.trainer@fernhill.example";
const engineer = "tomas.engineer@fernhill.example";
const apprentice = "leo.apprentice@fernhill.example";
const exercise = "Exercise: the door rocker should switch the bench lights";

let cleanup: () => void;
let trainerCookie: string;
let benchId: string;
let exerciseId: string;

beforeAll(async () => {
  cleanup = useTempDatabase().cleanup;
  trainerCookie = await cookieFor(trainer);
  const db = getDb();
  const fernhill = workspaceIdOf("fernhill");
  benchId = db.select().from(benches).where(eq(benches.workspaceId, fernhill)).get()!.id;
  exerciseId = db
    .select()
    .from(scenarios)
    .where(and(eq(scenarios.workspaceId, fernhill), eq(scenarios.name, exercise)))
    .get()!.id;
}, 60_000);

afterAll(() => cleanup?.());

async function body(response: Response) {
  return (await response.json()) as Record<string, unknown> & {
    error?: { code: string; field?: string };
  };
}

describe("labs API", () => {
  it("refuses a hidden fault that does not fit the bench, naming the field", async () => {
    const response = await createLab(
      postJson(
        "/api/labs",
        {
          title: "Bad fault",
          benchId,
          gradingScenarioId: exerciseId,
          hiddenFaults: [
            { kind: "relink", device: "pb-door", object: 0, from: "3/0/1", to: "1/0/2" },
          ],
        },
        trainerCookie,
      ),
      params({}),
    );
    expect(response.status).toBe(400);
    expect((await body(response)).error?.field).toBe("hiddenFaults[0].from");
  });

  it("lets only lab managers create labs", async () => {
    const response = await createLab(
      postJson(
        "/api/labs",
        { title: "Nope", benchId, gradingScenarioId: exerciseId },
        await cookieFor(engineer),
      ),
      params({}),
    );
    expect(response.status).toBe(403);
  });

  it("assigns with an e-mail, makes the apprentice's copy and grades the submission as written", async () => {
    const created = await createLab(
      postJson(
        "/api/labs",
        {
          title: "Door rocker",
          brief: "Find the wrong link.",
          benchId,
          gradingScenarioId: exerciseId,
        },
        trainerCookie,
      ),
      params({}),
    );
    expect(created.status).toBe(201);
    const labId = ((await body(created)).lab as { id: string }).id;

    const notApprentice = findUserByEmail({ email: engineer })!.id;
    const refused = await assign(
      postJson(`/api/labs/${labId}/assignments`, { apprenticeIds: [notApprentice] }, trainerCookie),
      params({ labId }),
    );
    expect(refused.status).toBe(400);
    expect((await body(refused)).error?.field).toBe("apprenticeIds[0]");

    const leo = findUserByEmail({ email: apprentice })!;
    const assigned = await assign(
      postJson(
        `/api/labs/${labId}/assignments`,
        { apprenticeIds: [leo.id], dueAt: "2030-06-30" },
        trainerCookie,
      ),
      params({ labId }),
    );
    expect(assigned.status).toBe(201);
    const assignmentId = ((await body(assigned)).assigned as { id: string }[])[0]!.id;
    const row = getDb()
      .select()
      .from(labAssignments)
      .where(eq(labAssignments.id, assignmentId))
      .get()!;
    expect(row.dueAt?.toISOString()).toBe("2030-06-30T23:59:59.000Z");
    const mail = getDb()
      .select()
      .from(emailOutbox)
      .where(eq(emailOutbox.toAddress, apprentice))
      .all();
    expect(mail.map((m) => m.purpose)).toContain("lab-assignment");
    expect(mail.find((m) => m.purpose === "lab-assignment")!.textBody).toContain(
      `/labs/assignments/${assignmentId}`,
    );

    // Someone else cannot open or submit it; the trainer may look but not submit.
    const trainerSubmit = await submit(
      postJson(`/api/labs/assignments/${assignmentId}/submit`, {}, trainerCookie),
      params({ assignmentId }),
    );
    expect(trainerSubmit.status).toBe(403);

    const cookie = await cookieFor(apprentice);
    const early = await submit(
      postJson(`/api/labs/assignments/${assignmentId}/submit`, {}, cookie),
      params({ assignmentId }),
    );
    expect(early.status).toBe(409);
    const opened = await open(
      postJson(`/api/labs/assignments/${assignmentId}/open`, {}, cookie),
      params({ assignmentId }),
    );
    expect(opened.status).toBe(201);
    const again = await open(
      postJson(`/api/labs/assignments/${assignmentId}/open`, {}, cookie),
      params({ assignmentId }),
    );
    expect(again.status).toBe(200);
    const copyId = (await body(opened)).benchId as string;
    expect(getDb().select().from(benches).where(eq(benches.id, copyId)).get()!.privateOwnerId).toBe(
      leo.id,
    );

    const submitted = await submit(
      postJson(`/api/labs/assignments/${assignmentId}/submit`, {}, cookie),
      params({ assignmentId }),
    );
    expect(submitted.status).toBe(202);
    const { runId } = (await body(submitted)) as unknown as { runId: string };
    await waitForRun(runId);
    const run = findRun({ workspaceId: workspaceIdOf("fernhill"), runId })!;
    // The shipped exercise is marked expectedToFail, but grading asks every check to pass:
    // the copy still has the wrong link, so the attempt fails.
    expect(run.verdict).toBe("fail");
    expect(parseStoredResult(run.results)!.outcome).toBe("failed");
    expect(run.startedBy).toBe(leo.id);
  });
});
