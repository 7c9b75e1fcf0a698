import { z } from "zod";

/** The console's panels that fold away; the telegram log always stays. */
export const CONSOLE_PANELS = [
  "control-pad",
  "faults",
  "scene-dry-run",
  // A server session's KNXnet/IP endpoint (absent from a browser run).
  "endpoint",
  "bench",
  // What each coupler forwarded, held and dropped (only on a bench with couplers).
  "couplers",
  "charts",
  "inspector",
] as const;
export type ConsolePanel = (typeof CONSOLE_PANELS)[number];

/** Sizes in CSS px; each has its bounds below. */
export const LAYOUT_BOUNDS = {
  logHeightPx: { min: 192, max: 1200 },
  leftWidthPx: { min: 256, max: 560 },
  rightWidthPx: { min: 256, max: 640 },
} as const;
export type ConsoleSize = keyof typeof LAYOUT_BOUNDS;

export interface ConsoleLayout {
  readonly logHeightPx: number;
  readonly leftWidthPx: number;
  readonly rightWidthPx: number;
  readonly collapsed: Readonly<Partial<Record<ConsolePanel, boolean>>>;
}

export const defaultConsoleLayout: ConsoleLayout = {
  logHeightPx: 384,
  leftWidthPx: 352,
  rightWidthPx: 384,
  collapsed: {},
};

// Stored by an earlier version or edited by hand: anything odd falls back to the default.
const storedLayoutSchema = z.object({
  logHeightPx: z.number().finite().optional(),
  leftWidthPx: z.number().finite().optional(),
  rightWidthPx: z.number().finite().optional(),
  collapsed: z.record(z.string(), z.boolean()).optional(),
});

export function clampSize(size: ConsoleSize, px: number): number {
  const { min, max } = LAYOUT_BOUNDS[size];
  return Math.round(Math.min(max, Math.max(min, px)));
}

/** Where a member's layout is kept in localStorage: one entry per member, shared by all benches. */
export function layoutStorageKey(memberId: string): string {
  return `benchline.console-layout.${memberId}`;
}

/** Reads a stored layout; unknown panels are dropped, sizes clamped, garbage gives the default. */
export function parseStoredLayout(raw: string | null): ConsoleLayout {
  if (raw === null) return defaultConsoleLayout;
  let json: unknown;
  try {
    json = JSON.parse(raw);
  } catch {
    return defaultConsoleLayout;
  }
  const parsed = storedLayoutSchema.safeParse(json);
  if (!parsed.success) return defaultConsoleLayout;
  const stored = parsed.data;
  const collapsed: Partial<Record<ConsolePanel, boolean>> = {};
  for (const panel of CONSOLE_PANELS)
    if (stored.collapsed?.[panel] === true) collapsed[panel] = true;
  return {
    logHeightPx: clampSize("logHeightPx", stored.logHeightPx ?? defaultConsoleLayout.logHeightPx),
    leftWidthPx: clampSize("leftWidthPx", stored.leftWidthPx ?? defaultConsoleLayout.leftWidthPx),
    rightWidthPx: clampSize(
      "rightWidthPx",
      stored.rightWidthPx ?? defaultConsoleLayout.rightWidthPx,
    ),
    collapsed,
  };
}
