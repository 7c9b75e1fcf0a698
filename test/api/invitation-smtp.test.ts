import type { AddressInfo } from "node:net";
import { SMTPServer } from "smtp-server";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { forgottenMailBody, listWorkspaceMail } from "@/db/queries/email-outbox";
import { createMembership } from "@/db/queries/memberships";
import { emailOutbox } from "@/db/schema";
import {
  appOrigin,
  call,
  cookieFor,
  cookieFromResponse,
  createWorld,
  destroyWorld,
  type World,
} from "./support/world";

/**
 * An invitation through a real SMTP conversation: a loopback server from the
 * smtp-server package receives what nodemailer sends (SMTP_URL points at it);
 * the test parses the message (RFC 5322 headers, MIME, quoted-printable),
 * follows the link, sets a password and signs in.
 */

interface Received {
  readonly from: string;
  readonly to: readonly string[];
  readonly raw: string;
}

/** Undo quoted-printable (RFC 2045 §6.7): soft line breaks and =XX escapes. */
function decodeQuotedPrintable(text: string): string {
  const bytes = text
    .replace(/=\r?\n/g, "")
    .replace(/=([0-9A-F]{2})/g, (_m, hex: string) => String.fromCharCode(parseInt(hex, 16)));
  return Buffer.from(bytes, "latin1").toString("utf8");
}

/** Headers (unfolded) and the text/plain body of a message, single-part or multipart. */
function parseMessage(raw: string): { headers: Map<string, string>; text: string } {
  const split = raw.indexOf("\r\n\r\n");
  const headerBlock = raw.slice(0, split).replace(/\r\n[ \t]+/g, " ");
  const headers = new Map<string, string>();
  for (const line of headerBlock.split("\r\n")) {
    const colon = line.indexOf(":");
    headers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim());
  }
  let body = raw.slice(split + 4);
  let encoding = headers.get("content-transfer-encoding") ?? "7bit";
  const boundary = /boundary="?([^";]+)"?/.exec(headers.get("content-type") ?? "")?.[1];
  if (boundary) {
    const part = body.split(`--${boundary}`).find((p) => /content-type:\s*text\/plain/i.test(p));
    if (!part) throw new Error("no text/plain part");
    const partSplit = part.indexOf("\r\n\r\n");
    encoding =
      /content-transfer-encoding:\s*([\w-]+)/i.exec(part.slice(0, partSplit))?.[1] ?? "7bit";
    body = part.slice(partSplit + 4);
  }
  const text =
    encoding.toLowerCase() === "quoted-printable"
      ? decodeQuotedPrintable(body)
      : encoding.toLowerCase() === "base64"
        ? Buffer.from(body.replace(/\s+/g, ""), "base64").toString("utf8")
        : body;
  return { headers, text };
}

let world: World;
let server: SMTPServer;
const inbox: Received[] = [];

beforeAll(async () => {
  world = createWorld();
  server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (chunk: Buffer) => chunks.push(chunk));
      stream.on("end", () => {
        inbox.push({
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
          to: session.envelope.rcptTo.map((r) => r.address),
          raw: Buffer.concat(chunks).toString("utf8"),
        });
        callback();
      });
    },
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.server.address() as AddressInfo;
  process.env.SMTP_URL = `smtp://127.0.0.1:${port}`;
  process.env.MAIL_FROM = "Benchline <bench@bench.test>";
});

afterAll(async () => {
  delete process.env.SMTP_URL;
  delete process.env.MAIL_FROM;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  destroyWorld(world);
});

describe("invitation by e-mail over SMTP", () => {
  it("delivers a one-time link that sets a password, and the new member signs in", async () => {
    const invitations = await import("@/app/api/invitations/route");
    const trainer = await cookieFor(world.users.trainer.userId, world.a.workspaceId);
    const invited = await call(invitations.POST, {
      method: "POST",
      path: "/api/invitations",
      cookie: trainer,
      body: { email: "New.Apprentice@a.example", role: "apprentice" },
    });
    expect(invited.status).toBe(201);

    // The handler awaits delivery, so the message is already in the inbox.
    expect(inbox).toHaveLength(1);
    const mail = inbox[0]!;
    expect(mail.to).toEqual(["new.apprentice@a.example"]);
    expect(mail.from).toBe("bench@bench.test");
    const { headers, text } = parseMessage(mail.raw);
    expect(headers.get("subject")).toBe("Join Workspace a on Benchline");
    expect(text).toContain("as an apprentice");
    const link = /(https?:\/\/\S+\/join\/[A-Za-z0-9_-]+)/.exec(text)?.[1];
    expect(link).toBeDefined();
    const url = new URL(link!);
    expect(url.origin).toBe(appOrigin);
    const token = url.pathname.split("/").at(-1)!;

    // The mail row in the outbox is marked sent.
    const { listWorkspaceMail } = await import("@/db/queries/email-outbox");
    expect(listWorkspaceMail({ workspaceId: world.a.workspaceId })[0]?.status).toBe("sent");

    // Follow the link: the page asks what the invitation is for, then accepts.
    const accept = await import("@/app/api/invitations/accept/route");
    const described = await call(accept.GET, {
      method: "GET",
      path: `/api/invitations/accept?token=${token}`,
    });
    expect(described.status).toBe(200);
    expect(
      ((await described.json()) as { invitation: { role: string; accountExists: boolean } })
        .invitation,
    ).toMatchObject({
      role: "apprentice",
      accountExists: false,
    });
    const tooShort = await call(accept.POST, {
      method: "POST",
      path: "/api/x",
      body: { token, name: "Rowan Apprentice", password: "short" },
    });
    expect(tooShort.status).toBe(400);
    expect(((await tooShort.json()) as { error: { field: string } }).error.field).toBe("password");
    const accepted = await call(accept.POST, {
      method: "POST",
      path: "/api/x",
      body: { token, name: "Rowan Apprentice", password: "rowan-chose-this-one" },
    });
    expect(accepted.status).toBe(200);

    // The link works once.
    const again = await call(accept.POST, {
      method: "POST",
      path: "/api/x",
      body: { token, name: "Someone", password: "another-long-password" },
    });
    expect(again.status).toBe(404);

    // Sign in with the new password and land in the workspace as an apprentice.
    const session = await import("@/app/api/session/route");
    const signedIn = await call(session.POST, {
      method: "POST",
      path: "/api/session",
      body: { email: "new.apprentice@a.example", password: "rowan-chose-this-one" },
    });
    expect(signedIn.status).toBe(200);
    const me = await call(session.GET, {
      method: "GET",
      path: "/api/session",
      cookie: cookieFromResponse(signedIn),
    });
    const body = (await me.json()) as {
      user: { name: string };
      workspace: { id: string; role: string };
    };
    expect(body.user.name).toBe("Rowan Apprentice");
    expect(body.workspace).toMatchObject({ id: world.a.workspaceId, role: "apprentice" });
  });

  it("resending replaces the link; revoking kills it", async () => {
    const invitations = await import("@/app/api/invitations/route");
    const admin = await cookieFor(world.users.admin.userId, world.a.workspaceId);
    const created = await call(invitations.POST, {
      method: "POST",
      path: "/api/invitations",
      cookie: admin,
      body: { email: "second@a.example", role: "engineer" },
    });
    const { invitation } = (await created.json()) as { invitation: { id: string } };
    const firstToken = /\/join\/([A-Za-z0-9_-]+)/.exec(parseMessage(inbox.at(-1)!.raw).text)![1]!;
    const resend = await import("@/app/api/invitations/[invitationId]/resend/route");
    expect(
      (
        await call(resend.POST, {
          method: "POST",
          path: "/api/x",
          params: { invitationId: invitation.id },
          cookie: admin,
        })
      ).status,
    ).toBe(200);
    const secondToken = /\/join\/([A-Za-z0-9_-]+)/.exec(parseMessage(inbox.at(-1)!.raw).text)![1]!;
    expect(secondToken).not.toBe(firstToken);
    const accept = await import("@/app/api/invitations/accept/route");
    expect(
      (
        await call(accept.GET, {
          method: "GET",
          path: `/api/invitations/accept?token=${firstToken}`,
        })
      ).status,
    ).toBe(404);
    const revoke = await import("@/app/api/invitations/[invitationId]/route");
    expect(
      (
        await call(revoke.DELETE, {
          method: "DELETE",
          path: "/api/x",
          params: { invitationId: invitation.id },
          cookie: admin,
        })
      ).status,
    ).toBe(200);
    expect(
      (
        await call(accept.GET, {
          method: "GET",
          path: `/api/invitations/accept?token=${secondToken}`,
        })
      ).status,
    ).toBe(404);
  });

  it("resets a password by e-mail and ends the old sessions", async () => {
    const oldCookie = await cookieFor(world.users.engineer.userId, world.a.workspaceId);
    const reset = await import("@/app/api/session/password-reset/route");
    const before = inbox.length;
    const unknown = await call(reset.POST, {
      method: "POST",
      path: "/api/x",
      body: { email: "nobody@a.example" },
    });
    const known = await call(reset.POST, {
      method: "POST",
      path: "/api/x",
      body: { email: "engineer@a.example" },
    });
    expect(unknown.status).toBe(202);
    expect(known.status).toBe(202);
    expect(await unknown.text()).toBe(await known.text());
    // The reset mail leaves after the answer (so timing does not reveal the account).
    await vi.waitFor(() => expect(inbox.length).toBe(before + 1), { timeout: 10_000 });
    const link = /(https?:\/\/\S+\/reset-password\/[A-Za-z0-9_-]+)/.exec(
      parseMessage(inbox.at(-1)!.raw).text,
    )![1]!;
    const token = new URL(link).pathname.split("/").at(-1)!;
    const complete = await import("@/app/api/session/password-reset/complete/route");
    expect(
      (
        await call(complete.POST, {
          method: "POST",
          path: "/api/x",
          body: { token, password: "brand-new-password" },
        })
      ).status,
    ).toBe(200);
    expect(
      (
        await call(complete.POST, {
          method: "POST",
          path: "/api/x",
          body: { token, password: "brand-new-password" },
        })
      ).status,
    ).toBe(404);
    const session = await import("@/app/api/session/route");
    expect(
      (await call(session.GET, { method: "GET", path: "/api/session", cookie: oldCookie })).status,
    ).toBe(401);
    const signedIn = await call(session.POST, {
      method: "POST",
      path: "/api/session",
      body: { email: "engineer@a.example", password: "brand-new-password" },
    });
    expect(signedIn.status).toBe(200);
  });

  it("sends account mail by SMTP to its addressee only, never into a workspace's outbox", async () => {
    // A person in two workspaces: neither admin may read their reset link.
    createMembership({
      values: { userId: world.users.qa.userId, workspaceId: world.b.workspaceId, role: "qa" },
    });
    const log = vi.spyOn(console, "info").mockImplementation(() => undefined);
    const reset = await import("@/app/api/session/password-reset/route");
    const before = inbox.length;
    const response = await call(reset.POST, {
      method: "POST",
      path: "/api/x",
      body: { email: world.users.qa.email },
    });
    expect(response.status).toBe(202);
    await vi.waitFor(() => expect(inbox.length).toBe(before + 1), { timeout: 10_000 });
    const mail = inbox.at(-1)!;
    expect(mail.to).toEqual([world.users.qa.email]);
    const token = /\/reset-password\/([A-Za-z0-9_-]+)/.exec(parseMessage(mail.raw).text)![1]!;
    // With SMTP, nothing goes to the log.
    expect(log.mock.calls.flat().join(" ")).not.toContain(token);
    log.mockRestore();
    for (const workspaceId of [world.a.workspaceId, world.b.workspaceId]) {
      expect(
        listWorkspaceMail({ workspaceId }).filter((row) => row.toAddress === world.users.qa.email),
      ).toEqual([]);
    }
    await vi.waitFor(() => {
      const [row] = getDb()
        .select()
        .from(emailOutbox)
        .where(eq(emailOutbox.toAddress, world.users.qa.email))
        .all();
      expect(row).toMatchObject({
        workspaceId: null,
        audience: "account",
        status: "sent",
        textBody: forgottenMailBody,
      });
    });
  });
});
