import type { TraceEvent } from "@/engine";
import { formatGroupAddress, formatIndividualAddress, parseGroupAddress } from "@/engine";
import { getDpt } from "@/engine";
import { fromHex } from "@/engine";
import { describeTraceEvent } from "@/engine";
import { formatVirtualTime } from "@/engine";
import { Mono } from "@/components/ui/mono";

/** What the report needs to know about a group address to decode telegrams on it. */
export interface AddressInfo {
  readonly name: string;
  readonly dpt: string;
}

const serviceWord = {
  GroupValue_Write: "write",
  GroupValue_Response: "response",
  GroupValue_Read: "read",
} as const;

/** The telegram's value decoded with its address's DPT and unit, or the raw hex when it cannot be. */
function decoded(payloadHex: string, info: AddressInfo | undefined): string {
  if (payloadHex === "") return "—";
  const codec = info ? getDpt(info.dpt) : undefined;
  const bytes = fromHex(payloadHex);
  if (!codec || !bytes) return payloadHex;
  const value = codec.decode(bytes);
  if (!value.ok) return payloadHex;
  const text = codec.format(value.value);
  return codec.unit && !text.includes(codec.unit) ? `${text} ${codec.unit}` : text;
}

/**
 * The trace slice behind a failed step: every telegram on the line as a row
 * (time, sender, destination with its name, service, decoded value, raw hex;
 * on a bench with several lines, the line it was on first), then what devices
 * and couplers did, in the engine's own words.
 */
export function TraceView({
  trace,
  addresses,
  caption,
  lines = {},
}: {
  trace: readonly TraceEvent[];
  addresses: Readonly<Record<number, AddressInfo>>;
  caption: string;
  /** Line address ("1.2") by line id, to name the line of each telegram. */
  lines?: Readonly<Record<string, string>>;
}) {
  const telegrams = trace.filter(
    (event): event is Extract<TraceEvent, { kind: "telegram.sent" }> =>
      event.kind === "telegram.sent",
  );
  const severalLines = Object.keys(lines).length > 1;
  const others = trace.filter((event) => !event.kind.startsWith("telegram."));
  return (
    <div className="flex flex-col gap-2">
      <table className="w-full border-collapse text-left text-xs">
        <caption className="mb-1 text-left text-xs font-semibold text-ink-soft">{caption}</caption>
        <thead>
          <tr className="border-b border-paper-line text-ink-soft">
            <th className="py-1 pr-3 font-medium">time</th>
            {severalLines ? <th className="py-1 pr-3 font-medium">line</th> : null}
            <th className="py-1 pr-3 font-medium">from</th>
            <th className="py-1 pr-3 font-medium">to</th>
            <th className="py-1 pr-3 font-medium">service</th>
            <th className="py-1 pr-3 font-medium">value</th>
            <th className="py-1 font-medium">hex</th>
          </tr>
        </thead>
        <tbody>
          {telegrams.length === 0 ? (
            <tr>
              <td colSpan={severalLines ? 7 : 6} className="py-1 text-ink-soft">
                No telegram on the line in this window.
              </td>
            </tr>
          ) : (
            telegrams.map((event, index) => {
              const info = addresses[event.destination];
              return (
                <tr key={index} className="border-b border-paper-line/60 align-top">
                  <td className="py-1 pr-3">
                    <Mono>{formatVirtualTime(event.timeUs)}</Mono>
                  </td>
                  {severalLines ? (
                    <td className="py-1 pr-3">
                      <Mono>{lines[event.line] ?? event.line}</Mono>
                    </td>
                  ) : null}
                  <td className="py-1 pr-3">
                    <Mono>{formatIndividualAddress(event.source)}</Mono>{" "}
                    <span className="text-ink-soft">{event.deviceId ?? "test tool"}</span>
                  </td>
                  <td className="py-1 pr-3">
                    <Mono>
                      {event.individual
                        ? formatIndividualAddress(event.destination)
                        : formatGroupAddress(event.destination)}
                    </Mono>{" "}
                    <span className="text-ink-soft">{info?.name ?? ""}</span>
                  </td>
                  <td className="py-1 pr-3">
                    {serviceWord[event.service]}
                    {event.repeated ? " (repeated)" : ""}
                  </td>
                  <td className="py-1 pr-3">
                    <Mono>{decoded(event.payloadHex, info)}</Mono>
                  </td>
                  <td className="py-1">
                    <Mono>{event.payloadHex || "—"}</Mono>
                  </td>
                </tr>
              );
            })
          )}
        </tbody>
      </table>
      {others.length > 0 ? (
        <details className="text-xs print:block" open>
          <summary className="cursor-pointer text-ink-soft">
            What the devices did ({others.length})
          </summary>
          <ul className="mt-1 flex flex-col gap-0.5">
            {others.map((event, index) => (
              <li key={index}>
                <Mono className="whitespace-pre-wrap">{describeTraceEvent(event).trim()}</Mono>
              </li>
            ))}
          </ul>
        </details>
      ) : null}
    </div>
  );
}

/** Line address ("1.2") by line id for every line of a bench document. */
export function linesOfBench(bench: unknown): Record<string, string> {
  const out: Record<string, string> = {};
  const list = (bench as { lines?: unknown } | null)?.lines;
  if (!Array.isArray(list)) return out;
  for (const entry of list as { id?: unknown; address?: unknown }[])
    if (typeof entry.id === "string" && typeof entry.address === "string")
      out[entry.id] = entry.address;
  return out;
}

/** Decoding information for every group address of a bench document (raw address -> name, DPT). */
export function addressesOfBench(bench: unknown): Record<number, AddressInfo> {
  const out: Record<number, AddressInfo> = {};
  const list = (bench as { groupAddresses?: unknown } | null)?.groupAddresses;
  if (!Array.isArray(list)) return out;
  for (const entry of list as { address?: unknown; name?: unknown; dpt?: unknown }[]) {
    if (typeof entry.address !== "string" || typeof entry.dpt !== "string") continue;
    const parsed = parseGroupAddress(entry.address);
    if (!parsed.ok) continue;
    const raw = parsed.value;
    out[raw] = { name: typeof entry.name === "string" ? entry.name : "", dpt: entry.dpt };
  }
  return out;
}
