import { describe, expect, it } from "vitest";
import { defaultConsoleLayout, layoutStorageKey, parseStoredLayout } from "./console-layout";

describe("parseStoredLayout", () => {
  it("gives the default for nothing stored, broken JSON or the wrong shape", () => {
    expect(parseStoredLayout(null)).toEqual(defaultConsoleLayout);
    expect(parseStoredLayout("{not json")).toEqual(defaultConsoleLayout);
    expect(parseStoredLayout('{"logHeightPx":"tall"}')).toEqual(defaultConsoleLayout);
  });

  it("keeps known panels, drops unknown ones and clamps sizes to their bounds", () => {
    const layout = parseStoredLayout(
      JSON.stringify({
        logHeightPx: 10,
        leftWidthPx: 9999,
        rightWidthPx: 400.4,
        collapsed: { charts: true, bench: false, "no-such-panel": true },
      }),
    );
    expect(layout).toEqual({
      logHeightPx: 192,
      leftWidthPx: 560,
      rightWidthPx: 400,
      collapsed: { charts: true },
    });
  });

  it("keeps one layout per member", () => {
    expect(layoutStorageKey("u-1")).not.toBe(layoutStorageKey("u-2"));
  });
});
