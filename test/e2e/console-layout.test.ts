import { readFileSync } from "node:fs";
import AxeBuilder from "@axe-core/playwright";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchChromium } from "./chromium";
import { demoPassword, signIn } from "./support/sign-in";

/**
 * The live console as people use it on the demo bench: every log column
 * readable at 1440x900 without scrolling sideways, the navigation folded and
 * the log in view on a 1024x768 tablet, every action reachable from the
 * keyboard with a visible focus, the layout remembered, and an axe-core scan
 * (WCAG rules) of the console while it runs.
 */
describe("live console layout, keyboard and accessibility in headless Chromium", () => {
  const trainer = "ada.trainer@fernhill.example";
  let browser: Browser;
  let page: Page;
  const pageErrors: string[] = [];

  beforeAll(async () => {
    browser = await launchChromium();
    // axe-core's builder needs a page from an explicit context.
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    page = await context.newPage();
    page.on("pageerror", (error) => pageErrors.push(error.message));
    await signIn(page, trainer, demoPassword(trainer), "/console");
    await page.getByRole("link", { name: "Open Fernhill Training Centre live" }).click();
    await page.waitForURL(/\/benches\/[^/]+\/live$/);
    await page.getByRole("toolbar", { name: "Time controls" }).waitFor();
    await page.getByRole("button", { name: "Run at 10x" }).click();
  });

  afterAll(async () => {
    await browser?.close();
  });

  const log = () => page.getByRole("table", { name: "Telegram log" });

  /** Presses Tab (or Shift+Tab) until the focused element has this name, within `within` if given. */
  async function tabTo(name: string, options: { back?: boolean; within?: string } = {}) {
    const seen: string[] = [];
    for (let i = 0; i < 80; i++) {
      await page.keyboard.press(options.back ? "Shift+Tab" : "Tab");
      const focused = await page.evaluate((within) => {
        const el = document.activeElement as HTMLElement | null;
        if (el === null || (within && el.closest(within) === null)) return null;
        const style = getComputedStyle(el);
        // Named by aria-label, by its <label>, or by its text.
        const labelled = (el as HTMLInputElement).labels?.[0]?.textContent ?? null;
        return {
          name: (el.getAttribute("aria-label") ?? labelled ?? el.textContent ?? "").trim(),
          // The focus ring: the house :focus-visible outline (or a ring drawn as a shadow).
          visible: style.outlineStyle !== "none" || style.boxShadow !== "none",
        };
      }, options.within);
      seen.push(focused?.name.slice(0, 30) ?? "(outside)");
      if (focused?.name === name) {
        expect(focused.visible, `focus on "${name}" is visible`).toBe(true);
        return;
      }
    }
    throw new Error(
      `"${name}" was not reached from the keyboard; focus went to: ${seen.join(" | ")}`,
    );
  }

  it("shows every log column with its value at 1440x900 without scrolling sideways", async () => {
    const firstWrite = log()
      .getByRole("row")
      .filter({ has: page.getByRole("cell", { name: "Write", exact: true }) })
      .first();
    await firstWrite.waitFor({ timeout: 30_000 });
    const headers = await log().getByRole("columnheader").allInnerTexts();
    expect(headers).toEqual([
      "Time",
      "Line",
      "Source",
      "Destination",
      "Service",
      "Value",
      "Priority",
      "Repeat",
      "Ack",
      "Raw",
    ]);
    // One look at the rendered rows: the log moves on while the bench runs.
    const layout = await log().evaluate((table) => {
      const row = [...table.querySelectorAll("[role=rowgroup] [role=row]")].find(
        (r) =>
          (r.querySelectorAll("[role=cell]")[4] as HTMLElement | undefined)?.innerText === "Write",
      )!;
      const box = table.getBoundingClientRect();
      return {
        tableFits: table.scrollWidth <= table.clientWidth,
        pageFits: document.documentElement.scrollWidth <= window.innerWidth,
        cells: [...row.querySelectorAll("[role=cell]")].map((cell) => {
          const r = cell.getBoundingClientRect();
          return {
            text: (cell as HTMLElement).innerText.trim(),
            inside: r.left >= box.left && r.right <= box.right && r.width > 0,
            whole: cell.scrollWidth <= cell.clientWidth,
          };
        }),
      };
    });
    expect(layout.tableFits).toBe(true);
    expect(layout.pageFits).toBe(true);
    expect(layout.cells).toHaveLength(10);
    for (const cell of layout.cells) expect(cell.inside).toBe(true);
    const [time, line, source, destination, service, value, priority, repeat, ack, raw] =
      layout.cells;
    expect(time!.text).toMatch(/^\d+:\d{2}:\d{2}\.\d{3}$/);
    // The line it was on, by address (the lab bench has one line, 1.1).
    expect(line!.text).toBe("1.1");
    // Sender and destination with their names, e.g. "1.1.31 Room temperature sensor".
    expect(source!.text).toMatch(/^\d+\.\d+\.\d+ \S/);
    expect(destination!.text).toMatch(/^\d+\/\d+\/\d+ \S/);
    expect(service!.text).toBe("Write");
    expect(value!.text).not.toBe("");
    expect(value!.whole).toBe(true);
    expect(["low", "normal", "urgent", "system"]).toContain(priority!.text);
    expect(["yes", "no"]).toContain(repeat!.text);
    expect(ack!.text).not.toBe("");
    expect(raw!.text).toMatch(/^[0-9A-F]{2}( [0-9A-F]{2})+$/);
    // Frames up to 11 octets (a 2-octet value) show whole; longer ones end in "…" with the whole frame on hover.
    if (raw!.text.length <= 32) expect(raw!.whole).toBe(true);
  });

  it("names the line by number and name in the charts", async () => {
    await page.getByRole("figure", { name: "Bus load of line 1.1 Lab room line" }).waitFor();
  });

  it("works from the keyboard: pause, step, run, filter, write, read and a local button", async () => {
    const state = page.getByTestId("run-state");
    await page.getByRole("button", { name: "Run at 10x" }).focus();
    await tabTo("Pause", { back: true });
    await page.keyboard.press("Enter");
    await expect.poll(() => state.innerText()).toContain("Paused");
    const clock = page.getByRole("status", { name: "Virtual clock" });
    const before = await clock.innerText();
    await tabTo("Step");
    await page.keyboard.press("Enter");
    await expect.poll(() => clock.innerText()).not.toBe(before);
    await tabTo("Run", { back: true });
    await page.keyboard.press("Enter");
    await expect.poll(() => state.innerText()).toContain("Running");

    await tabTo("Filter by address");
    await page.keyboard.type("1/0/1");
    await tabTo("Group address");
    await page.keyboard.type("1/0/1");
    await page.keyboard.press("ArrowDown");
    await page.keyboard.press("Enter");
    await tabTo("Write");
    await page.keyboard.press("Enter");
    await tabTo("Read");
    await page.keyboard.press("Enter");
    const rows = log().getByRole("row");
    await rows
      .filter({ hasText: "test tool" })
      .filter({ has: page.getByRole("cell", { name: "Read", exact: true }) })
      .first()
      .waitFor({ timeout: 20_000 });

    const door = '[role=group][aria-label="Buttons of Door push-button"]';
    const label = await page.locator(`${door} button`).first().innerText();
    await tabTo(label, { within: door });
    await page.keyboard.press("Enter");
    await rows.filter({ hasText: "1.1.1 Door push-button" }).first().waitFor({ timeout: 20_000 });
    await page.getByRole("textbox", { name: "Filter by address" }).fill("");
  });

  it("remembers a folded panel and the log's height for the member", async () => {
    const charts = page.getByRole("button", { name: "Charts", expanded: true });
    await charts.click();
    const handle = page.getByRole("separator", { name: "Height of the telegram log" });
    await handle.focus();
    const height = Number(await handle.getAttribute("aria-valuenow"));
    await page.keyboard.press("ArrowDown");
    await expect
      .poll(async () => Number(await handle.getAttribute("aria-valuenow")))
      .toBe(height + 16);
    await page.reload();
    await page.getByRole("toolbar", { name: "Time controls" }).waitFor();
    await page.getByRole("button", { name: "Charts", expanded: false }).waitFor();
    expect(Number(await handle.getAttribute("aria-valuenow"))).toBe(height + 16);
    // Back as it was, for the scan below.
    await page.getByRole("button", { name: "Charts", expanded: false }).click();
    await handle.focus();
    await page.keyboard.press("ArrowUp");
    await page.getByRole("button", { name: "Run at 10x" }).click();
  });

  it("has no serious or critical axe-core violations while it runs", async () => {
    await log().getByRole("row").nth(5).waitFor({ timeout: 30_000 });
    // Scan with an active fault (badges, fault rows) and the address list open, too.
    await page.getByRole("button", { name: "Break link" }).first().click();
    await page
      .getByRole("region", { name: "Active faults" })
      .getByText("link.")
      .first()
      .waitFor({ timeout: 20_000 });
    await page.getByRole("combobox", { name: "Group address" }).fill("2/0/2");
    const results = await new AxeBuilder({ page })
      .withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"])
      // The bench canvas (components/canvas) is scanned with the bench editor, where it is owned.
      .exclude(".react-flow")
      .analyze();
    await page.getByRole("button", { name: "Restore link" }).first().click();

    // A contrast failure between two of the theme's own colour tokens is the tokens' to fix
    // (app/globals.css, checked page-wide); any other colour pair is the console's.
    const tokens = new Set(
      [...readFileSync("app/globals.css", "utf8").matchAll(/#[0-9a-f]{6}\b/gi)]
        .map((m) => m[0].toLowerCase())
        .concat("#ffffff"),
    );
    const fromTokens = (node: (typeof results.violations)[number]["nodes"][number]) => {
      const data = node.any[0]?.data as { fgColor?: string; bgColor?: string } | undefined;
      return tokens.has(data?.fgColor ?? "") && tokens.has(data?.bgColor ?? "");
    };
    const tokenContrast = results.violations
      .filter((v) => v.id === "color-contrast")
      .flatMap((v) => v.nodes.filter(fromTokens))
      .map((n) => {
        const data = n.any[0]?.data as { fgColor: string; bgColor: string; contrastRatio: number };
        return `${data.fgColor} on ${data.bgColor} (${data.contrastRatio}:1) at ${n.target.join(" ")}`;
      });
    if (tokenContrast.length > 0)
      console.warn(`theme token pairs below AA contrast:\n${tokenContrast.join("\n")}`);

    const serious = results.violations
      .filter((v) => v.impact === "serious" || v.impact === "critical")
      .map((v) => ({
        rule: v.id,
        impact: v.impact,
        nodes: v.nodes
          .filter((n) => v.id !== "color-contrast" || !fromTokens(n))
          .slice(0, 5)
          .map((n) => n.target.join(" ")),
      }))
      .filter((v) => v.nodes.length > 0);
    expect(serious).toEqual([]);
  });

  it("folds the navigation on a 1024x768 tablet and shows the log without scrolling", async () => {
    await page.setViewportSize({ width: 1024, height: 768 });
    await page.evaluate(() => window.scrollTo(0, 0));
    const menu = page.getByRole("button", { name: "Menu" });
    await menu.waitFor();
    expect(await menu.getAttribute("aria-expanded")).toBe("false");
    expect(await page.getByRole("navigation", { name: "Studio" }).isVisible()).toBe(false);
    const rows = await log().getByRole("rowgroup").nth(1).boundingBox();
    const pad = await page.getByRole("region", { name: "Control pad" }).boundingBox();
    expect(rows).not.toBeNull();
    // The log's rows start on the first screen, above the control pad.
    expect(rows!.y + 5 * 24).toBeLessThan(768);
    expect(rows!.x).toBeGreaterThanOrEqual(0);
    expect(pad!.y).toBeGreaterThan(rows!.y);
    await menu.click();
    await page.getByRole("navigation", { name: "Studio" }).waitFor();
    await menu.click();
    await page.setViewportSize({ width: 1440, height: 900 });
  });

  it("throws no page errors", () => {
    expect(pageErrors).toEqual([]);
  });
});
