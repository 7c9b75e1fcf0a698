import type { Browser, Locator, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { launchChromium } from "./chromium";
import { demoPassword, signIn } from "./support/sign-in";

/**
 * The live console on the seeded demo bench "Fernhill Training Centre"
 * (scenarios/benches/fernhill-training-centre.bench.json): the engine runs in
 * the page's Web Worker; the test drives it through the control pad, the
 * faults panel and the record switch, and reads the log, inspector and chart.
 */
describe("live console in headless Chromium", () => {
  const baseURL = inject("baseURL");
  const trainer = "ada.trainer@fernhill.example";
  let browser: Browser;
  let page: Page;
  let benchId = "";
  const pageErrors: string[] = [];

  beforeAll(async () => {
    browser = await launchChromium();
    page = await browser.newPage();
    page.on("pageerror", (error) => pageErrors.push(error.message));
    await signIn(page, trainer, demoPassword(trainer), "/console");
    await page.getByRole("link", { name: "Open Fernhill Training Centre live" }).click();
    await page.waitForURL(/\/benches\/[^/]+\/live$/);
    benchId = new URL(page.url()).pathname.split("/")[2]!;
    await page.getByRole("toolbar", { name: "Time controls" }).waitFor();
    // 10 virtual seconds per wall second: replies arrive well within the test's patience.
    await page.getByRole("button", { name: "Run at 10x" }).click();
  });

  afterAll(async () => {
    await browser?.close();
  });

  /** Picks a group address on the control pad and writes the value typed into its editor. */
  async function write(address: string, fill?: string) {
    const input = page.getByRole("combobox", { name: "Group address" });
    await input.fill(address);
    await page
      .getByRole("listbox", { name: "Matching group addresses" })
      .getByRole("option")
      .first()
      .click();
    if (fill !== undefined) await page.getByRole("spinbutton", { name: "Value" }).fill(fill);
    await page.getByRole("button", { name: "Write", exact: true }).click();
  }

  function logRows(): Locator {
    return page.getByRole("table", { name: "Telegram log" }).getByRole("row");
  }

  async function filterLog(address: string, service = "") {
    await page.getByRole("textbox", { name: "Filter by address" }).fill(address);
    await page.getByRole("combobox", { name: "Filter by service" }).selectOption(service);
  }

  it("sends a power-on write and shows the status in the log and the inspector", async () => {
    await write("2/0/1"); // Front unit power; the switch editor starts on On
    await filterLog("2/1/1");
    await logRows()
      .filter({ hasText: "Front unit power status" })
      .filter({ hasText: "On" })
      .first()
      .waitFor({ timeout: 20_000 });
    const status = page.locator('[data-device="gw-front"] [data-object="1"]');
    // The inspector and the charts redraw only while on screen, as a person would look at them.
    await status.scrollIntoViewIfNeeded();
    await expect.poll(() => status.innerText(), { timeout: 20_000 }).toContain("On");
  });

  it("sends a setpoint and the room chart's setpoint line of that unit moves", async () => {
    // The demo bench declares its lab room, so the chart is the room's, with each unit in it.
    const chart = page.getByRole("figure", {
      name: "Room temperature and setpoints in Lab room 1",
    });
    await chart.waitFor();
    await write("2/0/2", "26");
    await chart.scrollIntoViewIfNeeded();
    const front = chart.locator('[data-unit="iu-front"]');
    await expect.poll(() => front.getAttribute("data-setpoint"), { timeout: 20_000 }).toBe("26");
    await filterLog("2/1/2");
    await logRows().filter({ hasText: "26.00 °C" }).first().waitFor({ timeout: 20_000 });
  });

  it("records three actions and saves them as a scenario", async () => {
    const recordSwitch = page.getByRole("switch", { name: "Record" });
    await recordSwitch.click();
    await expect.poll(() => recordSwitch.getAttribute("aria-checked")).toBe("true");
    await write("1/0/1"); // ceiling lights on
    await write("2/0/2", "22");
    await write("2/0/1"); // power on again
    await page.waitForTimeout(500);
    await recordSwitch.click();
    await page.getByText("3 actions recorded.").waitFor({ timeout: 10_000 });
    await page
      .getByRole("textbox", { name: "Scenario name" })
      .fill("Recorded from the live console");
    await page.getByRole("button", { name: "Save scenario" }).click();
    await page
      .getByRole("status")
      .filter({ hasText: "Scenario saved." })
      .waitFor({ timeout: 10_000 });
    const response = await page.request.get(`${baseURL}/api/scenarios?benchId=${benchId}`);
    expect(response.status()).toBe(200);
    const body = (await response.json()) as { scenarios: { name: string }[] };
    expect(body.scenarios.map((s) => s.name)).toContain("Recorded from the live console");
  });

  it("presses a control-panel tile: the panel itself sends, and the tile shows the status it hears", async () => {
    const tile = page.getByRole("group", { name: "Tiles of Trainer control panel" });
    await tile.getByRole("button", { name: "Rear power", exact: true }).click();
    await filterLog("3/1/1");
    await logRows()
      .filter({ hasText: "Rear unit power status" })
      .filter({ hasText: "On" })
      .first()
      .waitFor({ timeout: 20_000 });
    await filterLog("3/0/1");
    await logRows().filter({ hasText: "1.1.40" }).first().waitFor({ timeout: 10_000 });
    await expect
      .poll(() => page.locator('[data-tile="cp-lab-5"]').innerText(), { timeout: 20_000 })
      .toContain("On");
  });

  it("makes both front controllers primary and shows the conflict fault", async () => {
    await page
      .getByRole("combobox", { name: "Role of Front unit wall controller" })
      .selectOption("primary");
    const active = page.getByRole("region", { name: "Active faults" });
    await active.getByText("link.two-primaries").first().waitFor({ timeout: 30_000 });
    await filterLog("", "fault");
    await logRows().filter({ hasText: "link.two-primaries" }).first().waitFor({ timeout: 10_000 });
  });

  it("marks the conflicting devices on the bench canvas, and a card click shows its local buttons", async () => {
    const canvas = page.getByRole("application", { name: "Live bench canvas" });
    const card = canvas.getByTestId("device-card-wc-front");
    await expect
      .poll(() => card.getAttribute("data-faults"), { timeout: 20_000 })
      .toContain("link.two-primaries");
    await expect
      .poll(() => canvas.getByRole("list", { name: "Faults of Front indoor unit" }).innerText())
      .toContain("link.two-primaries");
    // Healthy devices carry no mark.
    expect(await canvas.getByTestId("device-card-pb-door").getAttribute("data-faults")).toBeNull();
    await card.click();
    const selected = page.getByRole("region", { name: "Selected device" });
    const buttons = selected.getByRole("group", { name: "Buttons of Front unit wall controller" });
    await buttons.getByRole("button", { name: "Power" }).waitFor({ timeout: 10_000 });
    await selected.getByText("link.two-primaries").waitFor();
  });

  it("throws no page errors", () => {
    expect(pageErrors).toEqual([]);
  });
});
