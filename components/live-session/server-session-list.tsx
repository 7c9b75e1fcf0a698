import Link from "next/link";
import type { LiveSessionView } from "@/app/_lib/live/live-session-view";
import { Mono } from "@/components/ui/mono";
import { StatusBadge } from "@/components/ui/status-badge";
import { Timestamp } from "@/components/ui/timestamp";
import { hostPort } from "./host-port";
import { serverSessionHref } from "./session-href";

/**
 * The sessions running on the server that the member may see: their own, and
 * (for a trainer) their apprentices'. Each opens in the console; one the
 * member does not control is opened to watch. Nothing is shown when none runs.
 */
export function ServerSessionList({
  sessions,
  memberId,
}: {
  sessions: readonly LiveSessionView[];
  memberId: string;
}) {
  if (sessions.length === 0) return null;
  return (
    <section aria-labelledby="server-sessions-heading" className="flex flex-col gap-2">
      <h2 id="server-sessions-heading" className="font-medium">
        Running on the server
      </h2>
      <ul className="flex flex-col gap-2" aria-label="Sessions running on the server">
        {sessions.map((session) => {
          const own = session.owner.memberId === memberId;
          const whose = own ? "Your session" : `${session.owner.name}'s session`;
          const clients = session.endpoint?.clients.length ?? 0;
          return (
            <li
              key={session.id}
              className="flex flex-wrap items-center justify-between gap-3 rounded-lg border border-paper-line bg-paper p-4"
            >
              <div className="min-w-0 space-y-1">
                <div className="font-medium">{session.benchName}</div>
                <div className="text-sm text-ink-soft">
                  {whose}, revision {session.revision}, started{" "}
                  <Timestamp value={session.startedAt} relative />
                </div>
                <div className="flex flex-wrap items-center gap-2 text-sm">
                  {session.endpoint ? (
                    <>
                      <StatusBadge tone="accent">on KNXnet/IP</StatusBadge>
                      <Mono>{hostPort(session.endpoint.address, session.endpoint.port)}</Mono>
                      <span className="text-ink-soft">
                        {clients} client{clients === 1 ? "" : "s"}
                      </span>
                    </>
                  ) : (
                    <StatusBadge tone="neutral">not published</StatusBadge>
                  )}
                </div>
              </div>
              <Link
                href={serverSessionHref(session.id)}
                className="rounded-md border border-paper-line bg-paper px-3.5 py-2 text-sm font-medium text-ink hover:bg-paper-deep"
                aria-label={`${session.canControl ? "Open" : "Watch"} ${own ? "your session" : `${session.owner.name}'s session`} of ${session.benchName}`}
              >
                {session.canControl ? "Open" : "Watch"}
              </Link>
            </li>
          );
        })}
      </ul>
    </section>
  );
}
