import type { Metadata } from "next";
import Link from "next/link";
import { can } from "@/app/_lib/capabilities";
import { requireCapability } from "@/app/_lib/dal";
import { PageHeader } from "@/components/ui/page-header";
import { MembersTable } from "./members-table";

export const metadata: Metadata = { title: "Members" };

export default async function MembersPage() {
  const session = await requireCapability("members.read");
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader
        title="Members"
        lead="Who belongs to this workspace and in which role."
        actions={
          can(session.role, "invitations.send") ? (
            <Link
              href="/invitations"
              className="rounded-md bg-copper px-3.5 py-2 text-sm font-medium text-white hover:bg-copper-deep"
            >
              Invitations
            </Link>
          ) : null
        }
      />
      <MembersTable canManage={can(session.role, "members.manage")} />
    </div>
  );
}
