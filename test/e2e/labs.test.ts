import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { launchChromium } from "./chromium";
import { demoPassword, signIn } from "./support/sign-in";

/**
 * A trainer makes a lab from the seeded Fernhill bench, graded by "Door
 * push-button toggles the ceiling lights", with one hidden fault: the door
 * rocker's sending link moved from the ceiling lights (1/0/1) to the bench
 * lights (1/0/2). The apprentice, in a second browser context, submits the
 * copy as given (it fails), moves the link back, submits again and passes;
 * the trainer sees both attempts.
 */
describe("training labs in headless Chromium", () => {
  const baseURL = inject("baseURL");
  const trainer = "ada.trainer@fernhill.example";
  const apprentice = "leo.apprentice@fernhill.example";
  const title = "Find the door rocker";
  let browser: Browser;
  let trainerContext: BrowserContext;
  let apprenticeContext: BrowserContext;
  let trainerPage: Page;
  let apprenticePage: Page;
  let labUrl = "";
  const pageErrors: string[] = [];

  beforeAll(async () => {
    browser = await launchChromium();
    trainerContext = await browser.newContext();
    apprenticeContext = await browser.newContext();
    trainerPage = await trainerContext.newPage();
    apprenticePage = await apprenticeContext.newPage();
    for (const page of [trainerPage, apprenticePage]) {
      page.on("pageerror", (error) => pageErrors.push(error.message));
    }
    await signIn(trainerPage, trainer, demoPassword(trainer), "/labs");
    await signIn(apprenticePage, apprentice, demoPassword(apprentice), "/labs");
  });

  afterAll(async () => {
    await browser?.close();
  });

  it("lets the trainer create a lab with a hidden fault and assign it with a due date", async () => {
    const form = trainerPage.getByRole("form", { name: "New lab" });
    await form.getByLabel("Title", { exact: true }).fill(title);
    await form
      .getByLabel("Brief for the apprentices")
      .fill("The door rocker should switch the ceiling lights.");
    await form
      .getByLabel("Bench", { exact: true })
      .selectOption({ label: "Fernhill Training Centre" });
    await form
      .getByLabel("Grading scenario", { exact: true })
      .selectOption({ label: "Door push-button toggles the ceiling lights" });
    await form.getByRole("button", { name: "Add hidden fault" }).click();
    await form
      .getByLabel("Hidden fault 1: link")
      .selectOption({ label: "Door push-button object 0 → 1/0/1" });
    await form.getByLabel("Hidden fault 1: move to").selectOption("1/0/2");
    await form.getByRole("button", { name: "Create lab" }).click();
    await trainerPage.waitForURL(/\/labs\/[^/]+$/);
    labUrl = trainerPage.url();
    await trainerPage.getByText("pb-door object 0: 1/0/1 moved to 1/0/2").waitFor();

    const assign = trainerPage.getByRole("form", { name: "Assign the lab" });
    await assign.getByLabel(/Leo Brackwater/).check();
    await assign.getByLabel("Due date").fill("2030-06-30");
    await assign.getByRole("button", { name: "Assign" }).click();
    await assign.getByText("Assigned to 1; they have been e-mailed.").waitFor();
  });

  it("lets the apprentice work on a private copy, see the failing checks, fix the fault and pass", async () => {
    await apprenticePage.goto(`${baseURL}/labs`);
    await apprenticePage.getByRole("link", { name: title }).click();
    await apprenticePage.waitForURL(/\/labs\/assignments\/[^/]+$/);
    expect(await apprenticePage.getByText("due 2030-06-30").count()).toBeGreaterThan(0);
    await apprenticePage.getByRole("button", { name: "Start working" }).click();
    const rocker = apprenticePage.getByLabel("Group address of Door push-button object 0 link 1");
    await rocker.waitFor();
    // The hidden fault is in the copy: the rocker sends to the bench lights.
    expect(await rocker.inputValue()).toBe("1/0/2");

    // Submitted as given, the grading scenario fails.
    await apprenticePage.getByRole("button", { name: "Submit for grading" }).click();
    const first = apprenticePage.getByRole("listitem", { name: "Attempt 1" });
    await first.getByText("failed", { exact: true }).waitFor({ timeout: 60_000 });
    expect(await first.locator("[data-check-status='fail']").count()).toBeGreaterThan(0);

    // Fix: move the rocker's sending link back to the ceiling lights, save, submit.
    await apprenticePage
      .getByLabel("Group address of Door push-button object 0 link 1")
      .selectOption("1/0/1");
    await apprenticePage.getByRole("button", { name: "Save wiring" }).click();
    await apprenticePage.getByText("Wiring saved.").waitFor();
    await apprenticePage.getByRole("button", { name: "Submit for grading" }).click();
    const second = apprenticePage.getByRole("listitem", { name: "Attempt 2" });
    await second.getByText("passed", { exact: true }).waitFor({ timeout: 60_000 });
    expect(await second.locator("[data-check-status='fail']").count()).toBe(0);
    expect(await second.locator("[data-check-status='pass']").count()).toBeGreaterThan(0);
  });

  it("shows the trainer every attempt", async () => {
    await trainerPage.goto(labUrl);
    const attempts = trainerPage.getByRole("listitem", { name: "Attempts of Leo Brackwater" });
    await attempts.getByText("2 attempts").waitFor();
    expect(await attempts.getByText("failed", { exact: true }).count()).toBe(1);
    expect(await attempts.getByText("passed", { exact: true }).count()).toBe(1);
  });

  it("logs no page errors", () => {
    expect(pageErrors).toEqual([]);
  });
});
