import type { Metadata } from "next";
import Link from "next/link";
import { describeInvitation } from "@/app/_lib/invitations";
import { Panel } from "@/components/ui/panel";
import { JoinForm } from "./join-form";

export const metadata: Metadata = { title: "Join a workspace" };

export default async function JoinPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  let invitation: ReturnType<typeof describeInvitation> | null = null;
  try {
    invitation = describeInvitation(token);
  } catch {
    invitation = null;
  }
  if (!invitation) {
    return (
      <Panel title="This invitation link is not valid any more">
        <p className="text-sm text-ink-soft">
          It may have been used, revoked or have expired (links work for 7 days). Ask whoever
          invited you to send it again.
        </p>
        <p className="mt-4 text-sm">
          <Link href="/sign-in" className="text-copper-deep underline">
            Sign in
          </Link>
        </p>
      </Panel>
    );
  }
  return (
    <Panel title={`Join ${invitation.workspaceName}`}>
      <p className="mb-4 text-sm text-ink-soft">
        You are invited as <strong>{invitation.role}</strong> with {invitation.email}.
        {invitation.accountExists
          ? " You already have a Benchline account: confirm with its password."
          : " Choose your name and a password."}
      </p>
      <JoinForm token={token} accountExists={invitation.accountExists} />
    </Panel>
  );
}
