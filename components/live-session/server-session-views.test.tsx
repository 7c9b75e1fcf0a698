import { act, cleanup, fireEvent, render, screen, waitFor, within } from "@testing-library/react";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import type { LiveSessionView } from "@/app/_lib/live/live-session-view";
import { TelegramLog } from "@/components/console/telegram-log";
import { TimeControls } from "@/components/console/time-controls";
import { createLiveLinkStore, type LiveLinkStore } from "@/components/sim/live-link-store";
import { LiveLinkProvider, SimStoreProvider } from "@/components/sim/sim-context";
import type { LogRow, SimCommand } from "@/components/sim/sim-protocol";
import { createSimStore } from "@/components/sim/sim-store";
import { EndpointPanel } from "./endpoint-panel";
import { ServerSessionList } from "./server-session-list";
import { SessionBar } from "./session-bar";
import { publishedSessionView, unpublishedSessionView } from "@/test/harness/live-session-views";

/**
 * The views only a server session has (endpoint panel, session bar, real-time
 * controls, the IP mark in the log), fed by a link store as the event stream
 * feeds it, with the API answered by a stubbed fetch.
 */

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

// jsdom lays nothing out; the log's virtualizer reads its viewport's height from clientHeight.
beforeAll(() =>
  Object.defineProperty(HTMLElement.prototype, "clientHeight", {
    configurable: true,
    get: () => 384,
  }),
);
afterAll(() => Reflect.deleteProperty(HTMLElement.prototype, "clientHeight"));

const unpublished = unpublishedSessionView;
const published = publishedSessionView;

type Call = { url: string; method: string };

/** Stubs fetch with the given answers in turn and records every call. */
function stubFetch(...answers: Response[]): Call[] {
  const calls: Call[] = [];
  vi.stubGlobal(
    "fetch",
    vi.fn(async (url: string, init?: RequestInit) => {
      calls.push({ url, method: init?.method ?? "GET" });
      return answers.shift() ?? new Response(null, { status: 500 });
    }),
  );
  return calls;
}

const json = (status: number, body: unknown) =>
  new Response(JSON.stringify(body), { status, headers: { "Content-Type": "application/json" } });

function mount(
  children: React.ReactNode,
  options: { session?: LiveSessionView | null; canControl?: boolean } = {},
) {
  const link: LiveLinkStore = createLiveLinkStore("ls-1", options.session ?? unpublished);
  const store = createSimStore();
  const sent: SimCommand[] = [];
  render(
    <LiveLinkProvider value={{ link, canControl: options.canControl ?? true }}>
      <SimStoreProvider store={store} send={(command) => sent.push(command)}>
        {children}
      </SimStoreProvider>
    </LiveLinkProvider>,
  );
  return { link, store, sent };
}

describe("EndpointPanel", () => {
  it("publishes on KNXnet/IP for the owner and then shows where it answers, loopback only", async () => {
    const calls = stubFetch(json(200, { session: published }));
    mount(<EndpointPanel />);
    // The caution stands before anything is published.
    expect(screen.getByRole("note", { name: "Endpoint caution" }).textContent).toMatch(
      /test benches only.*never connect this endpoint to the network of a real installation/i,
    );
    fireEvent.click(screen.getByRole("button", { name: "Publish on KNXnet/IP" }));
    await screen.findByTestId("endpoint-address");
    expect(calls).toEqual([{ url: "/api/live-sessions/ls-1/endpoint", method: "POST" }]);
    expect(screen.getByTestId("endpoint-address").textContent).toBe("127.0.0.1:3671");
    expect(screen.getByTestId("endpoint-address").getAttribute("data-port")).toBe("3671");
    expect(screen.getByText("loopback only")).toBeTruthy();
    expect(screen.queryByRole("alert")).toBeNull();
  });

  it("warns that KNXnet/IP has no authentication when the endpoint is not on loopback", () => {
    mount(<EndpointPanel />, {
      session: {
        ...published,
        endpoint: { ...published.endpoint!, address: "0.0.0.0", loopback: false },
      },
    });
    const warning = screen.getByRole("alert");
    expect(warning.textContent).toMatch(/Not bound to loopback/);
    expect(warning.textContent).toMatch(/KNXnet\/IP has no authentication/);
    expect(warning.textContent).toContain("0.0.0.0:3671");
  });

  it("lists each tunnel client with its address, tunnel address, since when and its telegram counts", () => {
    mount(<EndpointPanel />, { session: published });
    const table = screen.getByRole("table", { name: "Tunnel clients" });
    const headers = within(table)
      .getAllByRole("columnheader")
      .map((h) => h.textContent);
    expect(headers.slice(0, 5)).toEqual([
      "Client",
      "Tunnel address",
      "Connected since",
      "Telegrams in",
      "Telegrams out",
    ]);
    const cells = within(within(table).getAllByRole("row")[1]!)
      .getAllByRole("cell")
      .map((c) => c.textContent);
    expect(cells.slice(0, 5)).toEqual([
      "127.0.0.1:50123",
      "1.1.241",
      expect.stringContaining("2026-12-02 07:02 UTC"),
      "3",
      "12",
    ]);
  });

  it("follows the stream: a client that connects shows up without a reload", () => {
    const { link } = mount(<EndpointPanel />, {
      session: { ...published, endpoint: { ...published.endpoint!, clients: [] } },
    });
    expect(screen.getByTestId("no-tunnel-clients")).toBeTruthy();
    act(() => link.getState().setSession(published));
    expect(screen.getByRole("table", { name: "Tunnel clients" }).textContent).toContain("1.1.241");
  });

  it("disconnects a client from its row", async () => {
    const calls = stubFetch(new Response(null, { status: 204 }));
    mount(<EndpointPanel />, { session: published });
    fireEvent.click(
      screen.getByRole("button", { name: "Disconnect tunnel 1.1.241 (127.0.0.1:50123)" }),
    );
    await screen.findByTestId("no-tunnel-clients");
    expect(calls).toEqual([
      { url: "/api/live-sessions/ls-1/endpoint/clients/7", method: "DELETE" },
    ]);
  });

  it("shows a refusal as a form message and keeps the panel as it was", async () => {
    stubFetch(json(409, { error: "no free port in 3671-3680", field: "port" }));
    mount(<EndpointPanel />);
    fireEvent.click(screen.getByRole("button", { name: "Publish on KNXnet/IP" }));
    expect((await screen.findByRole("alert")).textContent).toBe("no free port in 3671-3680");
    expect(screen.getByRole("button", { name: "Publish on KNXnet/IP" })).toBeTruthy();
  });

  it("unpublishes, and the panel goes back to offering publish", async () => {
    const calls = stubFetch(json(200, { session: unpublished }));
    mount(<EndpointPanel />, { session: published });
    fireEvent.click(screen.getByRole("button", { name: "Unpublish" }));
    await screen.findByRole("button", { name: "Publish on KNXnet/IP" });
    expect(calls).toEqual([{ url: "/api/live-sessions/ls-1/endpoint", method: "DELETE" }]);
  });

  it("offers a watcher no controls, only what is going on", () => {
    mount(<EndpointPanel />, { session: published, canControl: false });
    expect(screen.queryByRole("button")).toBeNull();
    expect(screen.getByRole("table", { name: "Tunnel clients" }).textContent).toContain("1.1.241");
    expect(
      screen.getByText(/Only the session's owner can unpublish it or disconnect clients/),
    ).toBeTruthy();
  });
});

describe("SessionBar", () => {
  it("says whose session it is, that it is live, and after how long idle it stops", () => {
    const { link } = mount(<SessionBar viewerId="m-trainer" />, { canControl: false });
    act(() => link.getState().setStatus("live"));
    const bar = screen.getByRole("region", { name: "Server session" });
    expect(bar.textContent).toContain("Theo Apprentice's session");
    expect(bar.textContent).toContain(
      "Stops after 30 min with nobody watching, commanding or connected over KNXnet/IP",
    );
    expect(screen.getByRole("status", { name: "Link to the session" }).textContent).toBe("live");
    expect(bar.textContent).toMatch(/You are watching/);
    expect(screen.queryByRole("button", { name: "Stop session" })).toBeNull();
  });

  it("shows a server restart as the end, with the reason, in a banner that stays", () => {
    const { link } = mount(<SessionBar viewerId="m-owner" />);
    act(() => link.getState().setStatus("reconnecting"));
    expect(screen.getByRole("status", { name: "Link to the session" }).textContent).toBe(
      "reconnecting…",
    );
    act(() => link.getState().end("shutdown"));
    const banner = screen.getByRole("alert");
    expect(banner.textContent).toContain("This session has ended.");
    expect(banner.textContent).toContain("The server stopped or restarted");
    expect(screen.queryByRole("button", { name: "Stop session" })).toBeNull();
  });

  it("stops the session for its owner and says the owner stopped it", async () => {
    const calls = stubFetch(new Response(null, { status: 204 }));
    mount(<SessionBar viewerId="m-owner" />);
    expect(screen.getByRole("region", { name: "Server session" }).textContent).toContain(
      "Your session",
    );
    fireEvent.click(screen.getByRole("button", { name: "Stop session" }));
    expect((await screen.findByRole("alert")).textContent).toContain(
      "The session's owner stopped it.",
    );
    expect(calls).toEqual([{ url: "/api/live-sessions/ls-1", method: "DELETE" }]);
  });
});

describe("TimeControls on a server session", () => {
  it("runs at 1x only and says why; no pause, speeds, steps or jumps", () => {
    const { sent } = mount(<TimeControls />);
    const toolbar = screen.getByRole("toolbar", { name: "Time controls" });
    expect(toolbar.textContent).toMatch(
      /Real time \(1x\)\. KNX software connected from outside lives in real time/,
    );
    expect(screen.getByTestId("run-state").textContent).toContain("Running in real time");
    expect(screen.queryByRole("group", { name: "Speed" })).toBeNull();
    for (const name of ["Run", "Pause", "Step"])
      expect(screen.queryByRole("button", { name })).toBeNull();
    expect(screen.queryByRole("combobox", { name: "Jump ahead" })).toBeNull();
    fireEvent.click(screen.getByRole("button", { name: "Reset" }));
    expect(sent).toEqual([{ type: "reset" }]);
  });

  it("gives a watcher the clock and the reason but no buttons", () => {
    mount(<TimeControls />, { canControl: false });
    expect(screen.getByRole("toolbar", { name: "Time controls" }).textContent).toContain(
      "Real time (1x)",
    );
    expect(screen.queryByRole("button")).toBeNull();
  });
});

describe("TelegramLog on a server session", () => {
  it("marks a telegram that came in over KNXnet/IP with its tunnel, instead of naming a sender", async () => {
    const { store } = mount(<TelegramLog />);
    const row = (seq: number, extra: Partial<LogRow>): LogRow => ({
      seq,
      kind: "telegram",
      timeUs: seq * 1000,
      line: "1.1",
      source: "1.1.250",
      deviceId: "",
      destination: "1/0/1",
      destinationName: "Ceiling light",
      service: "GroupValue_Write",
      value: "On",
      priority: "low",
      repeated: false,
      ack: "ack",
      rawHex: "BC 11 FA 08 01 E1 00 81 C5",
      ...extra,
    });
    act(() =>
      store.getState().apply({
        type: "batch",
        seq: 1,
        clock: { nowUs: 2000, running: true, speed: 1 },
        rows: [row(1, {}), row(2, { source: "1.1.241", tunnel: "1.1.241" })],
        dropped: 0,
        devices: [],
        rooms: [],
        busLoad: [],
        rates: [],
      }),
    );
    await act(() => new Promise((resolve) => requestAnimationFrame(resolve)));
    await waitFor(() =>
      expect(
        within(screen.getByRole("table", { name: "Telegram log" })).getAllByRole("row"),
      ).toHaveLength(3),
    );
    const [, local, overIp] = within(
      screen.getByRole("table", { name: "Telegram log" }),
    ).getAllByRole("row");
    expect(local!.querySelector("abbr")).toBeNull();
    expect(local!.textContent).toContain("test tool");
    const mark = overIp!.querySelector("abbr")!;
    expect(mark.textContent).toBe("IP");
    expect(mark.getAttribute("title")).toBe("Came in over KNXnet/IP, tunnel 1.1.241");
    expect(overIp!.getAttribute("data-tunnel")).toBe("1.1.241");
    expect(overIp!.textContent).not.toContain("test tool");
  });
});

describe("ServerSessionList", () => {
  it("opens the member's own sessions and offers to watch others', with their endpoint", () => {
    render(
      <ServerSessionList
        memberId="m-trainer"
        sessions={[
          { ...published, canControl: false },
          {
            ...unpublished,
            id: "ls-2",
            owner: { memberId: "m-trainer", name: "Ada Trainer" },
          },
        ]}
      />,
    );
    const items = within(
      screen.getByRole("list", { name: "Sessions running on the server" }),
    ).getAllByRole("listitem");
    expect(items[0]!.textContent).toContain("on KNXnet/IP127.0.0.1:3671");
    expect(items[0]!.textContent).toContain("1 client");
    const watch = screen.getByRole("link", {
      name: "Watch Theo Apprentice's session of Training room",
    });
    expect(watch.getAttribute("href")).toBe("/console/sessions/ls-1");
    expect(items[1]!.textContent).toContain("not published");
    expect(
      screen.getByRole("link", { name: "Open your session of Training room" }).getAttribute("href"),
    ).toBe("/console/sessions/ls-2");
  });

  it("shows nothing when no session runs", () => {
    const { container } = render(<ServerSessionList memberId="m-1" sessions={[]} />);
    expect(container.textContent).toBe("");
  });
});
