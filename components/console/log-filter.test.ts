import { describe, expect, it } from "vitest";
import { LogRing } from "@/components/sim/log-ring";
import type { LogRow } from "@/components/sim/sim-protocol";
import { emptyLogFilter, FilteredLog, logRowsToCsv } from "./log-filter";

function row(seq: number, fields: Partial<LogRow> = {}): LogRow {
  return {
    seq,
    kind: "telegram",
    timeUs: seq * 1000,
    line: "1.1",
    source: "1.1.250",
    deviceId: "",
    destination: seq % 2 === 0 ? "1/0/1" : "2/0/2",
    destinationName: seq % 2 === 0 ? "Ceiling light" : "Unit setpoint",
    service: "GroupValue_Write",
    value: "On",
    priority: "low",
    repeated: false,
    ack: "ack",
    rawHex: "BC 11 FA 08 01 E1 00 81 C5",
    ...fields,
  };
}

describe("FilteredLog", () => {
  it("follows the ring incrementally and forgets rows the ring dropped", () => {
    const ring = new LogRing(10);
    const view = new FilteredLog({ ...emptyLogFilter, address: "1/0" });
    ring.push([0, 1, 2, 3].map((n) => row(n)));
    expect(view.update(ring)).toBe(2);
    ring.push([4, 5, 6, 7, 8, 9, 10, 11].map((n) => row(n)));
    // Kept: rows 2..11; matching: 2, 4, 6, 8, 10.
    expect(view.update(ring)).toBe(5);
    expect(ring.at(view.ringIndex(0, ring)).seq).toBe(2);
    expect(ring.at(view.ringIndex(4, ring)).seq).toBe(10);
    ring.clear();
    ring.push([row(20)]);
    expect(view.update(ring)).toBe(1);
  });

  it("matches by device, service (faults apart) and free text", () => {
    const ring = new LogRing(10);
    ring.push([
      row(1, { deviceId: "gateway" }),
      row(2, { kind: "fault", service: "fault raised", value: "link.two-primaries, by device" }),
      row(3, { service: "GroupValue_Read", value: "" }),
    ]);
    expect(new FilteredLog({ ...emptyLogFilter, deviceId: "gateway" }).update(ring)).toBe(1);
    expect(new FilteredLog({ ...emptyLogFilter, service: "fault" }).update(ring)).toBe(1);
    expect(new FilteredLog({ ...emptyLogFilter, service: "GroupValue_Read" }).update(ring)).toBe(1);
    expect(new FilteredLog({ ...emptyLogFilter, text: "TWO-PRIMARIES" }).update(ring)).toBe(1);
  });
});

describe("logRowsToCsv", () => {
  it("quotes fields as RFC 4180 says and ends lines with CRLF", () => {
    // RFC 4180 §2: fields with commas, quotes or line breaks are quoted; a quote inside is doubled.
    const csv = logRowsToCsv([row(2, { destinationName: 'Hall, "north"', value: "21.00 °C" })]);
    const [header, line] = csv.split("\r\n");
    expect(header).toBe(
      "time,line,source,device,destination,name,service,value,priority,repeated,ack,raw,coupler,tunnel",
    );
    expect(line).toBe(
      '0:00:00.002,1.1,1.1.250,,1/0/1,"Hall, ""north""",GroupValue_Write,21.00 °C,low,no,ack,BC 11 FA 08 01 E1 00 81 C5,,',
    );
    expect(csv.endsWith("\r\n")).toBe(true);
  });

  it("keeps a text a spreadsheet would run as a formula as text, and negative values as they are", () => {
    // OWASP "CSV Injection": a field starting with =, +, -, @, tab or CR is a formula to a spreadsheet;
    // a leading apostrophe makes it text. A KNXnet/IP client can write any DPT 16 text.
    const quoted = logRowsToCsv([row(1, { value: '=HYPERLINK("x","y")' })]);
    expect(quoted).toContain(',"\'=HYPERLINK(""x"",""y"")",');
    const csv = logRowsToCsv([
      row(2, { value: "=1+1" }),
      row(3, { value: "@SUM(A1)" }),
      row(4, { value: "-5.00 °C" }),
      row(5, { value: "-1+1" }),
      row(6, { value: "+1" }),
    ]);
    const values = csv
      .split("\r\n")
      .slice(1, -1)
      .map((line) => line.split(",")[7]);
    expect(values).toEqual(["'=1+1", "'@SUM(A1)", "-5.00 °C", "'-1+1", "'+1"]);
  });

  it("names the KNXnet/IP tunnel a telegram came in over, as the log marks it", () => {
    const csv = logRowsToCsv([
      row(1, { source: "1.1.241", tunnel: "1.1.241" }),
      row(2, { source: "1.1.10" }),
    ]);
    const [header, tunnelled, local] = csv.split("\r\n");
    const column = header!.split(",").indexOf("tunnel");
    expect(tunnelled!.split(",")[column]).toBe("1.1.241");
    expect(local!.split(",")[column]).toBe("");
  });
});

describe("line and coupler filters", () => {
  it("keeps one line's rows, or the rows a coupler took part in", () => {
    const ring = new LogRing(10);
    ring.push([
      row(1, { line: "1.0" }),
      row(2, { line: "1.2", coupler: { id: "lc-2", action: "forward", toLine: "1.2" } }),
      row(3, {
        kind: "coupler",
        line: "1.0",
        coupler: { id: "lc-3", action: "drop", reason: "filter", toLine: "1.3" },
      }),
    ]);
    expect(new FilteredLog({ ...emptyLogFilter, line: "1.0" }).update(ring)).toBe(2);
    expect(new FilteredLog({ ...emptyLogFilter, line: "1.2" }).update(ring)).toBe(1);
    expect(new FilteredLog({ ...emptyLogFilter, service: "coupler" }).update(ring)).toBe(2);
  });
});
