import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runShareLimitedMessage, runShareLimits } from "@/app/_lib/auth";
import { newToken } from "@/app/_lib/invitations";
import { getDb } from "@/db/client";
import { createPasswordReset } from "@/db/queries/password-resets";
import { createScenario } from "@/db/queries/scenarios";
import { createSuite } from "@/db/queries/suites";
import { emailOutbox } from "@/db/schema";
import {
  call,
  cookieFor,
  createWorld,
  databaseSnapshot,
  destroyWorld,
  scenarioDocument,
  testPassword,
  type World,
} from "./support/world";

/**
 * One access policy per resource: ids named in bodies load through the same
 * rule as a direct read (a suite cannot take someone's private scenario), a lab
 * copy does not lead its apprentice to the bench it was made from, sharing run
 * reports by e-mail is limited per member, and using one password-reset link
 * ends every other link of the account.
 */

let world: World;
let secretScenarioId: string;
beforeAll(() => {
  world = createWorld();
  secretScenarioId = createScenario({
    values: {
      workspaceId: world.a.workspaceId,
      benchId: world.sandboxBenchId,
      name: "Leo's secret attempt",
      document: JSON.stringify(scenarioDocument("Leo's secret attempt")),
      createdBy: world.users.apprentice.userId,
    },
  }).id;
});
afterAll(() => destroyWorld(world));

const asMember = (role: keyof World["users"]) =>
  cookieFor(world.users[role].userId, world.a.workspaceId);

describe("a suite takes only scenarios its author may read on shared benches", () => {
  it("refuses an apprentice's private scenario with 404 naming the field, without its name or bench", async () => {
    const { POST } = await import("@/app/api/suites/route");
    for (const role of ["engineer", "qa"] as const) {
      const before = databaseSnapshot();
      const response = await call(POST, {
        method: "POST",
        path: "/api/suites",
        cookie: await asMember(role),
        body: { name: `Borrowed ${role}`, scenarioIds: [world.a.scenarioId, secretScenarioId] },
      });
      const text = await response.text();
      expect(response.status, text).toBe(404);
      expect((JSON.parse(text) as { error: { field: string } }).error.field).toBe("scenarioIds[1]");
      expect(text).not.toContain("secret attempt");
      expect(text).not.toContain(world.sandboxBenchId);
      expect(text).not.toContain("Sandbox");
      expect(databaseSnapshot()).toBe(before);
    }
  });

  it("refuses it with 400 even to a trainer who may read it, since every member reads a suite", async () => {
    const { POST } = await import("@/app/api/suites/route");
    const before = databaseSnapshot();
    const response = await call(POST, {
      method: "POST",
      path: "/api/suites",
      cookie: await asMember("trainer"),
      body: { name: "Review", scenarioIds: [secretScenarioId] },
    });
    expect(response.status).toBe(400);
    expect(((await response.json()) as { error: { field: string } }).error.field).toBe(
      "scenarioIds[0]",
    );
    expect(databaseSnapshot()).toBe(before);
  });

  it("does not show a reader the scenarios of a suite they may not read", async () => {
    // A suite written before the rule, holding the private scenario.
    const suite = createSuite({
      values: { workspaceId: world.a.workspaceId, name: "Old suite", createdBy: null },
      scenarioIds: [world.a.scenarioId, secretScenarioId],
    });
    const { GET } = await import("@/app/api/suites/[suiteId]/route");
    const response = await call(GET, {
      method: "GET",
      path: `/api/suites/${suite.id}`,
      params: { suiteId: suite.id },
      cookie: await asMember("engineer"),
    });
    const text = await response.text();
    expect(response.status).toBe(200);
    expect(text).not.toContain("secret attempt");
    expect(text).not.toContain(secretScenarioId);
    // Nor may it be replayed through the suite.
    const runs = await import("@/app/api/runs/route");
    const started = await call(runs.POST, {
      method: "POST",
      path: "/api/runs",
      cookie: await asMember("engineer"),
      body: { suiteId: suite.id },
    });
    expect(started.status).toBe(409);
    expect(await started.text()).not.toContain("secret attempt");
  });
});

describe("a lab copy does not lead its apprentice to its source", () => {
  it("hides the source bench of the apprentice's copy, and a private lab bench from the apprentice", async () => {
    const trainer = await asMember("trainer");
    const apprentice = await asMember("apprentice");
    // The trainer keeps the fault-free original private and makes the lab from it.
    const duplicate = await import("@/app/api/benches/[benchId]/duplicate/route");
    const copied = await call(duplicate.POST, {
      method: "POST",
      path: `/api/benches/${world.a.benchId}/duplicate`,
      params: { benchId: world.a.benchId },
      cookie: trainer,
      body: { name: "Lab original", private: true },
    });
    expect(copied.status, await copied.clone().text()).toBe(201);
    const sourceId = ((await copied.json()) as { bench: { id: string } }).bench.id;
    const scenarios = await import("@/app/api/scenarios/route");
    const graded = await call(scenarios.POST, {
      method: "POST",
      path: "/api/scenarios",
      cookie: trainer,
      body: { benchId: sourceId, document: scenarioDocument("Grading") },
    });
    expect(graded.status, await graded.clone().text()).toBe(201);
    const gradingScenarioId = ((await graded.json()) as { scenario: { id: string } }).scenario.id;
    const labs = await import("@/app/api/labs/route");
    const made = await call(labs.POST, {
      method: "POST",
      path: "/api/labs",
      cookie: trainer,
      body: {
        title: "Find the unlinked actuator",
        benchId: sourceId,
        gradingScenarioId,
        hiddenFaults: [{ kind: "unlink", device: "act", object: 0, groupAddress: "1/0/1" }],
      },
    });
    expect(made.status, await made.clone().text()).toBe(201);
    const labId = ((await made.json()) as { lab: { id: string } }).lab.id;
    const assign = await import("@/app/api/labs/[labId]/assignments/route");
    const assigned = await call(assign.POST, {
      method: "POST",
      path: `/api/labs/${labId}/assignments`,
      params: { labId },
      cookie: trainer,
      body: { apprenticeIds: [world.users.apprentice.userId] },
    });
    const assignmentId = ((await assigned.json()) as { assigned: { id: string }[] }).assigned[0]!
      .id;
    const open = await import("@/app/api/labs/assignments/[assignmentId]/open/route");
    const opened = await call(open.POST, {
      method: "POST",
      path: `/api/labs/assignments/${assignmentId}/open`,
      params: { assignmentId },
      cookie: apprentice,
    });
    expect(opened.status).toBe(201);
    const copyId = ((await opened.json()) as { benchId: string }).benchId;

    // The apprentice's copy does not say where it came from...
    const bench = await import("@/app/api/benches/[benchId]/route");
    const benches = await import("@/app/api/benches/route");
    const own = await call(bench.GET, {
      method: "GET",
      path: `/api/benches/${copyId}`,
      params: { benchId: copyId },
      cookie: apprentice,
    });
    const ownText = await own.text();
    expect(own.status).toBe(200);
    expect(
      (JSON.parse(ownText) as { bench: { copiedFromBenchId: unknown } }).bench.copiedFromBenchId,
    ).toBeNull();
    expect(ownText).not.toContain(sourceId);
    // Nor does its history name the source.
    const history = await import("@/app/api/benches/[benchId]/revisions/route");
    const revisions = await (
      await call(history.GET, {
        method: "GET",
        path: `/api/benches/${copyId}/revisions`,
        params: { benchId: copyId },
        cookie: apprentice,
      })
    ).text();
    expect(revisions).not.toContain("Lab original");
    const listed = await (
      await call(benches.GET, { method: "GET", path: "/api/benches", cookie: apprentice })
    ).text();
    expect(listed).not.toContain(sourceId);
    // ...and the source itself is out of reach by every route that reads a bench.
    for (const [route, path] of [
      ["@/app/api/benches/[benchId]/route", `/api/benches/${sourceId}`],
      ["@/app/api/benches/[benchId]/revisions/route", `/api/benches/${sourceId}/revisions`],
      ["@/app/api/benches/[benchId]/export/route", `/api/benches/${sourceId}/export`],
    ] as const) {
      const handlers = (await import(/* @vite-ignore */ route)) as { GET: unknown };
      const response = await call(handlers.GET, {
        method: "GET",
        path,
        params: { benchId: sourceId },
        cookie: apprentice,
      });
      expect(response.status, path).toBe(404);
    }
    const revision = await import("@/app/api/benches/[benchId]/revisions/[number]/route");
    expect(
      (
        await call(revision.GET, {
          method: "GET",
          path: `/api/benches/${sourceId}/revisions/1`,
          params: { benchId: sourceId, number: "1" },
          cookie: apprentice,
        })
      ).status,
    ).toBe(404);
    const scenarioList = await call(scenarios.GET, {
      method: "GET",
      path: "/api/scenarios",
      cookie: apprentice,
    });
    expect(await scenarioList.text()).not.toContain(sourceId);

    // The trainer, who manages labs, still sees the link.
    const reviewed = await call(bench.GET, {
      method: "GET",
      path: `/api/benches/${copyId}`,
      params: { benchId: copyId },
      cookie: trainer,
    });
    expect(
      ((await reviewed.json()) as { bench: { copiedFromBenchId: unknown } }).bench
        .copiedFromBenchId,
    ).toBe(sourceId);
  });
});

describe("sharing a run by e-mail", () => {
  it(`is limited to ${runShareLimits.sharesPerMember} shares an hour per member, then 429 with a clear message`, async () => {
    const share = await import("@/app/api/runs/[runId]/share/route");
    const send = async (role: "engineer" | "qa") =>
      call(share.POST, {
        method: "POST",
        path: `/api/runs/${world.a.runId}/share`,
        params: { runId: world.a.runId },
        cookie: await asMember(role),
        body: { to: world.users.admin.email },
      });
    for (let i = 0; i < runShareLimits.sharesPerMember; i++) {
      expect((await send("engineer")).status).toBe(202);
    }
    const queued = () => getDb().select().from(emailOutbox).all().length;
    const before = queued();
    const limited = await send("engineer");
    expect(limited.status).toBe(429);
    expect(await limited.json()).toEqual({
      error: { code: "rate_limited", message: runShareLimitedMessage },
    });
    // Nothing was queued for the refused share.
    expect(queued()).toBe(before);
    // Another member is not held back.
    expect((await send("qa")).status).toBe(202);
  });
});

describe("password-reset links", () => {
  it("using one ends every other outstanding link of the account", async () => {
    const expiresAt = new Date(Date.now() + 60 * 60 * 1000);
    const older = newToken();
    const newer = newToken();
    createPasswordReset({ userId: world.users.qa.userId, tokenHash: older.tokenHash, expiresAt });
    createPasswordReset({ userId: world.users.qa.userId, tokenHash: newer.tokenHash, expiresAt });
    const complete = await import("@/app/api/session/password-reset/complete/route");
    const use = (token: string, password: string) =>
      call(complete.POST, {
        method: "POST",
        path: "/api/session/password-reset/complete",
        body: { token, password },
      });
    expect((await use(newer.token, "the-newer-link-won")).status).toBe(200);
    const stale = await use(older.token, "an-attacker-password");
    expect(stale.status).toBe(404);
    expect(((await stale.json()) as { error: { field: string } }).error.field).toBe("token");
    // The password is the one the newer link set.
    const session = await import("@/app/api/session/route");
    const signIn = (password: string) =>
      call(session.POST, {
        method: "POST",
        path: "/api/session",
        body: { email: world.users.qa.email, password },
        headers: { "x-forwarded-for": "192.0.2.200" },
      });
    expect((await signIn("the-newer-link-won")).status).toBe(200);
    expect((await signIn(testPassword)).status).toBe(401);
  });
});
