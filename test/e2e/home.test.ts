import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { launchChromium } from "./chromium";

describe("home page in headless Chromium", () => {
  const baseURL = inject("baseURL");
  let browser: Browser;
  let page: Page;
  const consoleErrors: string[] = [];
  const fontResponses: { url: string; status: number }[] = [];
  let documentHeaders: Record<string, string> = {};

  beforeAll(async () => {
    browser = await launchChromium();
    page = await browser.newPage();
    page.on("console", (message) => {
      if (message.type() === "error") consoleErrors.push(message.text());
    });
    page.on("pageerror", (error) => consoleErrors.push(`pageerror: ${error.message}`));
    page.on("requestfailed", (request) => {
      const errorText = request.failure()?.errorText ?? "";
      // Next's router prefetches linked pages as RSC payloads and cancels a prefetch
      // of a dynamic page once it has what it needs; that cancellation is not a fault.
      const cancelledPrefetch =
        errorText === "net::ERR_ABORTED" && new URL(request.url()).searchParams.has("_rsc");
      if (!cancelledPrefetch) consoleErrors.push(`requestfailed: ${request.url()} ${errorText}`);
    });
    page.on("response", (response) => {
      if (response.url().endsWith(".woff2")) {
        fontResponses.push({ url: response.url(), status: response.status() });
      }
    });
    const response = await page.goto(baseURL, { waitUntil: "load" });
    expect(response?.status()).toBe(200);
    documentHeaders = response?.headers() ?? {};
    await page.evaluate(() => document.fonts.ready.then(() => undefined));
  });

  afterAll(async () => {
    await browser?.close();
  });

  it("renders the shell, the purpose and the caution", async () => {
    expect(await page.title()).toBe("Benchline");
    expect(await page.getByRole("link", { name: "Benchline" }).isVisible()).toBe(true);
    expect(await page.getByRole("navigation", { name: "Studio" }).isVisible()).toBe(true);
    expect(
      await page
        .getByRole("heading", { level: 1, name: "A KNX test bench in the browser" })
        .isVisible(),
    ).toBe(true);
    const caution = await page.getByRole("note", { name: "Caution" }).innerText();
    expect(caution).toMatch(
      /does not replace the manufacturer.s installation and commissioning instructions/,
    );
    expect(caution).toMatch(/local codes/);
  });

  it("draws text in the shipped Inter face and values in the shipped monospace face", async () => {
    const fonts = await page.evaluate(() => {
      const firstFamily = (element: Element) =>
        getComputedStyle(element)
          .fontFamily.split(",")[0]!
          .trim()
          .replace(/^["']|["']$/g, "");
      const loadedFamilies = [...document.fonts]
        .filter((face) => face.status === "loaded")
        .map((face) => face.family.replace(/^["']|["']$/g, ""));
      const body = firstFamily(document.body);
      const mono = firstFamily(document.querySelector(".font-mono")!);
      return {
        body,
        mono,
        loadedFamilies,
        bodyReady: document.fonts.check(`16px "${body}"`),
        monoReady: document.fonts.check(`16px "${mono}"`),
      };
    });
    // next/font/local names the face after the declaring variable (inter, jetbrainsMono).
    expect(fonts.body.toLowerCase()).toContain("inter");
    expect(fonts.mono.toLowerCase()).toContain("jetbrains");
    expect(fonts.loadedFamilies).toContain(fonts.body);
    expect(fonts.loadedFamilies).toContain(fonts.mono);
    expect(fonts.bodyReady).toBe(true);
    expect(fonts.monoReady).toBe(true);
    // Served by the app itself, never fetched from a font service.
    expect(fontResponses.length).toBeGreaterThan(0);
    for (const font of fontResponses) {
      expect(font.url.startsWith(`${baseURL}/_next/static/media/`)).toBe(true);
      expect(font.status).toBe(200);
    }
  });

  it("sends the security headers", () => {
    expect(documentHeaders["content-security-policy"]).toContain("frame-ancestors 'none'");
    expect(documentHeaders["content-security-policy"]).toContain("font-src 'self'");
    expect(documentHeaders["x-content-type-options"]).toBe("nosniff");
    expect(documentHeaders["referrer-policy"]).toBe("strict-origin-when-cross-origin");
    expect(documentHeaders["x-powered-by"]).toBeUndefined();
  });

  it("reaches the migrated database from the server", async () => {
    const response = await fetch(`${baseURL}/api/health`);
    expect(response.status).toBe(200);
    const body = (await response.json()) as { ok: boolean; migrations: number };
    expect(body.ok).toBe(true);
    expect(body.migrations).toBeGreaterThan(0);
  });

  it("logs no console errors", () => {
    expect(consoleErrors).toEqual([]);
  });
});
