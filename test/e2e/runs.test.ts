import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { shippedSuiteScenarioFiles } from "../harness/shipped-suite";
import { launchChromium } from "./chromium";
import { demoPassword, signIn } from "./support/sign-in";

/**
 * A QA member replays the seeded demo suite on the server (Fernhill part of
 * scenarios/demo.suite.json) and reads the results: the fault-finding exercise
 * fails as it is meant to, every other scenario passes; then the exercise's
 * report prints to PDF through Chromium and is e-mailed to a colleague.
 */
describe("server runs in headless Chromium", () => {
  const qa = "priya.qa@fernhill.example";
  const exercise = "Exercise: the door rocker should switch the bench lights";
  let browser: Browser;
  let page: Page;
  const pageErrors: string[] = [];

  beforeAll(async () => {
    browser = await launchChromium();
    page = await browser.newPage();
    page.on("pageerror", (error) => pageErrors.push(error.message));
    await signIn(page, qa, demoPassword(qa), "/runs");
  });

  afterAll(async () => {
    await browser?.close();
  });

  it("replays the demo suite: the expected-to-fail scenario fails, the rest pass", async () => {
    const suite = page.getByRole("listitem", { name: "Suite Benchline demo scenarios" });
    await suite.getByRole("button", { name: "Run suite" }).click();
    // Progress streams over server-sent events until the suite is done.
    await suite.getByRole("progressbar", { name: "Run suite progress" }).waitFor();
    await suite.getByRole("link", { name: "View result" }).click({ timeout: 60_000 });
    await page.waitForURL(/\/runs\/[^/]+$/);
    await page.getByRole("heading", { name: "Benchline demo scenarios" }).waitFor();

    const rows = page.locator("tr[data-outcome]");
    const outcomes = await rows.evaluateAll((trs) =>
      trs.map((tr) => ({
        name: tr.querySelector("a")?.textContent ?? "",
        outcome: tr.getAttribute("data-outcome"),
        badge: tr.lastElementChild?.textContent ?? "",
      })),
    );
    // The Fernhill workspace's suite is the shipped suite's Fernhill part.
    const fernhill = shippedSuiteScenarioFiles().filter((file) =>
      file.startsWith("fernhill/"),
    ).length;
    expect(outcomes).toHaveLength(fernhill);
    const failing = outcomes.filter((o) => o.outcome !== "passed");
    expect(failing).toEqual([
      { name: exercise, outcome: "expected-failure", badge: "failed as expected" },
    ]);
    expect(outcomes.filter((o) => o.badge === "passed")).toHaveLength(fernhill - 1);
  });

  it("shows the exercise's report with expected and actual and the telegrams behind the failure", async () => {
    await page.getByRole("link", { name: exercise }).click();
    await page.waitForURL(/\/runs\/[^/]+$/);
    const report = page.getByRole("article", { name: "Run report" });
    await report.waitFor();
    expect(await report.getByText("Fernhill Training Centre").first().isVisible()).toBe(true);
    const failedStep = report.locator("li[data-step-status='fail']").first();
    expect(await failedStep.getByText("expected", { exact: true }).isVisible()).toBe(true);
    expect(await failedStep.getByText("actual", { exact: true }).isVisible()).toBe(true);
    expect(await failedStep.locator("caption").innerText()).toMatch(/^Telegrams behind step \d+$/);
    const caution = await page.getByRole("note", { name: "Caution" }).innerText();
    expect(caution).toMatch(/does not replace the manufacturer.s/);
    expect(caution).toMatch(/local codes/);
  });

  it("prints the report to PDF without errors", async () => {
    await page.emulateMedia({ media: "print" });
    expect(await page.getByRole("navigation", { name: "Studio" }).isVisible()).toBe(false);
    expect(await page.getByRole("form", { name: "E-mail this report" }).isVisible()).toBe(false);
    await page.emulateMedia({ media: "screen" });
    const pdf = await page.pdf({ format: "A4", printBackground: true });
    // PDF 1.7 (ISO 32000-1 §7.5.2): a file starts with the header "%PDF-".
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(pdf.length).toBeGreaterThan(5_000);
  });

  it("e-mails the report link to a colleague", async () => {
    const form = page.getByRole("form", { name: "E-mail this report" });
    await form.getByLabel("Colleague's e-mail").fill("ada.trainer@fernhill.example");
    await form.getByRole("button", { name: "Send link" }).click();
    await form.getByRole("status").getByText("Sent to ada.trainer@fernhill.example.").waitFor();
  });

  it("edits a scenario with the parser's messages, and runs it now with a progress bar", async () => {
    await page.goto(page.url().replace(/\/runs\/.*$/, "/scenarios"));
    await page
      .getByRole("link", { name: "Front unit fan levels, clamping and automatic fan" })
      .click();
    await page.waitForURL(/\/scenarios\/[^/]+$/);
    const steps = page.getByRole("list", { name: "Steps" });
    await steps.waitFor();
    const before = await steps.getByRole("listitem").count();
    await page.getByLabel("Kind of new step").selectOption("wait");
    await page.getByRole("button", { name: "Add step" }).click();
    expect(await steps.getByRole("listitem").count()).toBe(before + 1);
    const waitFor = page.getByLabel("Wait for").last();
    await waitFor.fill("soon");
    // The engine's parser names the step and field at fault.
    const problems = page.getByRole("alert", { name: "Problems" });
    await problems.getByText(`steps[${before}].for`).waitFor();
    await waitFor.fill("2s");
    await problems.waitFor({ state: "detached" });

    await page.getByRole("tab", { name: "Raw JSON" }).click();
    expect(await page.getByLabel("Scenario document (JSON, format 1)").inputValue()).toContain(
      '"for": "2s"',
    );
    await page.getByRole("tab", { name: "Steps" }).click();

    const run = page.getByRole("region", { name: "Run", exact: true });
    await run.getByRole("button", { name: "Run now" }).click();
    await run.getByRole("progressbar", { name: "Run now progress" }).waitFor();
    await run.getByRole("link", { name: "View result" }).waitFor({ timeout: 60_000 });
    expect(await run.getByText("passed", { exact: true }).isVisible()).toBe(true);
  });

  it("logs no page errors", () => {
    expect(pageErrors).toEqual([]);
  });
});
