import type { Bench } from "@/db/queries/benches";
import { findAssignment, findLab } from "@/db/queries/labs";
import { can as roleCan, scopeOf } from "../capabilities";
import { AppError } from "../errors";
import { loadBench } from "./bench";
import { loadScenario } from "./scenario";
import {
  type Action,
  type Can,
  ensure,
  forbidden,
  type IdSource,
  notFound,
  nothing,
  type Who,
} from "./policy";

/**
 * The lab policy. Labs (their set-up, hidden faults and every attempt) are for
 * those who manage labs. An assignment is read by its apprentice and by lab
 * managers; only its apprentice works on it (opens the copy, submits). What an
 * apprentice is shown never names the bench the lab was made from: comparing
 * their copy with it would give the hidden faults away.
 */

export function labCan(who: Who, lab: { workspaceId: string }): Can {
  if (lab.workspaceId !== who.workspaceId || !roleCan(who.role, "labs.manage")) return nothing;
  return { read: true, edit: true, run: false, share: true, delete: true };
}

export function loadLab(who: Who, labId: string, action: Action = "read", source: IdSource = {}) {
  // A role without the capability is refused as such; that says nothing about the id.
  if (!roleCan(who.role, "labs.manage")) {
    throw forbidden(`your role (${who.role}) may not do this: labs.manage`);
  }
  const found = findLab({ workspaceId: who.workspaceId, labId });
  if (!found) throw notFound("lab", source);
  ensure(labCan(who, found.lab), action, "lab", "your role may not manage labs", source);
  return found;
}

/**
 * What a session may do with an assignment: read it (its apprentice, lab
 * managers), work on it ("run": open the copy and submit; its apprentice only,
 * while the role still holds "labs.read").
 */
export function assignmentCan(who: Who, assignment: { apprenticeId: string }): Can {
  const isApprentice = assignment.apprenticeId === who.userId;
  const manages = scopeOf(who.role, "labs.manage") === "workspace";
  if (!roleCan(who.role, "labs.read") || (!isApprentice && !manages)) return nothing;
  return { read: true, edit: false, run: isApprentice, share: false, delete: false };
}

export function loadAssignment(
  who: Who,
  assignmentId: string,
  action: Action = "read",
  source: IdSource = {},
) {
  if (!roleCan(who.role, "labs.read")) {
    throw forbidden(`your role (${who.role}) may not do this: labs.read`);
  }
  const found = findAssignment({ workspaceId: who.workspaceId, assignmentId });
  if (!found) throw notFound("assignment", source);
  ensure(
    assignmentCan(who, found.assignment),
    action,
    "assignment",
    "only the apprentice the lab is assigned to may do this",
    source,
  );
  const managing = roleCan(who.role, "labs.manage");
  return {
    ...found,
    // The source bench's name only for those who manage labs; apprentices see their copy's.
    benchName: managing ? found.benchName : null,
  };
}

/** Whether a lab may be made from this bench: shared, or the session's own private bench. */
export function mayMakeLabFrom(who: Who, bench: Bench): boolean {
  return bench.privateOwnerId === null || bench.privateOwnerId === who.userId;
}

/**
 * The bench a new lab is made from: one the trainer may read, either shared or
 * their own private bench (a private lab bench keeps its fault-free original
 * out of the apprentices' reach). Never someone else's private copy.
 */
export function loadLabBench(who: Who, benchId: string): Bench {
  const source = { field: "benchId" };
  const bench = loadBench(who, benchId, "read", source);
  if (!mayMakeLabFrom(who, bench)) {
    throw new AppError(
      "invalid_input",
      "benchId: a lab is made from a shared bench or your own private bench, not someone else's copy",
      source,
    );
  }
  return bench;
}

/** The grading scenario of a new lab: readable, and on the lab's bench. */
export function loadGradingScenario(who: Who, scenarioId: string, bench: Bench) {
  const { scenario } = loadScenario(who, scenarioId, "read", { field: "gradingScenarioId" });
  if (scenario.benchId !== bench.id) {
    throw new AppError(
      "invalid_input",
      `gradingScenarioId: that scenario runs on another bench than "${bench.name}", the lab's bench`,
      { field: "gradingScenarioId" },
    );
  }
  return scenario;
}
