/**
 * Port tints by DPT family, so a person sees at a glance which ports can share
 * a bus-bar. Hues are Benchline's own; red stays reserved for faults and teal
 * for true/healthy, so neither is used here.
 */
export interface DptFamily {
  readonly key: string;
  /** Shown in the legend. */
  readonly label: string;
  readonly color: string;
}

const families: readonly (DptFamily & { readonly mains: readonly number[] })[] = [
  { key: "bit", label: "1.x switch / bit", color: "#7fa7d9", mains: [1] },
  { key: "control", label: "2.x, 3.x control", color: "#9bb7c9", mains: [2, 3] },
  { key: "octet", label: "5.x scaling / count", color: "#d9b44a", mains: [5, 6] },
  { key: "float", label: "9.x 2-octet float", color: "#c58ad9", mains: [9] },
  {
    key: "number",
    label: "7.x, 8.x, 12–14.x numbers",
    color: "#a3a3e6",
    mains: [7, 8, 12, 13, 14],
  },
  { key: "text", label: "16.x text", color: "#cfc6b8", mains: [16] },
  { key: "scene", label: "17.x, 18.x scenes", color: "#e89ab8", mains: [17, 18] },
  { key: "hvac", label: "20.x HVAC modes", color: "#9ccf6d", mains: [20] },
  { key: "colour", label: "232.x colour", color: "#e6a36c", mains: [232] },
];

const other: DptFamily = { key: "other", label: "other", color: "#8a8f98" };

/** The family of a DPT id such as "9.001". */
export function dptFamily(dpt: string): DptFamily {
  const main = Number(dpt.split(".")[0]);
  return families.find((f) => f.mains.includes(main)) ?? other;
}

/** Every family, for the legend. */
export const dptFamilies: readonly DptFamily[] = [...families, other];
