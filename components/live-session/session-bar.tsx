"use client";

import Link from "next/link";
import { useState } from "react";
import { useLiveLink, useLiveLinkState } from "@/components/sim/sim-context";
import type { LinkStatus } from "@/components/sim/live-link-store";
import { Button } from "@/components/ui/button";
import { StatusBadge, type StatusTone } from "@/components/ui/status-badge";
import { Timestamp } from "@/components/ui/timestamp";
import { apiErrorText, stopLiveSession } from "./live-session-api";

const LINK_BADGE: Readonly<Record<LinkStatus, { tone: StatusTone; text: string }>> = {
  connecting: { tone: "neutral", text: "connecting…" },
  live: { tone: "healthy", text: "live" },
  reconnecting: { tone: "accent", text: "reconnecting…" },
  ended: { tone: "neutral", text: "ended" },
};

/**
 * The idle time the server applies, in minutes. Shown as a duration rather than
 * `idleStopAt`, which moves on while anyone watches and would be stale here.
 */
function idleMinutes(session: { lastActivityAt: string; idleStopAt: string }): number {
  return Math.round((Date.parse(session.idleStopAt) - Date.parse(session.lastActivityAt)) / 60_000);
}

/**
 * A server session's line above the console: whose it is, since when, when it
 * stops if nobody acts, the stream's state, and Stop for the owner. When the
 * session ends (idle, stopped, server restart) it says so in a banner that
 * stays, with the reason, and the console below keeps its last state to read.
 */
export function SessionBar({ viewerId }: { viewerId: string }) {
  const context = useLiveLink();
  const session = useLiveLinkState((s) => s.session, null);
  const status = useLiveLinkState((s) => s.status, "live");
  const ended = useLiveLinkState((s) => s.ended, null);
  const unreadable = useLiveLinkState((s) => s.unreadable, 0);
  const [stopping, setStopping] = useState(false);
  const [error, setError] = useState<string | null>(null);
  if (context === null) return null;
  const { link, canControl } = context;
  const badge = LINK_BADGE[status];
  const own = session !== null && session.owner.memberId === viewerId;

  return (
    <section aria-label="Server session" className="space-y-2">
      {ended ? (
        <div
          role="alert"
          className="rounded-lg border border-l-4 border-paper-line border-l-copper bg-paper-deep px-4 py-3 text-sm"
        >
          <p className="font-semibold text-ink">This session has ended.</p>
          <p className="text-ink-soft">{ended.text}</p>
          <p className="mt-1 text-ink-soft">
            What it showed last stays below to read. Start a new session from the{" "}
            <Link href="/console" className="text-copper-deep underline">
              live console
            </Link>
            .
          </p>
        </div>
      ) : null}
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2 rounded-lg border border-paper-line bg-paper px-4 py-2 text-sm">
        <span className="flex items-center gap-2">
          <span className="font-medium">Running on the server</span>
          <span role="status" aria-label="Link to the session">
            <StatusBadge tone={badge.tone}>{badge.text}</StatusBadge>
          </span>
        </span>
        {session ? (
          <>
            <span className="text-ink-soft">
              {own ? "Your session" : `${session.owner.name}'s session`}, started{" "}
              <Timestamp value={session.startedAt} relative />
            </span>
            {ended ? null : (
              <span className="text-ink-soft" data-testid="idle-stop">
                Stops after {idleMinutes(session)} min with nobody watching, commanding or connected
                over KNXnet/IP
              </span>
            )}
          </>
        ) : null}
        {canControl && !ended ? (
          <Button
            variant="secondary"
            className="ml-auto"
            disabled={stopping}
            aria-busy={stopping}
            onClick={async () => {
              setStopping(true);
              setError(null);
              try {
                await stopLiveSession(link.getState().sessionId);
                link.getState().end("stopped");
              } catch (cause) {
                setError(apiErrorText(cause));
              } finally {
                setStopping(false);
              }
            }}
          >
            Stop session
          </Button>
        ) : null}
      </div>
      {!canControl && !ended ? (
        <p className="text-xs text-ink-soft">
          You are watching: only the session&apos;s owner sends telegrams, changes faults or stops
          it.
        </p>
      ) : null}
      {unreadable > 0 ? (
        <p className="text-xs text-ink-soft">
          {unreadable} message{unreadable === 1 ? "" : "s"} from the server could not be read and
          were skipped.
        </p>
      ) : null}
      {error ? (
        <p role="alert" className="text-sm text-fault">
          {error}
        </p>
      ) : null}
    </section>
  );
}
