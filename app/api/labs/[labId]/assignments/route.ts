import { verifyApiSession } from "@/app/_lib/dal";
import { json, readJson, route, type RouteParams } from "@/app/_lib/http";
import { assignLab } from "@/app/_lib/labs/lab-service";
import { loadLab } from "@/app/_lib/policy/lab";
import { assignLabSchema } from "./schema";

/** POST /api/labs/:labId/assignments — assign to apprentices; each new one gets an e-mail. */
export const POST = route(async (request, context: RouteParams<{ labId: string }>) => {
  const { labId } = await context.params;
  const session = await verifyApiSession(request);
  const found = loadLab(session, labId, "edit");
  const body = await readJson(request, assignLabSchema);
  const dueAt = body.dueAt
    ? new Date(body.dueAt.length === 10 ? `${body.dueAt}T23:59:59Z` : body.dueAt)
    : null;
  const created = await assignLab(session, found.lab, { apprenticeIds: body.apprenticeIds, dueAt });
  return json(
    { assigned: created.map((row) => ({ id: row.id, apprenticeId: row.apprenticeId })) },
    { status: 201 },
  );
});
