import type { RunJob, RunJobOutcome } from "./run-job";

/** Where jobs actually run (worker threads, inline, or a fake in tests). */
export interface RunExecutor {
  /** How many jobs may run at once right now. */
  readonly slots: number;
  readonly mode: "workers" | "inline";
  /** Run one job; resolves with its outcome (never rejects on a scenario's own failure). */
  execute(job: RunJob): Promise<RunJobOutcome>;
  close(): Promise<void>;
}

export interface ScheduleOptions {
  /** Whose job this is: jobs take turns by member, not by arrival. */
  readonly member: string;
  /** Fires when the job leaves the queue and starts. */
  readonly onStart?: () => void;
}

export interface RunPool {
  /** Queue a job; resolves when it has run. */
  run(job: RunJob, options: ScheduleOptions): Promise<RunJobOutcome>;
  /** Jobs waiting plus jobs running. */
  readonly pending: number;
  readonly mode: "workers" | "inline";
  close(): Promise<void>;
}

interface Waiting {
  readonly job: RunJob;
  readonly options: ScheduleOptions;
  readonly resolve: (outcome: RunJobOutcome) => void;
}

interface MemberTurns {
  readonly waiting: Waiting[];
  running: number;
  /** When this member last had a job started (a counter, not a clock). */
  lastStarted: number;
}

/**
 * Fair scheduling of scenario replays between members. Arrival order alone let
 * one member's queue of long scenarios hold every slot while another member's
 * small suite waited behind all of it. Here each free slot goes to the member
 * with waiting jobs who has the fewest jobs running, and among those the one
 * whose last job started longest ago: round-robin by member. A member's own
 * jobs keep their order (a suite still runs scenario by scenario).
 *
 * Pure apart from the executor: no clock and no timers, so a test drives it
 * with a fake executor and decides when each job ends.
 */
class FairRunScheduler implements RunPool {
  // Kept for every member seen (one small entry per person), so a member who
  // comes back after a pause is ordered by when their last job really started.
  private readonly members = new Map<string, MemberTurns>();
  private running = 0;
  private waitingCount = 0;
  private starts = 0;

  constructor(private readonly executor: RunExecutor) {}

  get mode(): "workers" | "inline" {
    return this.executor.mode;
  }

  get pending(): number {
    return this.waitingCount + this.running;
  }

  run(job: RunJob, options: ScheduleOptions): Promise<RunJobOutcome> {
    return new Promise((resolve) => {
      let turns = this.members.get(options.member);
      if (!turns) {
        turns = { waiting: [], running: 0, lastStarted: -1 };
        this.members.set(options.member, turns);
      }
      turns.waiting.push({ job, options, resolve });
      this.waitingCount += 1;
      this.pump();
    });
  }

  /** The member whose turn it is, or undefined when nobody waits. */
  private nextMember(): MemberTurns | undefined {
    let chosen: MemberTurns | undefined;
    for (const turns of this.members.values()) {
      if (turns.waiting.length === 0) continue;
      if (
        !chosen ||
        turns.running < chosen.running ||
        (turns.running === chosen.running && turns.lastStarted < chosen.lastStarted)
      ) {
        chosen = turns;
      }
    }
    return chosen;
  }

  private pump(): void {
    while (this.running < this.executor.slots) {
      const turns = this.nextMember();
      if (!turns) return;
      const next = turns.waiting.shift()!;
      this.waitingCount -= 1;
      this.running += 1;
      turns.running += 1;
      turns.lastStarted = this.starts++;
      try {
        next.options.onStart?.();
      } catch (error) {
        console.error("run scheduler: onStart failed", error);
      }
      this.executor
        .execute(next.job)
        .catch((error: unknown): RunJobOutcome => ({
          runId: next.job.runId,
          kind: "error",
          message: `the runner failed: ${error instanceof Error ? error.message : String(error)}`,
        }))
        .then((outcome) => {
          this.running -= 1;
          turns.running -= 1;
          next.resolve(outcome);
          this.pump();
        });
    }
  }

  close(): Promise<void> {
    return this.executor.close();
  }
}

export function createRunScheduler(executor: RunExecutor): RunPool {
  return new FairRunScheduler(executor);
}
