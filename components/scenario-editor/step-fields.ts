import type { StepKind } from "@/engine";

/** How one field of a step is edited. */
export type FieldEditor =
  | "group-address"
  | "device"
  | "text"
  | "duration"
  | "number"
  | "integer"
  | "dpt-value"
  | "json"
  | { readonly choices: readonly string[] };

export interface FieldSpec {
  readonly key: string;
  readonly label: string;
  readonly editor: FieldEditor;
  readonly optional?: boolean;
  readonly hint?: string;
}

const label: FieldSpec = { key: "label", label: "Label", editor: "text", optional: true };
const groupAddress: FieldSpec = {
  key: "groupAddress",
  label: "Group address",
  editor: "group-address",
};
const device: FieldSpec = { key: "device", label: "Device", editor: "device" };
const from: FieldSpec = {
  key: "from",
  label: "Sent from",
  editor: "device",
  optional: true,
  hint: "the bench's test tool when empty",
};
const tolerance: FieldSpec = {
  key: "tolerance",
  label: "Tolerance",
  editor: "number",
  optional: true,
};
const within: FieldSpec = {
  key: "within",
  label: "Within",
  editor: "duration",
  hint: "from the last action",
};
const service: FieldSpec = {
  key: "service",
  label: "Service",
  editor: { choices: ["write", "response", "any"] },
  optional: true,
};
/** Only telegrams from this sender: a device's, the test tool's or a KNXnet/IP tunnel's individual address. */
const source: FieldSpec = {
  key: "source",
  label: "From (individual address)",
  editor: "text",
  optional: true,
  hint: "e.g. 1.1.241, a tunnel's address as the console lists it",
};

/** The form of each step kind, in the order the fields are shown. */
export const stepFields: Readonly<Record<StepKind, readonly FieldSpec[]>> = {
  write: [
    groupAddress,
    { key: "value", label: "Value", editor: "dpt-value" },
    from,
    {
      key: "priority",
      label: "Priority",
      editor: { choices: ["low", "normal", "urgent", "system"] },
      optional: true,
    },
    label,
  ],
  read: [groupAddress, from, label],
  press: [
    device,
    { key: "button", label: "Button", editor: "text", hint: "e.g. channel-1" },
    {
      key: "action",
      label: "Action",
      editor: { choices: ["press", "release", "long-press"] },
      optional: true,
    },
    label,
  ],
  "set-input": [
    device,
    { key: "input", label: "Input", editor: "text" },
    { key: "value", label: "Value", editor: "json" },
    label,
  ],
  wait: [{ key: "for", label: "Wait for", editor: "duration", hint: "e.g. 500ms, 30s, 2m" }, label],
  "set-parameter": [
    device,
    { key: "parameter", label: "Parameter", editor: "text" },
    { key: "value", label: "Value", editor: "json" },
    label,
  ],
  "inject-fault": [
    { ...device, hint: "a device or unit-link id" },
    { key: "fault", label: "Fault", editor: "text", hint: "e.g. link.broken" },
    label,
  ],
  "clear-fault": [
    { ...device, hint: "a device or unit-link id" },
    { key: "fault", label: "Fault", editor: "text" },
    label,
  ],
  "expect-value": [
    groupAddress,
    { key: "value", label: "Value", editor: "dpt-value" },
    tolerance,
    within,
    service,
    source,
    label,
  ],
  "expect-response": [
    groupAddress,
    { key: "value", label: "Value", editor: "dpt-value", optional: true },
    tolerance,
    within,
    label,
  ],
  "expect-state": [
    device,
    { key: "path", label: "State path", editor: "text", hint: 'dotted, e.g. "unit.setpointC"' },
    { key: "value", label: "Value", editor: "json" },
    tolerance,
    { ...within, optional: true, hint: "checked once now when empty" },
    label,
  ],
  "expect-count": [
    groupAddress,
    within,
    { key: "count", label: "Exactly", editor: "integer", optional: true },
    { key: "min", label: "At least", editor: "integer", optional: true },
    { key: "max", label: "At most", editor: "integer", optional: true },
    service,
    source,
    label,
  ],
  "expect-bus-load": [
    { key: "belowPercent", label: "Below (%)", editor: "number" },
    { key: "over", label: "Over", editor: "duration" },
    label,
  ],
  "expect-silence": [
    { ...groupAddress, optional: true, hint: "all addresses when empty" },
    { key: "for", label: "For", editor: "duration" },
    label,
  ],
};

/** A new step of a kind, with fields a person fills in next. */
export function newStep(kind: StepKind): Record<string, unknown> {
  switch (kind) {
    case "write":
      return { kind, groupAddress: "", value: true };
    case "read":
      return { kind, groupAddress: "" };
    case "press":
      return { kind, device: "", button: "channel-1" };
    case "set-input":
    case "set-parameter":
      return { kind, device: "", [kind === "set-input" ? "input" : "parameter"]: "", value: true };
    case "wait":
      return { kind, for: "1s" };
    case "inject-fault":
    case "clear-fault":
      return { kind, device: "", fault: "" };
    case "expect-value":
      return { kind, groupAddress: "", value: true, within: "1s" };
    case "expect-response":
      return { kind, groupAddress: "", within: "1s" };
    case "expect-state":
      return { kind, device: "", path: "", value: true };
    case "expect-count":
      return { kind, groupAddress: "", within: "1s", count: 1 };
    case "expect-bus-load":
      return { kind, belowPercent: 25, over: "10s" };
    case "expect-silence":
      return { kind, for: "1s" };
  }
}
