import { eq } from "drizzle-orm";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { getDb } from "@/db/client";
import { forgottenMailBody, listWorkspaceMail } from "@/db/queries/email-outbox";
import { createMembership } from "@/db/queries/memberships";
import { emailOutbox } from "@/db/schema";
import { call, createWorld, destroyWorld, type World } from "./support/world";

/**
 * Account mail (a password reset) belongs to no workspace: a person in two
 * workspaces asks for a reset, and neither workspace's admin can read the
 * link on the Outbox page (whose one query is listWorkspaceMail). Without SMTP
 * the message goes to the server log; its stored body is blanked once sent.
 * (The SMTP leg is in invitation-smtp.test.ts.)
 */

let world: World;
beforeAll(() => {
  world = createWorld();
  // The engineer of A also belongs to B, as a person in two workspaces does.
  createMembership({
    values: { userId: world.users.engineer.userId, workspaceId: world.b.workspaceId, role: "qa" },
  });
});
afterAll(() => destroyWorld(world));
afterEach(() => vi.restoreAllMocks());

function resetRows() {
  return getDb().select().from(emailOutbox).where(eq(emailOutbox.purpose, "password-reset")).all();
}

describe("account mail in outbox mode (no SMTP_URL)", () => {
  it("is shown to no workspace's admin and goes to the server log instead", async () => {
    const log = vi.spyOn(console, "info").mockImplementation(() => undefined);
    const { POST } = await import("@/app/api/session/password-reset/route");
    const response = await call(POST, {
      method: "POST",
      path: "/api/session/password-reset",
      body: { email: world.users.engineer.email },
      headers: { "x-forwarded-for": "198.51.100.7" },
    });
    expect(response.status).toBe(202);

    // Delivery runs after the answer; the message reaches the log.
    await vi.waitFor(() => expect(log).toHaveBeenCalled(), { timeout: 10_000 });
    const printed = log.mock.calls.map((args) => args.join(" ")).join("\n");
    expect(printed).toContain(world.users.engineer.email);
    const link = /https?:\/\/\S+\/reset-password\/([A-Za-z0-9_-]+)/.exec(printed);
    expect(link).not.toBeNull();

    // Neither of the person's two workspaces lists it on its Outbox page.
    for (const workspaceId of [world.a.workspaceId, world.b.workspaceId]) {
      const listed = listWorkspaceMail({ workspaceId });
      expect(listed.filter((mail) => mail.purpose === "password-reset")).toEqual([]);
      expect(listed.some((mail) => mail.textBody.includes(link![1]!))).toBe(false);
    }

    // The row belongs to no workspace and no longer holds the link.
    const rows = resetRows();
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      workspaceId: null,
      audience: "account",
      status: "sent",
      textBody: forgottenMailBody,
    });

    // The link from the log works.
    const complete = await import("@/app/api/session/password-reset/complete/route");
    const done = await call(complete.POST, {
      method: "POST",
      path: "/api/session/password-reset/complete",
      body: { token: link![1], password: "a-fresh-password-from-the-log" },
    });
    expect(done.status).toBe(200);
  });

  it("cannot be filed under a workspace: the database refuses it", () => {
    expect(() =>
      getDb()
        .insert(emailOutbox)
        .values({
          workspaceId: world.a.workspaceId,
          audience: "account",
          toAddress: world.users.engineer.email,
          subject: "Reset",
          textBody: "link",
          purpose: "password-reset",
        })
        .run(),
    ).toThrow(/CHECK constraint failed/);
  });
});
