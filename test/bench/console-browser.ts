/*
 * The live console measured in the real browser: serves the app the way the
 * browser tests do (test/e2e/global-setup.ts: build when stale, fresh seeded
 * database, next start on a free 127.0.0.1 port), opens the demo bench's live
 * console in Debian's Chromium at 1440x900, and for 10x and then Max speed
 * prints, side by side:
 *   - long tasks on the page's main thread over 10 s (PerformanceObserver
 *     "longtask": count, time spent in them, the longest);
 *   - control-panel presses: a real mouse click on the "Rear power" tile,
 *     press to next paint (Event Timing "event" duration: the press is seen)
 *     and press to the frame that shows the tile's new value (the answer).
 * Numbers only: the machine is shared, so no threshold is checked here.
 */
import type { Page } from "playwright-core";
import type { TestProject } from "vitest/node";
import { demoPeople } from "../../db/demo-world";
import { launchChromium } from "../e2e/chromium";
import setup from "../e2e/global-setup";

const OBSERVE_MS = 10_000;
const PRESSES = 10;
const TRAINER = "ada.trainer@fernhill.example";
const TILE = '[data-tile="cp-lab-5"]'; // Trainer control panel, "Rear power" (a toggle tile)

interface PhaseResult {
  readonly speed: string;
  readonly longTasks: number;
  readonly blockedMs: number;
  readonly longestMs: number;
  readonly pressPaintMs: number[];
  readonly pressValueMs: number[];
  readonly unanswered: number;
}

/** Starts collecting long tasks and click event timings in the page. */
async function observe(page: Page): Promise<void> {
  await page.evaluate(() => {
    const w = window as unknown as { __longTasks: number[]; __clicks: number[] };
    w.__longTasks = [];
    w.__clicks = [];
    new PerformanceObserver((list) => {
      for (const entry of list.getEntries()) w.__longTasks.push(entry.duration);
    }).observe({ type: "longtask" });
    new PerformanceObserver((list) => {
      for (const entry of list.getEntries())
        if (entry.name === "click") w.__clicks.push(entry.duration);
    }).observe({ type: "event", durationThreshold: 16 } as PerformanceObserverInit);
  });
}

async function takeLongTasks(page: Page): Promise<number[]> {
  return page.evaluate(() => {
    const w = window as unknown as { __longTasks: number[] };
    const tasks = w.__longTasks;
    w.__longTasks = [];
    return tasks;
  });
}

/**
 * One press of the tile: arms a watcher in the page, clicks with the real
 * mouse, and returns ms from the click's event time to the animation frame
 * after the tile's value text changed (null when no answer came in 5 s).
 */
async function pressOnce(page: Page): Promise<number | null> {
  await page.evaluate((selector) => {
    const w = window as unknown as { __press: Promise<number | null> };
    const tile = document.querySelector(selector)!;
    const valueOf = () =>
      (tile.querySelector("span:last-child")?.textContent ?? "").split(" · ")[0];
    const before = valueOf();
    w.__press = new Promise((resolve) => {
      let clickTs: number | null = null;
      tile.addEventListener("click", (e) => (clickTs = e.timeStamp), { once: true, capture: true });
      const stop = setTimeout(() => {
        observer.disconnect();
        resolve(null);
      }, 5_000);
      const observer = new MutationObserver(() => {
        if (clickTs === null || valueOf() === before) return;
        observer.disconnect();
        clearTimeout(stop);
        const start = clickTs;
        requestAnimationFrame(() => resolve(performance.now() - start));
      });
      observer.observe(tile, { subtree: true, childList: true, characterData: true });
    });
  }, TILE);
  const box = await page.locator(TILE).boundingBox();
  if (box === null) throw new Error("the Rear power tile is not on screen");
  await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
  return page.evaluate(() => (window as unknown as { __press: Promise<number | null> }).__press);
}

async function phase(page: Page, speed: "10x" | "Max"): Promise<PhaseResult> {
  await page.getByRole("button", { name: `Run at ${speed}` }).click();
  await page.waitForTimeout(1_000); // let the speed settle before counting
  await takeLongTasks(page);
  await page.waitForTimeout(OBSERVE_MS);
  const tasks = await takeLongTasks(page);
  await page.locator(TILE).scrollIntoViewIfNeeded();
  await page.evaluate(() => ((window as unknown as { __clicks: number[] }).__clicks = []));
  const pressValueMs: number[] = [];
  let unanswered = 0;
  for (let i = 0; i < PRESSES; i++) {
    const ms = await pressOnce(page);
    if (ms === null) unanswered++;
    else pressValueMs.push(ms);
    await page.waitForTimeout(300);
  }
  const clicks = await page.evaluate(() => (window as unknown as { __clicks: number[] }).__clicks);
  await page.evaluate(() => window.scrollTo(0, 0));
  return {
    speed,
    longTasks: tasks.length,
    blockedMs: tasks.reduce((sum, ms) => sum + ms, 0),
    longestMs: tasks.reduce((max, ms) => Math.max(max, ms), 0),
    // Clicks painted within 16 ms are not reported by Event Timing; count them as 16.
    pressPaintMs: [...clicks, ...Array<number>(Math.max(0, PRESSES - clicks.length)).fill(16)],
    pressValueMs,
    unanswered,
  };
}

const median = (values: readonly number[]) =>
  values.length === 0 ? NaN : [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)]!;
const max = (values: readonly number[]) => (values.length === 0 ? NaN : Math.max(...values));
const ms = (value: number) => (Number.isNaN(value) ? "–" : `${Math.round(value)} ms`);

/** Serves the app, measures the console at 10x and Max, prints the table; stops what it started. */
export async function measureConsoleInBrowser(): Promise<void> {
  let baseURL = "";
  const project = { provide: (_key: string, value: string) => (baseURL = value) };
  const teardown = await setup(project as unknown as TestProject);
  const browser = await launchChromium();
  try {
    const page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    // tsx keeps function names with an `__name` helper that the page does not have.
    await page.addInitScript("globalThis.__name = (fn) => fn;");
    const password = demoPeople.find((p) => p.email === TRAINER)!.password;
    await page.goto(`${baseURL}/sign-in?next=${encodeURIComponent("/console")}`);
    await page.getByLabel("E-mail").fill(TRAINER);
    await page.getByLabel("Password").fill(password);
    await Promise.all([
      page.waitForURL((url) => !url.pathname.startsWith("/sign-in"), { timeout: 30_000 }),
      page.getByRole("button", { name: "Sign in" }).click(),
    ]);
    await page.getByRole("link", { name: "Open Fernhill Training Centre live" }).click();
    await page.getByRole("toolbar", { name: "Time controls" }).waitFor({ timeout: 60_000 });
    await observe(page);
    const results = [await phase(page, "10x"), await phase(page, "Max")];

    console.log("");
    console.log(
      `live console in Chromium at 1440x900, demo bench: long tasks over ${OBSERVE_MS / 1000} s, then ${PRESSES} presses of a control-panel tile`,
    );
    console.log(
      "speed   long tasks   in them   longest   press->paint median/max   press->value median/max   unanswered",
    );
    for (const r of results) {
      console.log(
        `${r.speed.padEnd(6)}  ${String(r.longTasks).padStart(10)}   ${ms(r.blockedMs).padStart(7)}   ${ms(r.longestMs).padStart(7)}   ${`${ms(median(r.pressPaintMs))} / ${ms(max(r.pressPaintMs))}`.padStart(23)}   ${`${ms(median(r.pressValueMs))} / ${ms(max(r.pressValueMs))}`.padStart(23)}   ${String(r.unanswered).padStart(10)}`,
      );
    }
    const [slow, fast] = results;
    console.log(
      `Max / 10x: long tasks ${(fast!.longTasks / Math.max(1, slow!.longTasks)).toFixed(2)}x, press->value median ${(median(fast!.pressValueMs) / median(slow!.pressValueMs)).toFixed(2)}x`,
    );
  } finally {
    await browser.close();
    await teardown();
  }
}
