import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { loadScenario } from "@/app/_lib/policy/scenario";
import { AppError } from "@/app/_lib/errors";
import { documentBodyLimitBytes, json, readJson, route, type RouteParams } from "@/app/_lib/http";
import { checkedScenarioDocument, resourceIdSchema } from "@/app/_lib/resources";
import { deleteScenario, updateScenario } from "@/db/queries/scenarios";
import { scenarioJson } from "../scenario-json";
import { updateScenarioBodySchema } from "./schema";

type Params = RouteParams<{ scenarioId: string }>;

async function scenarioIdOf(context: Params) {
  const parsed = resourceIdSchema.safeParse((await context.params).scenarioId);
  if (!parsed.success) throw new AppError("not_found", "no such scenario");
  return parsed.data;
}

export const GET = route(async (request, context: Params) => {
  const scenarioId = await scenarioIdOf(context);
  const session = await verifyApiSession(request);
  authorize(session, "scenarios.read");
  const { scenario } = loadScenario(session, scenarioId);
  return json({ scenario: scenarioJson(scenario, { document: true }) });
});

export const PATCH = route(async (request, context: Params) => {
  const scenarioId = await scenarioIdOf(context);
  const session = await verifyApiSession(request);
  const { scenario } = loadScenario(session, scenarioId, "edit");
  const body = await readJson(request, updateScenarioBodySchema, {
    limitBytes: documentBodyLimitBytes,
  });
  const document = body.document === undefined ? null : checkedScenarioDocument(body.document);
  const updated = updateScenario({
    workspaceId: session.workspaceId,
    scenarioId: scenario.id,
    values: {
      ...(body.name === undefined ? {} : { name: body.name }),
      ...(document ? { document: document.text } : {}),
    },
  });
  if (!updated) throw new AppError("not_found", "no such scenario");
  return json({ scenario: scenarioJson(updated, { document: true }) });
});

export const DELETE = route(async (request, context: Params) => {
  const scenarioId = await scenarioIdOf(context);
  const session = await verifyApiSession(request);
  const { scenario } = loadScenario(session, scenarioId, "delete");
  deleteScenario({ workspaceId: session.workspaceId, scenarioId: scenario.id });
  return new Response(null, { status: 204, headers: { "Cache-Control": "no-store" } });
});
