import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchChromium } from "./chromium";
import { demoPassword, signIn } from "./support/sign-in";

const ENGINEER = "tomas.engineer@fernhill.example";

/**
 * Rooms in the bench editor, end to end: a room added in the Rooms panel, a
 * device put in it from its own panel, saved through the editor's save path and
 * read back after a reload, room figures and membership intact.
 */
describe("bench rooms in headless Chromium", () => {
  let browser: Browser;
  let page: Page;
  const pageErrors: string[] = [];

  beforeAll(async () => {
    browser = await launchChromium();
    page = await browser.newPage({ viewport: { width: 1600, height: 1000 } });
    page.on("pageerror", (error) => pageErrors.push(error.message));
    await signIn(page, ENGINEER, demoPassword(ENGINEER), "/benches");
  });

  afterAll(async () => {
    await browser?.close();
  });

  it("adds a room, puts a device in it, saves, and finds both after a reload", async () => {
    await page.getByLabel("New bench name").fill("Rooms from scratch");
    await Promise.all([
      page.waitForURL(/\/benches\/[^/]+$/),
      page.getByRole("button", { name: "Create bench" }).click(),
    ]);
    const benchUrl = page.url();
    await page.getByRole("application", { name: "Bench canvas" }).waitFor();
    await page.getByRole("button", { name: "Add Room temperature sensor" }).click();

    await page.getByRole("tab", { name: /^Rooms/ }).click();
    await page.getByRole("note", { name: "Caution" }).waitFor();
    await page.getByRole("button", { name: "Add room", exact: true }).click();
    const name = page.getByLabel(/^Room name/);
    await name.fill("Meeting room");
    await name.press("Enter");
    const room = page.getByRole("region", { name: "Room Meeting room" });
    const capacity = room.getByLabel("Heat capacity (kJ/K)");
    await capacity.fill("0");
    await capacity.press("Enter");
    await expect
      .poll(() => room.getByRole("alert").innerText())
      .toBe("the heat capacity is 10 to 100000 kJ/K");
    await capacity.fill("900");
    await capacity.press("Enter");
    await expect.poll(() => room.getByRole("alert").count()).toBe(0);

    // The device the shelf just added is selected; its panel puts it in the room.
    await page.getByRole("tab", { name: "Selection" }).click();
    await page
      .getByRole("region", { name: "Device", exact: true })
      .getByRole("combobox")
      .selectOption({ label: "Meeting room" });
    await page.getByRole("tab", { name: /^Rooms/ }).click();
    const members = page.getByRole("list", { name: "Devices in Meeting room" });
    await expect.poll(() => members.innerText()).toContain("Room temperature sensor 1");

    await page.getByRole("button", { name: "Save", exact: true }).click();
    await expect.poll(() => page.getByTestId("revision-label").innerText()).toBe("revision 2");

    await page.goto(benchUrl);
    await page.getByRole("application", { name: "Bench canvas" }).waitFor();
    await page.getByRole("tab", { name: "Rooms (1)" }).click();
    expect(await page.getByLabel(/^Room name/).inputValue()).toBe("Meeting room");
    expect(await page.getByLabel("Heat capacity (kJ/K)").inputValue()).toBe("900");
    expect(await page.getByRole("list", { name: "Devices in Meeting room" }).innerText()).toContain(
      "Room temperature sensor 1",
    );
    expect(pageErrors).toEqual([]);
  });
});
