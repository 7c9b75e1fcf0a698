import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { json, readJson, route } from "@/app/_lib/http";
import { createLabFor } from "@/app/_lib/labs/lab-service";
import { listAssignmentsOf, listLabs } from "@/db/queries/labs";
import { createLabSchema } from "./schema";

/** GET /api/labs: trainers and admins every lab; apprentices their assignments. */
export const GET = route(async (request) => {
  const session = await verifyApiSession(request);
  const scope = authorize(session, "labs.read");
  if (scope === "workspace") {
    const labs = listLabs({ workspaceId: session.workspaceId }).map(
      ({ lab, benchName, gradingScenarioName }) => ({
        id: lab.id,
        title: lab.title,
        benchId: lab.benchId,
        benchName,
        gradingScenarioId: lab.gradingScenarioId,
        gradingScenarioName,
        hiddenFaults:
          lab.hiddenFaults === "[]" ? 0 : (JSON.parse(lab.hiddenFaults) as unknown[]).length,
        createdAt: lab.createdAt.toISOString(),
      }),
    );
    return json({ labs });
  }
  const assignments = listAssignmentsOf({
    workspaceId: session.workspaceId,
    apprenticeId: session.userId,
  }).map(({ assignment, lab }) => ({
    id: assignment.id,
    labId: lab.id,
    title: lab.title,
    dueAt: assignment.dueAt?.toISOString() ?? null,
    privateBenchId: assignment.privateBenchId,
  }));
  return json({ assignments });
});

/** POST /api/labs: create a lab (trainers, admins). Hidden faults must fit the bench. */
export const POST = route(async (request) => {
  const session = await verifyApiSession(request);
  authorize(session, "labs.manage");
  const body = await readJson(request, createLabSchema);
  const lab = createLabFor(session, body);
  return json({ lab: { id: lab.id, title: lab.title } }, { status: 201 });
});
