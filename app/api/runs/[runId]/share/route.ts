import { admitRunShare } from "@/app/_lib/auth";
import { verifyApiSession } from "@/app/_lib/dal";
import { appUrl } from "@/app/_lib/config";
import { AppError } from "@/app/_lib/errors";
import { json, readJson, route, type RouteParams } from "@/app/_lib/http";
import { deliverPendingMail, queueMail } from "@/app/_lib/mailer";
import { loadRunOrSuiteRun } from "@/app/_lib/policy/run";
import { findMembership } from "@/db/queries/memberships";
import { findUserByEmail } from "@/db/queries/users";
import { findWorkspaceById } from "@/db/queries/workspaces";
import { shareRunSchema } from "./schema";

/**
 * POST /api/runs/:runId/share — e-mail a run report's link to a colleague.
 * Only members of the workspace can open the link, so only they can be sent
 * it; that also keeps the app from mailing arbitrary addresses. Each member
 * may share only so many reports an hour (429 beyond that).
 */
export const POST = route(async (request, context: RouteParams<{ runId: string }>) => {
  const { runId } = await context.params;
  const session = await verifyApiSession(request);
  const visible = loadRunOrSuiteRun(session, runId);
  const body = await readJson(request, shareRunSchema);
  const recipient = findUserByEmail({ email: body.to });
  const membership = recipient
    ? findMembership({ userId: recipient.id, workspaceId: session.workspaceId })
    : undefined;
  if (!recipient || !membership || recipient.disabledAt !== null) {
    throw new AppError("invalid_input", "to: not a member of this workspace", { field: "to" });
  }
  // Counted only once the share is valid: a refused one sends nothing.
  admitRunShare({ userId: session.userId });
  const workspace = findWorkspaceById({ workspaceId: session.workspaceId });
  const what =
    visible.kind === "scenario"
      ? `scenario "${visible.run.scenarioName}"`
      : `suite "${visible.suiteRun.suiteName}"`;
  const link = `${appUrl()}/runs/${runId}`;
  const text = [
    `${session.name} shared a Benchline run report with you: ${what}.`,
    "",
    body.note ? `${body.note}\n` : "",
    `Open the report (sign in to ${workspace?.name ?? "the workspace"}): ${link}`,
    "",
    "The simulator does not replace the manufacturer's instructions, local codes or licensed practice.",
  ]
    .filter((line, index, lines) => !(line === "" && lines[index - 1] === ""))
    .join("\n");
  queueMail({
    audience: "workspace",
    workspaceId: session.workspaceId,
    to: recipient.email,
    subject: `Run report: ${what}`,
    text,
    purpose: "run-report",
  });
  // Delivery happens after the answer; the outbox row is the record either way.
  void deliverPendingMail().catch((error) => console.error("run report mail", error));
  return json({ sent: true, to: recipient.email }, { status: 202 });
});
