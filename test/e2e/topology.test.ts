import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchChromium } from "./chromium";
import { seriousViolations } from "./support/axe";
import { demoPassword, signIn } from "./support/sign-in";

const ENGINEER = "tomas.engineer@fernhill.example";

describe("topology of the demo hotel in headless Chromium", () => {
  let browser: Browser;
  let page: Page;
  const pageErrors: string[] = [];
  let benchPath = "";

  beforeAll(async () => {
    browser = await launchChromium();
    // A page of its own context: axe-core's builder needs one.
    const context = await browser.newContext({ viewport: { width: 1600, height: 1000 } });
    page = await context.newPage();
    page.on("pageerror", (error) => pageErrors.push(error.message));
    await signIn(page, ENGINEER, demoPassword(ENGINEER), "/benches");
    // The hotel is the engineer's project in a workspace of its own: switch to it as the
    // account menu does (its select may sit in a folded navigation).
    const workspaceId = await page
      .locator('select[aria-label="Workspace"] option', { hasText: "Wrenhallow Hotel" })
      .getAttribute("value");
    const switched = await page.evaluate(async (id) => {
      const response = await fetch("/api/session", {
        method: "PATCH",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify({ workspaceId: id }),
      });
      return response.status;
    }, workspaceId);
    expect(switched).toBe(200);
    await page.goto(`${new URL(page.url()).origin}/benches`);
    const link = page.getByRole("list", { name: "Benches" }).getByRole("link", {
      name: "Wrenhallow Hotel",
    });
    await link.waitFor({ timeout: 20_000 });
    benchPath = (await link.getAttribute("href"))!;
  });

  afterAll(async () => {
    await browser?.close();
  });

  it("lists the lines with their device counts in the topology panel", async () => {
    await page.goto(`${new URL(page.url()).origin}${benchPath}`);
    const canvas = page.getByRole("application", { name: "Bench canvas" });
    await expect.poll(() => canvas.getAttribute("data-view"), { timeout: 30_000 }).toBe("opened");
    await page.getByRole("tab", { name: /^Topology/ }).click();
    const area = page.getByRole("region", { name: "Area 1" });
    await area.waitFor();
    const row = (address: string) =>
      area.getByRole("row").filter({
        has: page.getByRole("rowheader", { name: new RegExp(`^${address.replace(".", "\\.")} `) }),
      });
    // Main line: the central push-button; each floor: 12 push-buttons, 12 gateways, 12 room
    // sensors, 2 actuators and the coupler (indoor units sit on unit links, not on the line).
    expect(await row("1.0").getByRole("cell").first().innerText()).toBe("1");
    for (const floor of ["1.1", "1.2", "1.3"])
      expect(await row(floor).getByRole("cell").first().innerText()).toBe("39");
  });

  it("draws the lines as regions with the coupler on the border, and opens its filter table", async () => {
    // Opening a coupler from the panel centres it on the canvas and shows its settings.
    await page.getByRole("button", { name: /^Coupler 1\.2\.0 Floor 2 line coupler/ }).click();
    const table = page.getByRole("table", { name: "Filter table of Floor 2 line coupler" });
    await table.waitFor();
    expect(await table.innerText()).toContain("4/0/1");

    const coupler = page.getByRole("group", { name: /^Coupler 1\.2\.0 Floor 2 line coupler/ });
    await coupler.waitFor();
    expect(await coupler.getAttribute("aria-label")).toContain("joins to line 1.0");
    const below = page.getByRole("region", { name: "Line 1.2 Floor 2" });
    const above = page.getByRole("region", { name: "Line 1.0 Main line" });
    await below.waitFor();
    await above.waitFor();
    // The coupler straddles floor 2's top border, under the main line it joins floor 2 to.
    await expect
      .poll(async () => {
        const region = (await below.boundingBox())!;
        const upper = (await above.boundingBox())!;
        const badge = (await coupler.boundingBox())!;
        return (
          badge.y < region.y &&
          badge.y + badge.height > region.y &&
          upper.y + upper.height <= badge.y &&
          upper.x <= badge.x &&
          badge.x + badge.width <= upper.x + upper.width
        );
      })
      .toBe(true);

    // axe-core, WCAG 2.x A and AA tags as in accessibility.test.ts: the regions, the coupler
    // badge and the coupler panel add no serious or critical violation.
    expect(await seriousViolations(page)).toEqual([]);
    await page.getByRole("tab", { name: /^Topology/ }).click();
    expect(await seriousViolations(page, '[aria-label="Topology"]')).toEqual([]);
    expect(pageErrors).toEqual([]);
  });

  it("puts a device dropped from the shelf inside floor 2's region on floor 2", async () => {
    const region = (await page.getByRole("region", { name: "Line 1.2 Floor 2" }).boundingBox())!;
    const canvas = page.getByRole("application", { name: "Bench canvas" });
    const frame = (await canvas.boundingBox())!;
    await page
      .getByRole("listitem")
      .filter({ hasText: "Push-button" })
      .first()
      .dragTo(canvas, {
        // Inside the region, beside its title: relative to the canvas's top left.
        targetPosition: { x: region.x - frame.x + 12, y: region.y - frame.y + 30 },
      });
    await page.getByRole("tab", { name: "Selection" }).click();
    await expect
      .poll(() => page.getByLabel("Individual address").inputValue(), { timeout: 10_000 })
      .toBe("1.2.13");
  });

  it("shows the line of each telegram in the console's log, and the couplers passing it on", async () => {
    await page.goto(`${new URL(page.url()).origin}${benchPath}/live`);
    await page.getByRole("toolbar", { name: "Time controls" }).waitFor();
    await page.getByRole("button", { name: "Run at 10x" }).click();
    const log = page.getByRole("table", { name: "Telegram log" });
    expect(await log.getByRole("columnheader", { name: "Line" }).count()).toBe(1);
    const input = page.getByRole("combobox", { name: "Group address" });
    await input.fill("4/0/1");
    await page
      .getByRole("listbox", { name: "Matching group addresses" })
      .getByRole("option")
      .first()
      .click();
    await page.getByRole("button", { name: "Write", exact: true }).click();
    await page.getByRole("textbox", { name: "Filter by address" }).fill("4/0/1");
    // Sent on the main line by the test tool, then on each floor by its coupler.
    await log
      .getByRole("row")
      .filter({ has: page.getByRole("cell", { name: "1.0", exact: true }) })
      .first()
      .waitFor({ timeout: 20_000 });
    for (const floor of ["1.1", "1.2", "1.3"])
      await log
        .getByRole("row")
        .filter({
          has: page.getByRole("cell", {
            name: `${floor} passed onto line ${floor} by Floor ${floor.slice(2)} line coupler`,
          }),
        })
        .first()
        .waitFor({ timeout: 20_000 });

    // The Couplers panel keeps each coupler's running totals: every floor's coupler passed 4/0/1 on.
    const totals = page.getByRole("table", { name: "Coupler totals since the run started" });
    for (const floor of ["1", "2", "3"]) {
      const coupler = totals.getByRole("row", {
        name: new RegExp(`^1\\.${floor}\\.0 Floor ${floor} `),
      });
      await expect
        .poll(async () => Number(await coupler.getByRole("cell").nth(1).innerText()), {
          timeout: 20_000,
        })
        .toBeGreaterThan(0);
    }
    expect(await seriousViolations(page, '[aria-label="Couplers"]')).toEqual([]);
    expect(pageErrors).toEqual([]);
  });
});
