import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from "vitest";
import { launchChromium } from "./chromium";
import { seriousViolations } from "./support/axe";
import { demoPassword, signIn } from "./support/sign-in";

/**
 * axe-core over every page outside the live console, for every role, in the
 * page's main states: zero serious or critical violations. The live console
 * has its own scan beside its keyboard tests. One browser; each role signs in
 * once in its own context and walks its pages in one tab, so the scan stays a
 * few dozen page loads on a small machine. Rules: WCAG_TAGS (test/e2e/support/axe.ts).
 */
const people = {
  admin: "ines.admin@fernhill.example",
  trainer: "ada.trainer@fernhill.example",
  engineer: "tomas.engineer@fernhill.example",
  qa: "priya.qa@fernhill.example",
  apprentice: "leo.apprentice@fernhill.example",
} as const;
type Role = keyof typeof people;

/** The first link whose href matches, as an absolute path; undefined when the page has none. */
async function firstHref(page: Page, pattern: RegExp): Promise<string | undefined> {
  const hrefs = await page
    .locator("main a[href]")
    .evaluateAll((links) => links.map((a) => a.getAttribute("href") ?? ""));
  return hrefs.find((href) => pattern.test(href));
}

describe("accessibility (axe-core) in headless Chromium", () => {
  const baseURL = inject("baseURL");
  let browser: Browser;
  const contexts: BrowserContext[] = [];
  const found = new Map<string, string[]>();

  async function scan(page: Page, name: string) {
    await page.waitForLoadState("load");
    const violations = await seriousViolations(page);
    if (violations.length > 0) found.set(name, violations);
  }

  async function visit(page: Page, path: string, name: string) {
    const response = await page.goto(`${baseURL}${path}`);
    expect(response?.status(), `${name} answers`).toBeLessThan(500);
    await page.locator("main").first().waitFor();
    await scan(page, name);
  }

  /** Makes sure the workspace has a run to report on: a QA member replays one scenario. */
  async function ensureRun(page: Page): Promise<void> {
    await page.goto(`${baseURL}/runs`);
    if ((await firstHref(page, /^\/runs\/(?!diff)[^/?]+$/)) !== undefined) return;
    await page.goto(`${baseURL}/scenarios`);
    const scenario = await firstHref(page, /^\/scenarios\/(?!new)[^/?]+$/);
    if (scenario === undefined) throw new Error("the demo seed has no scenario");
    const scenarioId = scenario.split("/").pop()!;
    const status = await page.evaluate(
      (id) =>
        fetch("/api/runs", {
          method: "POST",
          headers: { "Content-Type": "application/json" },
          body: JSON.stringify({ scenarioId: id }),
        }).then((r) => r.status),
      scenarioId,
    );
    expect(status).toBeLessThan(300);
    await expect
      .poll(
        async () => {
          await page.goto(`${baseURL}/runs`);
          return firstHref(page, /^\/runs\/(?!diff)[^/?]+$/);
        },
        { timeout: 60_000, interval: 1_000 },
      )
      .toBeDefined();
  }

  beforeAll(async () => {
    browser = await launchChromium();
  });

  // A context per test, closed after it even when the test fails, so no page keeps running.
  afterEach(async () => {
    await Promise.all(contexts.splice(0).map((c) => c.close().catch(() => {})));
  });

  afterAll(async () => {
    await browser?.close();
  });

  it("finds nothing serious on the signed-out pages", async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    contexts.push(context);
    const page = await context.newPage();
    await visit(page, "/", "home (signed out)");
    await visit(page, "/sign-in", "sign-in");
    await page.getByLabel("E-mail").fill("nobody@example.invalid");
    await page.getByLabel("Password").fill("wrong password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("alert").first().waitFor();
    await scan(page, "sign-in with an error");
    expect(Object.fromEntries(found)).toEqual({});
  });

  const roles: Role[] = ["qa", "engineer", "trainer", "apprentice", "admin"];
  for (const role of roles) {
    // About a dozen pages with an axe run each: room for a busy two-core machine.
    it(`finds nothing serious on the ${role}'s pages`, { timeout: 300_000 }, async () => {
      found.clear();
      const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
      contexts.push(context);
      const page = await context.newPage();
      await signIn(page, people[role], demoPassword(people[role]), "/");
      await page.locator("main").first().waitFor();
      await scan(page, `${role}: home`);
      if (role === "qa") await ensureRun(page);

      await visit(page, "/benches", `${role}: benches`);
      const bench = await firstHref(page, /^\/benches\/[^/?]+$/);
      if (bench !== undefined) {
        await page.goto(`${baseURL}${bench}`);
        const canvas = page.getByRole("application", { name: "Bench canvas" });
        await canvas.locator("[data-testid^='device-card-']").first().waitFor();
        // The editor with a device selected: the inspector panels open beside the canvas.
        // The canvas opens at a readable zoom, not fitted, so pick a card that is on screen.
        const cards = canvas.locator("[data-testid^='device-card-']");
        const onScreen = await cards.evaluateAll((elements) => {
          const view = elements[0]?.closest(".react-flow")?.getBoundingClientRect();
          return elements.findIndex((element) => {
            const box = element.getBoundingClientRect();
            return (
              view !== undefined &&
              box.left >= view.left &&
              box.top >= view.top &&
              box.left + 40 <= view.right &&
              box.top + 40 <= view.bottom
            );
          });
        });
        await cards.nth(Math.max(0, onScreen)).click({ position: { x: 20, y: 12 } });
        await page.getByRole("region", { name: "Device", exact: true }).waitFor();
        await scan(page, `${role}: bench editor with a selection`);
      }

      await visit(page, "/scenarios", `${role}: scenarios`);
      const scenario = await firstHref(page, /^\/scenarios\/(?!new)[^/?]+$/);
      if (scenario !== undefined) await visit(page, scenario, `${role}: scenario editor`);

      await visit(page, "/runs", `${role}: runs`);
      const run = await firstHref(page, /^\/runs\/(?!diff)[^/?]+$/);
      if (run !== undefined) await visit(page, run, `${role}: run report`);

      await visit(page, "/labs", `${role}: labs`);
      const lab = await firstHref(page, /^\/labs\/[^/?]+/);
      if (lab !== undefined) await visit(page, lab, `${role}: lab`);

      if (role === "admin" || role === "trainer") {
        await visit(page, "/members", `${role}: members`);
        await visit(page, "/invitations", `${role}: invitations`);
      }
      if (role === "admin") await visit(page, "/outbox", `${role}: outbox`);
      await visit(page, "/account", `${role}: account`);
      expect(Object.fromEntries(found)).toEqual({});
    });
  }

  it(
    "opens the demo bench's canvas with card titles at a readable size",
    { timeout: 180_000 },
    async () => {
      const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
      contexts.push(context);
      const page = await context.newPage();
      const engineer = people.engineer;
      await signIn(page, engineer, demoPassword(engineer), "/benches");
      const bench = page.getByRole("link", { name: "Fernhill Training Centre" }).first();
      await Promise.all([page.waitForURL(/\/benches\/[^/]+$/), bench.click()]);
      const canvas = page.getByRole("application", { name: "Bench canvas" });
      // The canvas marks itself once the opening view (after the async layout) is in place.
      await page.locator("[data-view='opened']").waitFor({ timeout: 60_000 });
      // Rendered size = the title's computed font size × the canvas zoom (the card's scale on screen).
      const titles = await canvas
        .locator("[data-testid^='device-card-'] .font-semibold")
        .evaluateAll((spans) =>
          spans.map((span) => {
            const el = span as HTMLElement;
            const fontPx = parseFloat(getComputedStyle(el).fontSize);
            const scale = el.getBoundingClientRect().height / el.offsetHeight;
            return fontPx * scale;
          }),
        );
      expect(titles.length).toBeGreaterThan(0);
      expect(Math.min(...titles)).toBeGreaterThanOrEqual(11);
      // And cards are on screen, not panned away: the view is on the first line.
      const frame = (await canvas.boundingBox())!;
      const cards = await canvas
        .locator("[data-testid^='device-card-']")
        .evaluateAll((els) => els.map((el) => el.getBoundingClientRect().toJSON() as DOMRect));
      const onScreen = cards.filter(
        (r) =>
          r.right > frame.x &&
          r.left < frame.x + frame.width &&
          r.bottom > frame.y &&
          r.top < frame.y + frame.height,
      );
      expect(onScreen.length).toBeGreaterThan(0);
    },
  );
});
