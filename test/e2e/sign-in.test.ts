import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { navItemsFor } from "../../app/_lib/capabilities";
import { navItems } from "../../components/shell/nav-items";
import { demoPeople } from "../../db/demo-world";
import { launchChromium } from "./chromium";
import { demoPassword, signIn } from "./support/sign-in";

describe("sign-in and role navigation in headless Chromium", () => {
  const baseURL = inject("baseURL");
  let browser: Browser;

  beforeAll(async () => {
    browser = await launchChromium();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("sends a signed-out visit to a bench page to the sign-in page", async () => {
    const page = await browser.newPage();
    await page.goto(`${baseURL}/benches/some-bench`);
    const url = new URL(page.url());
    expect(url.pathname).toBe("/sign-in");
    expect(url.searchParams.get("next")).toBe("/benches/some-bench");
    expect(await page.getByRole("button", { name: "Sign in" }).isVisible()).toBe(true);
    await page.close();
  });

  it("refuses a wrong password with the generic message", async () => {
    const page = await browser.newPage();
    await page.goto(`${baseURL}/sign-in`);
    await page.getByLabel("E-mail").fill("ines.admin@fernhill.example");
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    // Next's route announcer is an (empty) alert too, so look for ours by its text.
    const alert = page.getByRole("alert").filter({ hasText: /do not match an active account/ });
    await alert.waitFor();
    expect(await alert.isVisible()).toBe(true);
    await page.close();
  });

  for (const person of demoPeople) {
    const role = person.memberships[0]!.role;
    it(`shows ${role} (${person.email}) the navigation of that role`, async () => {
      const context = await browser.newContext();
      const page = await context.newPage();
      // /account is a studio page every role may open, whatever else is built yet.
      await signIn(page, person.email, demoPassword(person.email), "/account");
      expect(new URL(page.url()).pathname).toBe("/account");
      expect(await page.getByTestId("account-role").innerText()).toBe(role);
      const nav = page.getByRole("navigation", { name: "Studio" });
      const shown = (await nav.locator("li").allInnerTexts()).map((text) =>
        text.replace(/\s*soon$/i, "").trim(),
      );
      expect(shown).toEqual(navItemsFor(role, navItems).map((item) => item.label));
      // A member of several workspaces gets a switcher.
      const switcher = page.getByLabel("Workspace", { exact: true });
      expect(await switcher.count()).toBe(person.memberships.length > 1 ? 1 : 0);
      await context.close();
    });
  }

  it("signs out and lands on the sign-in page; the studio is closed again", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(
      page,
      "priya.qa@fernhill.example",
      demoPassword("priya.qa@fernhill.example"),
      "/account",
    );
    await Promise.all([
      page.waitForURL((url) => url.pathname === "/sign-in"),
      page.getByRole("button", { name: "Sign out" }).click(),
    ]);
    await page.goto(`${baseURL}/account`);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await context.close();
  });
});
