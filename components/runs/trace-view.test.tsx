import { cleanup, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import type { TraceEvent } from "@/engine";
import { linesOfBench, TraceView } from "./trace-view";

afterEach(cleanup);

function sent(line: string, timeUs: number): TraceEvent {
  return {
    kind: "telegram.sent",
    timeUs,
    endUs: timeUs + 20_000,
    telegramId: 1,
    line,
    // 1.0.1 -> raw 0x1001 (knx-reference.md, Addresses: area<<12 | line<<8 | device).
    source: 0x1001,
    // 4/0/1 -> raw 0x2001 (main<<11 | middle<<8 | sub).
    destination: 0x2001,
    service: "GroupValue_Write",
    priority: "low",
    payloadHex: "",
    shortPayload: true,
    deviceId: "pb-central",
    attempt: 0,
    repeated: false,
    octets: 8,
    arbitrationLosers: 0,
  } as TraceEvent;
}

describe("TraceView", () => {
  it("names the line of each telegram on a bench with several lines", () => {
    const lines = linesOfBench({
      lines: [
        { id: "line-main", address: "1.0" },
        { id: "line-floor-2", address: "1.2" },
      ],
    });
    render(
      <TraceView
        trace={[sent("line-main", 1_000_000), sent("line-floor-2", 1_030_000)]}
        addresses={{ 0x2001: { name: "All lights off", dpt: "1.001" } }}
        lines={lines}
        caption="Telegrams behind step 3"
      />,
    );
    const table = screen.getByRole("table", { name: "Telegrams behind step 3" });
    expect(within(table).getAllByRole("columnheader")[1]!.textContent).toBe("line");
    const rows = within(table).getAllByRole("row").slice(1);
    expect(rows.map((r) => within(r).getAllByRole("cell")[1]!.textContent)).toEqual(["1.0", "1.2"]);
    expect(rows[0]!.textContent).toContain("4/0/1 All lights off");
  });

  it("leaves the column out on a bench of one line", () => {
    render(
      <TraceView
        trace={[sent("line-main", 1_000_000)]}
        addresses={{}}
        lines={{ "line-main": "1.1" }}
        caption="One line"
      />,
    );
    expect(screen.queryByRole("columnheader", { name: "line" })).toBeNull();
  });
});
