import { getDb } from "@/db/client";
import { duplicateBench, findRevisionInWorkspace } from "@/db/queries/bench-history";
import { findBench, latestRevision } from "@/db/queries/benches";
import {
  createAssignments,
  createAttempt,
  createLab,
  setAssignmentBench,
  type Lab,
} from "@/db/queries/labs";
import { findScenario } from "@/db/queries/scenarios";
import { appUrl } from "../config";
import type { VerifiedSession } from "../dal";
import { AppError } from "../errors";
import { deliverPendingMail, queueMail } from "../mailer";
import { loadAssignment, loadGradingScenario, loadLabBench } from "../policy/lab";
import { resolveApprentices } from "../policy/member";
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
  const bench = loadLabBench(who, input.benchId);
  const scenario = loadGradingScenario(who, input.gradingScenarioId, bench);
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
  const apprentices = resolveApprentices(who, input.apprenticeIds, "apprenticeIds");
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
          audience: "workspace",
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

/** Make the apprentice's private copy (with the hidden faults) the first time; returns its bench id. */
export function openAssignment(
  who: Who,
  assignmentId: string,
): { benchId: string; created: boolean } {
  const found = loadAssignment(who, assignmentId, "run");
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
    // Not "Copied from <source>": the apprentice reads this copy's history.
    summary: `Your copy of the lab "${found.lab.title}"`,
  });
  setAssignmentBench({ assignmentId: found.assignment.id, benchId: copy.bench.id });
  return { benchId: copy.bench.id, created: true };
}

/** Submit the copy's latest revision: an attempt row and the grading run on that revision. */
export function submitAttempt(who: Who, assignmentId: string) {
  const found = loadAssignment(who, assignmentId, "run");
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
