import { spawn } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { inArray } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { openDatabase, withNormalSync } from "@/db/client";
import { benchRevisions, runs, users } from "@/db/schema";

/**
 * A process killed with SIGKILL in the middle of a burst of writes loses none
 * it had acknowledged, and leaves a database SQLite itself finds intact. The
 * writer is a real child process using the real connection settings and query
 * functions (test/api/support/durability-writer.ts).
 */

const dir = mkdtempSync(path.join(tmpdir(), "benchline-durability-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Acknowledged writes to collect before the kill: enough to be mid-burst, few enough to stay quick. */
const ACKS_BEFORE_KILL = 240;

function writeUntilKilled(file: string) {
  return new Promise<{ acks: string[]; signal: NodeJS.Signals | null }>((resolve, reject) => {
    const writer = spawn(
      process.execPath,
      ["--import", "tsx", path.resolve("test/api/support/durability-writer.ts"), file],
      { stdio: ["ignore", "pipe", "pipe"] },
    );
    const acks: string[] = [];
    let pending = "";
    let stderr = "";
    writer.stderr.on("data", (chunk: Buffer) => (stderr += chunk.toString()));
    writer.stdout.on("data", (chunk: Buffer) => {
      pending += chunk.toString();
      const lines = pending.split("\n");
      pending = lines.pop() ?? "";
      for (const line of lines) if (line.startsWith("ack ")) acks.push(line);
      if (acks.length >= ACKS_BEFORE_KILL && writer.exitCode === null) writer.kill("SIGKILL");
    });
    writer.on("error", reject);
    writer.on("exit", (code, signal) => {
      if (signal === "SIGKILL") resolve({ acks, signal });
      else reject(new Error(`the writer exited by itself (code ${code}):\n${stderr}`));
    });
  });
}

describe("durability", () => {
  it("keeps every acknowledged write after SIGKILL mid-burst, and integrity_check is ok", async () => {
    const file = path.join(dir, "burst.db");
    const { acks, signal } = await writeUntilKilled(file);
    expect(signal).toBe("SIGKILL");
    expect(acks.length).toBeGreaterThanOrEqual(ACKS_BEFORE_KILL);

    const ids = { user: [] as string[], revision: [] as string[], verdict: [] as string[] };
    for (const line of acks) {
      const [, kind, id] = line.split(" ") as [string, keyof typeof ids, string];
      ids[kind].push(id);
    }
    const db = openDatabase(file, { migrate: false });
    try {
      expect(db.$client.pragma("integrity_check", { simple: true })).toBe("ok");
      expect(db.$client.pragma("synchronous", { simple: true })).toBe(2); // 2 = FULL
      const foundUsers = db.select().from(users).where(inArray(users.id, ids.user)).all();
      expect(foundUsers.map((row) => row.id).sort()).toEqual([...ids.user].sort());
      const foundRevisions = db
        .select()
        .from(benchRevisions)
        .where(inArray(benchRevisions.id, ids.revision))
        .all();
      expect(foundRevisions.map((row) => row.id).sort()).toEqual([...ids.revision].sort());
      const foundRuns = db.select().from(runs).where(inArray(runs.id, ids.verdict)).all();
      expect(foundRuns.map((row) => row.id).sort()).toEqual([...ids.verdict].sort());
      expect(foundRuns.every((run) => run.status === "finished" && run.verdict === "pass")).toBe(
        true,
      );
    } finally {
      db.$client.close();
    }
  }, 60_000);

  it("writes the run pool's bookkeeping under NORMAL and returns the connection to FULL", () => {
    const db = openDatabase(path.join(dir, "switch.db"));
    try {
      const during = withNormalSync(db, () => db.$client.pragma("synchronous", { simple: true }));
      expect(during).toBe(1); // 1 = NORMAL
      expect(db.$client.pragma("synchronous", { simple: true })).toBe(2);
      expect(() =>
        withNormalSync(db, () => {
          throw new Error("a failed write");
        }),
      ).toThrow("a failed write");
      expect(db.$client.pragma("synchronous", { simple: true })).toBe(2);
    } finally {
      db.$client.close();
    }
  });
});
