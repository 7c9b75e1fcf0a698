import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { labCopiesAmong, listReadableBenches } from "@/app/_lib/policy/bench";
import { documentBodyLimitBytes, json, readJson, route } from "@/app/_lib/http";
import { checkedBenchDocument } from "@/app/_lib/resources";
import { checkedName } from "@/app/_lib/names";
import { createBench } from "@/db/queries/benches";
import { benchView } from "./bench-json";
import { benchNameSchema, createBenchBodySchema } from "./schema";

/** Benches of the active workspace: shared ones and the member's own copies (trainers and admins: all copies). */
export const GET = route(async (request) => {
  const session = await verifyApiSession(request);
  authorize(session, "benches.read");
  const benches = listReadableBenches(session);
  const labCopies = labCopiesAmong(benches);
  return json({ benches: benches.map((bench) => benchView(session, bench, labCopies)) });
});

/** Create a bench with its first revision. */
export const POST = route(async (request) => {
  const session = await verifyApiSession(request);
  const scope = authorize(session, "benches.edit");
  const body = await readJson(request, createBenchBodySchema, {
    limitBytes: documentBodyLimitBytes,
  });
  const document = checkedBenchDocument(body.document);
  const created = createBench({
    values: {
      workspaceId: session.workspaceId,
      name: body.name ?? checkedName(benchNameSchema, document.name, ["document", "name"]),
      description: body.description ?? "",
      createdBy: session.userId,
      // "own" scope (apprentices) may only make private sandbox benches.
      privateOwnerId: scope === "own" ? session.userId : null,
    },
    document: document.text,
  });
  return json(
    { bench: benchView(session, created.bench), revision: { number: created.revision.number } },
    { status: 201 },
  );
});
