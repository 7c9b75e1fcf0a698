import { formatGroupAddress, formatIndividualAddress } from "../address";
import type { TraceEvent } from "../core/trace";
import { formatVirtualTime, type VirtualTimeFormat } from "../core/virtual-time";

const SERVICE_NAMES = {
  GroupValue_Write: "write",
  GroupValue_Response: "response",
  GroupValue_Read: "read",
} as const;

const COUPLER_DROP_TEXT = {
  filter: "not in its filter table",
  blocked: "blocked by its setting",
  "hop-count": "routing counter used up",
  "queue-full": "buffer full, answered BUSY",
  "not-acknowledged": "not acknowledged on the far line after the last repetition",
} as const;

function couplerDestination(event: { destination: number; individual?: true }): string {
  return event.individual
    ? formatIndividualAddress(event.destination)
    : formatGroupAddress(event.destination);
}

/** One readable line for a trace event (its time as h:mm:ss.mmm), for verdicts, the CLI and JUnit reports. */
export function describeTraceEvent(event: TraceEvent, format: VirtualTimeFormat = {}): string {
  const at = formatVirtualTime(event.timeUs, format);
  switch (event.kind) {
    case "telegram.queued":
    case "telegram.sent":
    case "telegram.acked":
    case "telegram.repeated":
    case "telegram.lost": {
      const from = event.deviceId ?? "test tool";
      const extra =
        event.kind === "telegram.sent" && event.repeated
          ? " (repeated)"
          : event.kind === "telegram.repeated" || event.kind === "telegram.lost"
            ? ` (${event.reason})`
            : "";
      const payload = event.payloadHex ? ` ${event.payloadHex}` : "";
      const to = event.individual
        ? formatIndividualAddress(event.destination)
        : formatGroupAddress(event.destination);
      return `${at} ${event.kind} ${formatIndividualAddress(event.source)} (${from}) -> ${to} ${SERVICE_NAMES[event.service]}${payload}${extra}`;
    }
    case "device.transition":
      return `${at} ${event.deviceId}: ${event.transition} (on ${event.cause})`;
    case "device.note":
      return `${at} ${event.deviceId}: ${event.text}`;
    case "object.changed":
      return `${at} ${event.deviceId} object ${event.object} = ${JSON.stringify(event.value)} (${event.cause}${event.groupAddress === undefined ? "" : ` on ${formatGroupAddress(event.groupAddress)}`})`;
    case "timer.fired":
      return `${at} ${event.deviceId}: timer ${event.name}`;
    case "fault.raised":
    case "fault.cleared":
      return `${at} ${event.kind} ${event.fault} on ${event.deviceId ?? event.unitLink ?? "?"} by ${event.by}${"text" in event && event.text ? `: ${event.text}` : ""}`;
    case "link.delivered":
    case "link.dropped":
      return `${at} ${event.kind} ${event.unitLink}: ${event.from} -> ${event.deviceId} ${JSON.stringify(event.message)}`;
    case "coupler.forward":
      return `${at} coupler.forward ${event.coupler}: ${couplerDestination(event)} from line ${event.fromLine} to line ${event.toLine} as telegram ${event.forwardedTelegramId} (routing counter ${event.hopCount})`;
    case "coupler.hold":
      return `${at} coupler.hold ${event.coupler}: ${couplerDestination(event)} for line ${event.toLine} waits behind ${event.queued} telegram(s)`;
    case "coupler.drop":
      return `${at} coupler.drop ${event.coupler}: ${couplerDestination(event)} from line ${event.fromLine} not passed to line ${event.toLine} (${COUPLER_DROP_TEXT[event.reason]})`;
    case "user.action":
      return `${at} user ${event.action}${event.deviceId ? ` ${event.deviceId}` : ""}${event.groupAddress === undefined ? "" : ` ${formatGroupAddress(event.groupAddress)}`}: ${event.detail}`;
  }
}
