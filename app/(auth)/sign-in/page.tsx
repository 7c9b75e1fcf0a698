import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { getSession } from "@/app/_lib/dal";
import { Panel } from "@/components/ui/panel";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

/** Only same-site paths may be returned to after sign-in (no open redirect). */
function safeNext(value: string | string[] | undefined): string {
  const next = Array.isArray(value) ? value[0] : value;
  if (!next || !next.startsWith("/") || next.startsWith("//") || next.startsWith("/\\")) {
    return "/benches";
  }
  return next;
}

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const next = safeNext((await searchParams).next);
  if (await getSession()) redirect(next);
  return (
    <Panel title="Sign in to your workspace">
      <SignInForm next={next} />
      <p className="mt-4 text-sm text-ink-soft">
        <Link href="/forgot-password" className="text-copper-deep underline">
          Forgot your password?
        </Link>
      </p>
    </Panel>
  );
}
