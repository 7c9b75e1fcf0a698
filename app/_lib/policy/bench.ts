import { findBench, type Bench } from "@/db/queries/benches";
import { listVisibleBenches } from "@/db/queries/bench-history";
import { listLabCopyBenchIds } from "@/db/queries/labs";
import { can as roleCan, canOn } from "../capabilities";
import {
  type Action,
  type Can,
  ensure,
  type IdSource,
  notFound,
  nothing,
  type Who,
} from "./policy";

/**
 * The bench policy. A shared bench is read by the whole workspace; a private
 * bench (an apprentice's sandbox or lab copy, a trainer's private lab bench) only
 * by its owner and by those who manage labs. Archived benches are gone.
 */

/** Whether the session may read the bench at all. */
function readable(who: Who, bench: Bench): boolean {
  return (
    bench.workspaceId === who.workspaceId &&
    bench.archivedAt === null &&
    roleCan(who.role, "benches.read") &&
    (bench.privateOwnerId === null ||
      bench.privateOwnerId === who.userId ||
      roleCan(who.role, "labs.manage"))
  );
}

/**
 * What the session may do with a bench: edit and delete it (the "own" scope only
 * on one's own private copies), run it live or replay on it (the same),
 * share it by copying (anyone who may make benches).
 */
export function benchCan(who: Who, bench: Bench): Can {
  if (!readable(who, bench)) return nothing;
  const edit = canOn(who, "benches.edit", bench.privateOwnerId);
  return {
    read: true,
    edit,
    run: canOn(who, "console.use", bench.privateOwnerId),
    share: roleCan(who.role, "benches.edit"),
    delete: edit,
  };
}

const refusals: Record<Action, string> = {
  read: "you may not open this bench",
  edit: "your role may change only your own private copies",
  run: "your role may run only your own private copies",
  share: "your role may not copy benches",
  delete: "your role may delete only your own private copies",
};

/** Load a bench for an action; 404 when it is not readable, 403 when the action is not allowed. */
export function loadBench(
  who: Who,
  benchId: string,
  action: Action = "read",
  source: IdSource = {},
): Bench {
  const bench = findBench({ workspaceId: who.workspaceId, benchId });
  if (!bench) throw notFound("bench", source);
  ensure(benchCan(who, bench), action, "bench", refusals[action], source);
  return bench;
}

/** Every bench the session may read, by name. */
export function listReadableBenches(who: Who): Bench[] {
  return listVisibleBenches({
    workspaceId: who.workspaceId,
    userId: who.userId,
    includeAllPrivate: roleCan(who.role, "labs.manage"),
  });
}

/**
 * A bench as the API and pages show it. Where a bench was copied from is shown
 * only to those who may read the source, and never on a lab copy to anyone who
 * does not manage labs: comparing the copy with its source would give away the
 * faults the trainer hid in it.
 */
export function benchView(who: Who, bench: Bench, labCopies?: ReadonlySet<string>) {
  return {
    id: bench.id,
    name: bench.name,
    description: bench.description,
    createdBy: bench.createdBy,
    privateOwnerId: bench.privateOwnerId,
    copiedFromBenchId: visibleSource(who, bench, labCopies),
    createdAt: bench.createdAt.toISOString(),
    updatedAt: bench.updatedAt.toISOString(),
    can: benchCan(who, bench),
  };
}

function visibleSource(
  who: Who,
  bench: Bench,
  labCopies: ReadonlySet<string> = new Set(listLabCopyBenchIds({ benchIds: [bench.id] })),
): string | null {
  if (bench.copiedFromBenchId === null) return null;
  if (labCopies.has(bench.id) && !roleCan(who.role, "labs.manage")) return null;
  const source = findBench({ workspaceId: who.workspaceId, benchId: bench.copiedFromBenchId });
  return source && benchCan(who, source).read ? source.id : null;
}

/** The ids among these benches that are apprentices' lab copies (one query for a list). */
export function labCopiesAmong(benches: readonly Bench[]): ReadonlySet<string> {
  return new Set(listLabCopyBenchIds({ benchIds: benches.map((bench) => bench.id) }));
}
