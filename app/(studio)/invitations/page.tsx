import type { Metadata } from "next";
import { invitableRoles } from "@/app/_lib/capabilities";
import { requireCapability } from "@/app/_lib/dal";
import { PageHeader } from "@/components/ui/page-header";
import { InvitationsPanel } from "./invitations-panel";

export const metadata: Metadata = { title: "Invitations" };

export default async function InvitationsPage() {
  const session = await requireCapability("invitations.send");
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title="Invitations"
        lead="Invite people by e-mail. Each link works once and expires after 7 days."
      />
      <InvitationsPanel roles={invitableRoles(session.role)} />
    </div>
  );
}
