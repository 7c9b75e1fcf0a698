import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { closeDb, getDb } from "@/db/client";
import { findUserByEmail } from "@/db/queries/users";
import { findWorkspaceBySlug } from "@/db/queries/workspaces";
import { runs, suiteRuns } from "@/db/schema";
import { seedDemoWorld } from "@/db/seed";
import { sessionCookieConfig } from "@/app/_lib/config";
import { sealSession } from "@/app/_lib/session";

/**
 * Shared set-up of the run API tests: a temporary database with the demo world
 * and content, the app's own connection pointed at it, and signed session
 * cookies for demo people. Route handlers are called directly with Requests.
 */
export const origin = "http://localhost:3000";

export function useTempDatabase(): { dir: string; cleanup: () => void } {
  const dir = mkdtempSync(path.join(tmpdir(), "benchline-runs-api-"));
  process.env.DATABASE_URL = path.join(dir, "api.db");
  process.env.SESSION_SECRET ??= "runs-api-test-secret-that-is-long-enough-0123456789";
  process.env.RUN_EXECUTOR = "inline";
  seedDemoWorld(getDb());
  return {
    dir,
    cleanup: () => {
      closeDb();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

export function workspaceIdOf(slug: string): string {
  const workspace = findWorkspaceBySlug({ slug });
  if (!workspace) throw new Error(`no workspace ${slug}`);
  return workspace.id;
}

export async function cookieFor(email: string, workspaceSlug = "fernhill"): Promise<string> {
  const user = findUserByEmail({ email });
  if (!user) throw new Error(`no demo user ${email}`);
  const sealed = await sealSession({
    userId: user.id,
    workspaceId: workspaceIdOf(workspaceSlug),
    sessionVersion: user.sessionVersion,
    issuedAt: Date.now(),
  });
  return `${sessionCookieConfig().name}=${encodeURIComponent(sealed)}`;
}

export function postJson(url: string, body: unknown, cookie?: string, extra: HeadersInit = {}) {
  const headers = new Headers(extra);
  if (!headers.has("origin")) headers.set("origin", origin);
  if (!headers.has("content-type")) headers.set("content-type", "application/json");
  if (cookie) headers.set("cookie", cookie);
  return new Request(`${origin}${url}`, {
    method: "POST",
    headers,
    body: typeof body === "string" ? body : JSON.stringify(body),
  });
}

export function getRequest(url: string, cookie?: string) {
  return new Request(`${origin}${url}`, { headers: cookie ? { cookie } : {} });
}

export function params<P extends Record<string, string>>(values: P) {
  return { params: Promise.resolve(values) };
}

const pause = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** Poll until a run (or suite run) is no longer queued or running. */
export async function waitForRun(id: string, timeoutMs = 60_000) {
  const db = getDb();
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const run = db.select().from(runs).where(eq(runs.id, id)).get();
    if (run && (run.status === "finished" || run.status === "errored")) return run;
    const suiteRun = db.select().from(suiteRuns).where(eq(suiteRuns.id, id)).get();
    if (suiteRun && (suiteRun.status === "finished" || suiteRun.status === "errored"))
      return suiteRun;
    await pause(20);
  }
  throw new Error(`run ${id} did not finish within ${timeoutMs} ms`);
}

/** Read a server-sent event stream to its end: one { event, data } per message. */
export async function readEventStream(response: Response) {
  const text = await response.text();
  return text
    .split("\n\n")
    .filter((block) => block.trim() !== "" && !block.startsWith(":"))
    .map((block) => {
      const lines = block.split("\n");
      const event = lines.find((l) => l.startsWith("event: "))?.slice(7) ?? "";
      const data = lines.find((l) => l.startsWith("data: "))?.slice(6) ?? "null";
      return { event, data: JSON.parse(data) as Record<string, unknown> };
    });
}
