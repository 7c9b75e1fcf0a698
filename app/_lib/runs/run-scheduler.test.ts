import { describe, expect, it } from "vitest";
import type { RunJob, RunJobOutcome } from "./run-job";
import { createRunScheduler, type RunExecutor } from "./run-scheduler";

/**
 * A fake executor: each job stays running until the test ends it, so the order
 * is decided by the scheduler alone, with no clock and no timing.
 */
function fakeExecutor(slots: number) {
  const running = new Map<string, (outcome: RunJobOutcome) => void>();
  const started: string[] = [];
  const executor: RunExecutor = {
    slots,
    mode: "inline",
    execute: (job) =>
      new Promise<RunJobOutcome>((resolve) => {
        started.push(job.runId);
        running.set(job.runId, resolve);
      }),
    close: async () => {},
  };
  const finish = async (runId: string) => {
    const resolve = running.get(runId);
    if (!resolve) throw new Error(`${runId} is not running (running: ${[...running.keys()]})`);
    running.delete(runId);
    resolve({ runId, kind: "error", message: "fake" });
    // Let the scheduler's continuation start the next job.
    await new Promise((r) => setImmediate(r));
  };
  return { executor, started, running, finish };
}

const job = (runId: string) => ({ runId }) as unknown as RunJob;

describe("fair run scheduling", () => {
  it("runs member B's short run before member A's queue of long runs drains", async () => {
    const fake = fakeExecutor(1);
    const pool = createRunScheduler(fake.executor);
    const finished: string[] = [];
    const submit = (member: string, runId: string) =>
      void pool.run(job(runId), { member }).then(() => finished.push(runId));

    submit("member-a", "a1");
    submit("member-a", "a2");
    submit("member-a", "a3");
    submit("member-b", "b1");
    expect(fake.started).toEqual(["a1"]);

    // End whatever is running, one at a time, until everything ran.
    while (fake.running.size > 0) await fake.finish([...fake.running.keys()][0]!);

    expect(finished).toEqual(["a1", "b1", "a2", "a3"]);
    expect(finished.indexOf("b1")).toBeLessThan(finished.indexOf("a3"));
  });

  it("gives a free slot to the member with fewest runs going, and keeps each member's own order", async () => {
    const fake = fakeExecutor(2);
    const pool = createRunScheduler(fake.executor);
    for (const id of ["a1", "a2", "a3", "a4"]) void pool.run(job(id), { member: "a" });
    expect(fake.started).toEqual(["a1", "a2"]);
    for (const id of ["b1", "b2"]) void pool.run(job(id), { member: "b" });
    void pool.run(job("c1"), { member: "c" });

    await fake.finish("a1");
    // A holds one slot; B and C have none, B waited longer.
    expect(fake.started.at(-1)).toBe("b1");
    await fake.finish("a2");
    expect(fake.started.at(-1)).toBe("c1");
    await fake.finish("b1");
    // A (one started at position 1) waited longer than B (started last) for its next turn.
    expect(fake.started.at(-1)).toBe("a3");
    expect(pool.pending).toBe(4);
    while (fake.running.size > 0) await fake.finish([...fake.running.keys()][0]!);
    expect(fake.started).toEqual(["a1", "a2", "b1", "c1", "a3", "b2", "a4"]);
    expect(pool.pending).toBe(0);
  });

  it("fires onStart as a job leaves the queue, and a throwing executor still ends the job", async () => {
    const events: string[] = [];
    const pool = createRunScheduler({
      slots: 1,
      mode: "inline",
      execute: () => Promise.reject(new Error("worker gone")),
      close: async () => {},
    });
    const outcome = await pool.run(job("x"), {
      member: "a",
      onStart: () => events.push("started"),
    });
    expect(events).toEqual(["started"]);
    expect(outcome).toMatchObject({ runId: "x", kind: "error" });
  });
});
