import type { Metadata } from "next";
import { requireCapability } from "@/app/_lib/dal";
import { mailTransportKind } from "@/app/_lib/mailer";
import { listWorkspaceMail } from "@/db/queries/email-outbox";
import { Mono } from "@/components/ui/mono";
import { PageHeader } from "@/components/ui/page-header";
import { StatusBadge } from "@/components/ui/status-badge";
import { Timestamp } from "@/components/ui/timestamp";

export const metadata: Metadata = { title: "Outbox" };

/**
 * Mail the app queued on this workspace's behalf: invitations, shared run
 * reports, lab assignments. Account mail (password resets) belongs to no
 * workspace and never appears here. Without SMTP_URL the outbox is where
 * workspace mail ends up, so bodies (with their links) are shown; once mail
 * leaves by SMTP, only the envelope is shown, so one-time links stay with
 * their recipients.
 */
export default async function OutboxPage() {
  const session = await requireCapability("outbox.read");
  const mails = listWorkspaceMail({ workspaceId: session.workspaceId });
  const localOnly = mailTransportKind() === "outbox";
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title="Outbox"
        lead={
          localOnly
            ? "No mail server is configured (SMTP_URL), so this workspace's invitations, run reports and lab assignments stay here. Password-reset mail is personal: it is printed to the server log, never shown here."
            : "Mail sent through the configured mail server; bodies are not shown."
        }
      />
      {mails.length === 0 ? (
        <p className="text-sm text-ink-soft">No mail yet.</p>
      ) : (
        <ul className="flex flex-col gap-3">
          {mails.map((mail) => (
            <li key={mail.id} className="rounded-lg border border-paper-line bg-paper p-4">
              <div className="flex flex-wrap items-center justify-between gap-2">
                <div>
                  <div className="font-medium">{mail.subject}</div>
                  <div className="text-sm text-ink-soft">
                    to <Mono>{mail.toAddress}</Mono> · {mail.purpose} ·{" "}
                    <Timestamp value={mail.createdAt} relative />
                  </div>
                </div>
                <StatusBadge
                  tone={
                    mail.status === "sent"
                      ? "healthy"
                      : mail.status === "failed"
                        ? "fault"
                        : "neutral"
                  }
                >
                  {mail.status}
                </StatusBadge>
              </div>
              {localOnly ? (
                <pre className="mt-3 font-mono text-xs break-all whitespace-pre-wrap text-ink-soft">
                  {mail.textBody}
                </pre>
              ) : null}
              {mail.lastError ? <p className="mt-2 text-xs text-fault">{mail.lastError}</p> : null}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
