import { getDb } from "@/db/client";
import { duplicateBench, findRevisionInWorkspace } from "@/db/queries/bench-history";
import { findBench, latestRevision } from "@/db/queries/benches";
import {
  createAssignments,
  createAttempt,
  createLab,
  findAssignment,
  setAssignmentBench,
  type Lab,
} from "@/db/queries/labs";
import { findMembership } from "@/db/queries/memberships";
import { findScenario } from "@/db/queries/scenarios";
import { findUserById } from "@/db/queries/users";
import { scopeOf } from "../capabilities";
import { appUrl } from "../config";
import type { VerifiedSession } from "../dal";
import { AppError } from "../errors";
import { deliverPendingMail, queueMail } from "../mailer";
import { loadVisibleBench } from "../resources";
import { startScenarioRun } from "../runs/run-service";
import { applyHiddenFaults, type HiddenFault, parseHiddenFaults } from "./hidden-faults";
import { formatDate } from "@/components/ui/format-date";

type Who = Pick<VerifiedSession, "userId" | "workspaceId" | "role" | "name">;

/**
 * Training labs: a trainer makes a lab from a shared bench and a grading
 * scenario (with faults hidden in the apprentices' copies), assigns it with a
 * due date and an e-mail, each apprentice works on a private copy and submits,
 * and the grading scenario runs on the submitted revision.
 */

export function createLabFor(
  who: Who,
  input: {
    title: string;
    brief: string;
    benchId: string;
    gradingScenarioId: string;
    hiddenFaults: readonly HiddenFault[];
  },
): Lab {
  const bench = loadVisibleBench(who, input.benchId);
  if (bench.privateOwnerId !== null) {
    throw new AppError(
      "invalid_input",
      "benchId: a lab is made from a shared bench, not a private copy",
      {
        field: "benchId",
      },
    );
  }
  const scenario = findScenario({
    workspaceId: who.workspaceId,
    scenarioId: input.gradingScenarioId,
  });
  if (!scenario)
    throw new AppError("not_found", "no such scenario", { field: "gradingScenarioId" });
  if (scenario.benchId !== bench.id) {
    throw new AppError(
      "invalid_input",
      `gradingScenarioId: "${scenario.name}" runs on another bench than "${bench.name}"`,
      { field: "gradingScenarioId" },
    );
  }
  const revision = latestRevision({ benchId: bench.id });
  if (!revision) throw new AppError("conflict", `bench "${bench.name}" has no saved revision`);
  const applied = applyHiddenFaults(JSON.parse(revision.document), input.hiddenFaults);
  if (!applied.ok) {
    const field = `hiddenFaults[${applied.error.index}].${applied.error.field}`;
    throw new AppError("invalid_input", `${field}: ${applied.error.message}`, { field });
  }
  return createLab({
    values: {
      workspaceId: who.workspaceId,
      title: input.title,
      brief: input.brief,
      benchId: bench.id,
      gradingScenarioId: scenario.id,
      hiddenFaults: JSON.stringify(input.hiddenFaults),
      createdBy: who.userId,
    },
  });
}

/** Assign a lab; every id must be an apprentice of the workspace. Each new assignee gets an e-mail. */
export async function assignLab(
  who: Who,
  lab: Lab,
  input: { apprenticeIds: readonly string[]; dueAt: Date | null },
) {
  const db = getDb();
  const apprentices = input.apprenticeIds.map((id, index) => {
    const membership = findMembership({ userId: id, workspaceId: who.workspaceId });
    const user = findUserById({ userId: id });
    if (!membership || !user || membership.role !== "apprentice") {
      throw new AppError(
        "invalid_input",
        `apprenticeIds[${index}]: not an apprentice of this workspace`,
        {
          field: `apprenticeIds[${index}]`,
        },
      );
    }
    return user;
  });
  const created = db.transaction((tx) => {
    const rows = createAssignments({
      db: tx as unknown as typeof db,
      labId: lab.id,
      apprenticeIds: apprentices.map((a) => a.id),
      dueAt: input.dueAt,
      assignedBy: who.userId,
    });
    for (const row of rows) {
      const apprentice = apprentices.find((a) => a.id === row.apprenticeId)!;
      const due = input.dueAt ? `It is due on ${formatDate(input.dueAt)}.` : "It has no due date.";
      queueMail(
        {
          workspaceId: who.workspaceId,
          to: apprentice.email,
          subject: `New lab: ${lab.title}`,
          text: [
            `${who.name} assigned you the lab "${lab.title}". ${due}`,
            "",
            lab.brief,
            "",
            `Open it: ${appUrl()}/labs/assignments/${row.id}`,
          ].join("\n"),
          purpose: "lab-assignment",
        },
        tx as unknown as typeof db,
      );
    }
    return rows;
  });
  void deliverPendingMail().catch((error) => console.error("lab assignment mail", error));
  return created;
}

/** The assignment, visible to its apprentice and to those who manage labs; 404 otherwise. */
export function loadAssignment(
  who: Who,
  assignmentId: string,
  options: { apprenticeOnly?: boolean } = {},
) {
  const found = findAssignment({ workspaceId: who.workspaceId, assignmentId });
  const isApprentice = found?.assignment.apprenticeId === who.userId;
  const manages = scopeOf(who.role, "labs.manage") === "workspace";
  if (!found || (!isApprentice && !manages)) throw new AppError("not_found", "no such assignment");
  if (options.apprenticeOnly && !isApprentice) {
    throw new AppError("forbidden", "only the apprentice the lab is assigned to may do this");
  }
  return found;
}

/** Make the apprentice's private copy (with the hidden faults) the first time; returns its bench id. */
export function openAssignment(
  who: Who,
  assignmentId: string,
): { benchId: string; created: boolean } {
  const found = loadAssignment(who, assignmentId, { apprenticeOnly: true });
  const existing = found.assignment.privateBenchId
    ? findBench({ workspaceId: who.workspaceId, benchId: found.assignment.privateBenchId })
    : undefined;
  if (existing && existing.archivedAt === null) return { benchId: existing.id, created: false };
  const source = findBench({ workspaceId: who.workspaceId, benchId: found.lab.benchId });
  const revision = source ? latestRevision({ benchId: source.id }) : undefined;
  if (!source || !revision) throw new AppError("conflict", "the lab's bench has no saved revision");
  const applied = applyHiddenFaults(
    JSON.parse(revision.document),
    parseHiddenFaults(found.lab.hiddenFaults),
  );
  // The faults were checked against the bench when the lab was made; a bench edited since may not fit.
  const document = applied.ok ? applied.value : JSON.parse(revision.document);
  const copy = duplicateBench({
    source,
    document: JSON.stringify(document),
    name: `${found.lab.title} (${found.apprenticeName})`,
    createdBy: who.userId,
    privateOwnerId: who.userId,
  });
  setAssignmentBench({ assignmentId: found.assignment.id, benchId: copy.bench.id });
  return { benchId: copy.bench.id, created: true };
}

/** Submit the copy's latest revision: an attempt row and the grading run on that revision. */
export function submitAttempt(who: Who, assignmentId: string) {
  const found = loadAssignment(who, assignmentId, { apprenticeOnly: true });
  const benchId = found.assignment.privateBenchId;
  if (!benchId) {
    throw new AppError(
      "conflict",
      "start working on the lab first: there is no copy to submit yet",
    );
  }
  const revision = latestRevision({ benchId });
  const scenario = findScenario({
    workspaceId: who.workspaceId,
    scenarioId: found.lab.gradingScenarioId,
  });
  if (!revision || !scenario)
    throw new AppError("conflict", "the lab's copy or grading scenario is missing");
  // Double-check the revision is in the workspace before grading it.
  if (!findRevisionInWorkspace({ workspaceId: who.workspaceId, revisionId: revision.id })) {
    throw new AppError("not_found", "no such bench revision");
  }
  const { run } = startScenarioRun({
    workspaceId: who.workspaceId,
    startedBy: who.userId,
    scenario,
    revision,
    gradeAsWritten: true,
  });
  const attempt = createAttempt({
    values: { assignmentId: found.assignment.id, benchRevisionId: revision.id, runId: run.id },
  });
  return { attempt, run };
}
