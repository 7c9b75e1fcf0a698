import type { LiveSessionView } from "@/app/_lib/live/live-session-view";

/**
 * Invented views of a server-hosted live session, as its API and event stream
 * send them, for the console's tests: not yet published, and published on
 * 127.0.0.1 with one tunnel client.
 */
export const unpublishedSessionView: LiveSessionView = {
  id: "ls-1",
  benchId: "bench-1",
  benchName: "Training room",
  revision: 3,
  owner: { memberId: "m-owner", name: "Theo Apprentice" },
  startedAt: "2026-12-02T07:00:00.000Z",
  lastActivityAt: "2026-12-02T07:01:00.000Z",
  idleStopAt: "2026-12-02T07:31:00.000Z",
  canControl: true,
  endpoint: null,
};

export const publishedSessionView: LiveSessionView = {
  ...unpublishedSessionView,
  endpoint: {
    address: "127.0.0.1",
    port: 3671,
    loopback: true,
    individualAddress: "1.1.240",
    clients: [
      {
        channelId: 7,
        address: "127.0.0.1",
        port: 50123,
        individualAddress: "1.1.241",
        connectedSince: "2026-12-02T07:02:00.000Z",
        telegramsIn: 3,
        telegramsOut: 12,
      },
    ],
  },
};
