import type { Metadata } from "next";
import { verifySession } from "@/app/_lib/dal";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { PasswordForm } from "./password-form";

export const metadata: Metadata = { title: "Account" };

export default async function AccountPage() {
  const session = await verifySession();
  return (
    <div className="mx-auto flex max-w-3xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader title="Account" lead={`${session.name} · ${session.email}`} />
      <Panel title="Change password" className="max-w-md">
        <p className="mb-4 text-sm text-ink-soft">
          Changing your password signs you out everywhere else.
        </p>
        <PasswordForm />
      </Panel>
    </div>
  );
}
