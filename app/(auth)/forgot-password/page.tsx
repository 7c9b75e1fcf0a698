import type { Metadata } from "next";
import { Panel } from "@/components/ui/panel";
import { ForgotForm } from "./forgot-form";

export const metadata: Metadata = { title: "Forgot password" };

export default function ForgotPasswordPage() {
  return (
    <Panel title="Reset your password">
      <p className="mb-4 text-sm text-ink-soft">
        Give your account&apos;s e-mail address and we send a link that works once, for one hour.
      </p>
      <ForgotForm />
    </Panel>
  );
}
