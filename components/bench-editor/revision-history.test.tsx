import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { formatRevisionTime, RevisionHistory, type RevisionEntry } from "./revision-history";

afterEach(cleanup);

const revisions: RevisionEntry[] = [
  {
    number: 3,
    summary: "Restored revision 1",
    createdAt: "2026-03-02T10:05:00.000Z",
    authorName: "Wren Example",
  },
  {
    number: 2,
    summary: "added 1 device, linked 2 objects",
    createdAt: "2026-03-01T09:00:00.000Z",
    authorName: null,
  },
  { number: 1, summary: "Created", createdAt: "2026-02-28T08:00:00.000Z", authorName: "Ash Demo" },
];

function renderHistory(props: {
  openNumber?: number | null;
  list?: () => Promise<RevisionEntry[]>;
}) {
  const onOpen = vi.fn();
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  render(
    <QueryClientProvider client={client}>
      <RevisionHistory
        benchId="b1"
        listRevisions={props.list ?? (() => Promise.resolve(revisions))}
        currentNumber={3}
        openNumber={props.openNumber ?? null}
        onOpen={onOpen}
      />
    </QueryClientProvider>,
  );
  return { onOpen };
}

describe("RevisionHistory", () => {
  it("lists every revision newest first with who saved it, when, and what changed", async () => {
    renderHistory({});
    const list = await screen.findByRole("list", { name: "Revision history" });
    const items = within(list).getAllByRole("listitem");
    expect(items.map((item) => item.getAttribute("aria-label"))).toEqual([
      "Revision 3",
      "Revision 2",
      "Revision 1",
    ]);
    expect(items[0]!.textContent).toContain("current");
    expect(items[0]!.textContent).toContain("Wren Example");
    expect(items[0]!.textContent).toContain(formatRevisionTime(revisions[0]!.createdAt));
    expect(items[1]!.textContent).toContain("a former member");
    expect(items[1]!.textContent).toContain("added 1 device, linked 2 objects");
  });

  it("opens an earlier revision, never the current one", async () => {
    const { onOpen } = renderHistory({});
    const current = await screen.findByRole("listitem", { name: "Revision 3" });
    expect(within(current).queryByRole("button")).toBeNull();
    fireEvent.click(screen.getByRole("button", { name: "Open revision 1 read-only" }));
    expect(onOpen).toHaveBeenCalledWith(1);
  });

  it("marks the revision on view", async () => {
    renderHistory({ openNumber: 2 });
    const item = await screen.findByRole("listitem", { name: "Revision 2" });
    expect(item.getAttribute("aria-current")).toBe("true");
    expect(
      (within(item).getByRole("button", { name: /revision 2/ }) as HTMLButtonElement).disabled,
    ).toBe(true);
  });

  it("says so when the history cannot be loaded", async () => {
    renderHistory({ list: () => Promise.reject(new Error("no such bench")) });
    expect((await screen.findByRole("alert")).textContent).toContain("no such bench");
  });
});

describe("formatRevisionTime", () => {
  it("writes the one date format: year-month-day hours:minutes, in UTC and saying so", () => {
    expect(formatRevisionTime("2026-01-05T07:03:00.000Z")).toBe("2026-01-05 07:03 UTC");
  });
});
