import Link from "next/link";
import { PageHeader } from "@/components/ui/page-header";

/**
 * A session that is not running, or not one the member may see (never told
 * apart): sessions end when stopped, when idle and when the server restarts,
 * so an old link or a reload after the end lands here.
 */
export default function SessionNotFound() {
  return (
    <div className="mx-auto flex max-w-3xl flex-col gap-4 px-6 py-8 md:px-10">
      <PageHeader title="This session is not running" />
      <p className="text-ink-soft">
        Sessions on the server end when their owner stops them, after a time with no activity, and
        when the server restarts; none of them is kept. Start a new one from the{" "}
        <Link href="/console" className="text-copper-deep underline">
          live console
        </Link>
        .
      </p>
    </div>
  );
}
