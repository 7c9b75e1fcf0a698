import type { Metadata } from "next";
import { Panel } from "@/components/ui/panel";
import { ResetForm } from "./reset-form";

export const metadata: Metadata = { title: "Choose a new password" };

export default async function ResetPasswordPage({
  params,
}: {
  params: Promise<{ token: string }>;
}) {
  const { token } = await params;
  return (
    <Panel title="Choose a new password">
      <p className="mb-4 text-sm text-ink-soft">
        Setting a new password signs your account out everywhere.
      </p>
      <ResetForm token={token} />
    </Panel>
  );
}
