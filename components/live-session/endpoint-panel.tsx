"use client";

import { useState } from "react";
import type { LiveSessionView } from "@/app/_lib/live/live-session-view";
import { useLiveLink, useLiveLinkState } from "@/components/sim/sim-context";
import { Button } from "@/components/ui/button";
import { Mono } from "@/components/ui/mono";
import { StatusBadge } from "@/components/ui/status-badge";
import { Timestamp } from "@/components/ui/timestamp";
import { hostPort } from "./host-port";
import {
  apiErrorText,
  disconnectTunnel,
  publishEndpoint,
  unpublishEndpoint,
} from "./live-session-api";

type Endpoint = NonNullable<LiveSessionView["endpoint"]>;
type TunnelClient = Endpoint["clients"][number];

/**
 * A server session's KNXnet/IP tunnelling endpoint: publish or unpublish it
 * (owner), where it answers, a warning when that is not loopback, and every
 * connected tunnel client with a control to disconnect it. Reads the session
 * from the live link, which the event stream keeps current.
 */
export function EndpointPanel() {
  const context = useLiveLink();
  const session = useLiveLinkState((s) => s.session, null);
  const ended = useLiveLinkState((s) => s.status === "ended", false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  if (context === null || session === null) return null;
  const { link, canControl } = context;
  const endpoint = session.endpoint;

  const act = async (run: () => Promise<LiveSessionView | void>) => {
    setBusy(true);
    setError(null);
    try {
      const view = await run();
      if (view) link.getState().setSession(view);
    } catch (cause) {
      setError(apiErrorText(cause));
    } finally {
      setBusy(false);
    }
  };

  const disconnect = (client: TunnelClient) =>
    act(async () => {
      await disconnectTunnel(session.id, client.channelId);
      // The stream confirms within a second; the row goes at once.
      const current = link.getState().session;
      if (current?.endpoint)
        link.getState().setSession({
          ...current,
          endpoint: {
            ...current.endpoint,
            clients: current.endpoint.clients.filter((c) => c.channelId !== client.channelId),
          },
        });
    });

  return (
    <div className="space-y-3 text-sm">
      <EndpointCaution />
      {endpoint === null ? (
        <div className="space-y-2">
          <p className="text-ink-soft">
            Not published. Publishing opens a KNXnet/IP tunnelling endpoint on the server, so KNX
            client software (a visualisation, a logic controller) can tunnel to this bench&apos;s
            line as it would to an IP interface.
          </p>
          {canControl ? (
            <Button
              disabled={busy || ended}
              aria-busy={busy}
              onClick={() => act(() => publishEndpoint(session.id))}
            >
              Publish on KNXnet/IP
            </Button>
          ) : (
            <p className="text-xs text-ink-soft">Only the session&apos;s owner can publish it.</p>
          )}
        </div>
      ) : (
        <PublishedEndpoint
          endpoint={endpoint}
          canControl={canControl}
          busy={busy || ended}
          onUnpublish={() => act(() => unpublishEndpoint(session.id))}
          onDisconnect={disconnect}
        />
      )}
      {error ? (
        <p role="alert" className="text-fault">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** The caution every view of the endpoint carries. */
function EndpointCaution() {
  return (
    <p role="note" aria-label="Endpoint caution" className="text-xs text-ink-soft">
      For test benches only: never connect this endpoint to the network of a real installation, and
      never bridge it to a real KNX line.
    </p>
  );
}

function PublishedEndpoint({
  endpoint,
  canControl,
  busy,
  onUnpublish,
  onDisconnect,
}: {
  endpoint: Endpoint;
  canControl: boolean;
  busy: boolean;
  onUnpublish: () => void;
  onDisconnect: (client: TunnelClient) => void;
}) {
  const where = hostPort(endpoint.address, endpoint.port);
  return (
    <div className="space-y-3">
      <dl className="grid grid-cols-[auto_1fr] items-center gap-x-3 gap-y-1">
        <dt className="text-ink-soft">Answers on</dt>
        <dd className="flex flex-wrap items-center gap-2">
          <Mono>
            <span data-testid="endpoint-address" data-port={endpoint.port}>
              {where}
            </span>
          </Mono>
          <span className="text-xs text-ink-soft">UDP, tunnelling on the link layer</span>
        </dd>
        <dt className="text-ink-soft">On the line as</dt>
        <dd>
          <Mono className="text-copper-deep">{endpoint.individualAddress}</Mono>{" "}
          <span className="text-xs text-ink-soft">
            (the interface; each tunnel gets its own address)
          </span>
        </dd>
        <dt className="text-ink-soft">Reach</dt>
        <dd>
          {endpoint.loopback ? (
            <StatusBadge tone="healthy">loopback only</StatusBadge>
          ) : (
            <StatusBadge tone="fault">open to the network</StatusBadge>
          )}
        </dd>
      </dl>
      {endpoint.loopback ? (
        <p className="text-xs text-ink-soft">
          Only programs on the server&apos;s own machine can connect.
        </p>
      ) : (
        <div
          role="alert"
          className="rounded-md border border-l-4 border-fault/40 border-l-fault bg-fault-soft px-3 py-2 text-fault"
        >
          <strong className="font-semibold">Not bound to loopback.</strong> KNXnet/IP has no
          authentication: anyone who can reach <Mono>{where}</Mono> can read and send telegrams on
          this bench. Keep it on a closed test network.
        </div>
      )}
      <TunnelClients
        clients={endpoint.clients}
        canControl={canControl}
        busy={busy}
        onDisconnect={onDisconnect}
      />
      {canControl ? (
        <Button variant="secondary" disabled={busy} aria-busy={busy} onClick={onUnpublish}>
          Unpublish
        </Button>
      ) : (
        <p className="text-xs text-ink-soft">
          Only the session&apos;s owner can unpublish it or disconnect clients.
        </p>
      )}
    </div>
  );
}

function TunnelClients({
  clients,
  canControl,
  busy,
  onDisconnect,
}: {
  clients: readonly TunnelClient[];
  canControl: boolean;
  busy: boolean;
  onDisconnect: (client: TunnelClient) => void;
}) {
  if (clients.length === 0)
    return (
      <p className="text-ink-soft" data-testid="no-tunnel-clients">
        No client connected. Point a KNX client&apos;s tunnelling connection at the address above.
      </p>
    );
  return (
    <div className="overflow-x-auto rounded-md border border-paper-line bg-white">
      <table className="w-full text-left text-xs" aria-label="Tunnel clients">
        <thead className="bg-paper-deep text-ink-soft">
          <tr>
            <th scope="col" className="px-2 py-1 font-medium">
              Client
            </th>
            <th scope="col" className="px-2 py-1 font-medium">
              Tunnel address
            </th>
            <th scope="col" className="px-2 py-1 font-medium">
              Connected since
            </th>
            <th
              scope="col"
              className="px-2 py-1 text-right font-medium"
              title="Telegrams the client sent onto the bench's line"
            >
              Telegrams in
            </th>
            <th
              scope="col"
              className="px-2 py-1 text-right font-medium"
              title="Telegrams the bench sent to the client"
            >
              Telegrams out
            </th>
            {canControl ? (
              <th scope="col" className="px-2 py-1">
                <span className="sr-only">Actions</span>
              </th>
            ) : null}
          </tr>
        </thead>
        <tbody>
          {clients.map((client) => {
            const from = hostPort(client.address, client.port);
            return (
              <tr key={client.channelId} className="border-t border-paper-line">
                <td className="px-2 py-1">
                  <Mono>{from}</Mono>
                </td>
                <td className="px-2 py-1">
                  <Mono className="text-copper-deep">{client.individualAddress}</Mono>
                </td>
                <td className="px-2 py-1">
                  <Timestamp value={client.connectedSince} relative />
                </td>
                <td className="px-2 py-1 text-right tabular-nums">{client.telegramsIn}</td>
                <td className="px-2 py-1 text-right tabular-nums">{client.telegramsOut}</td>
                {canControl ? (
                  <td className="px-2 py-1 text-right">
                    <Button
                      variant="secondary"
                      className="px-2 py-1 text-xs"
                      disabled={busy}
                      aria-label={`Disconnect tunnel ${client.individualAddress} (${from})`}
                      onClick={() => onDisconnect(client)}
                    >
                      Disconnect
                    </Button>
                  </td>
                ) : null}
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
