import type { Browser, Locator, Page } from "playwright-core";
import { readFileSync } from "node:fs";
import { deflateSync } from "node:zlib";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { BENCH_FORMAT } from "../../engine";
import { largeBench } from "../bench/large-bench";
import { launchChromium } from "./chromium";
import { demoPassword, signIn } from "./support/sign-in";

const ENGINEER = "tomas.engineer@fernhill.example";

async function centre(locator: Locator) {
  const box = await locator.boundingBox();
  if (!box) throw new Error("element is not on screen");
  return { x: box.x + box.width / 2, y: box.y + box.height / 2 };
}

/** Drags from one element to another with real mouse moves, as a person would. */
async function drag(page: Page, from: Locator, to: Locator) {
  const a = await centre(from);
  const b = await centre(to);
  await page.mouse.move(a.x, a.y);
  await page.mouse.down();
  await page.mouse.move((a.x + b.x) / 2, (a.y + b.y) / 2, { steps: 8 });
  await page.mouse.move(b.x, b.y, { steps: 8 });
  await page.mouse.up();
}

// PNG spec §5.5: CRC-32 (ISO 3309 polynomial, reflected 0xEDB88320) over chunk type and data.
function crc32(bytes: Buffer): number {
  let crc = 0xffffffff;
  for (const byte of bytes) {
    crc ^= byte;
    for (let bit = 0; bit < 8; bit++) crc = (crc >>> 1) ^ (0xedb88320 & -(crc & 1));
  }
  return (crc ^ 0xffffffff) >>> 0;
}

function pngChunk(type: string, data: Buffer): Buffer {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, "ascii"), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([length, body, crc]);
}

/** A plain grey RGB PNG (PNG spec §11.2.2 IHDR: bit depth 8, colour type 2; filter 0 per row). */
function greyPng(width: number, height: number): Buffer {
  const header = Buffer.alloc(13);
  header.writeUInt32BE(width, 0);
  header.writeUInt32BE(height, 4);
  header.set([8, 2, 0, 0, 0], 8);
  const row = Buffer.concat([Buffer.from([0]), Buffer.alloc(width * 3, 0x99)]);
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), // PNG spec §5.2 signature
    pngChunk("IHDR", header),
    pngChunk("IDAT", deflateSync(Buffer.concat(Array.from({ length: height }, () => row)))),
    pngChunk("IEND", Buffer.alloc(0)),
  ]);
}

describe("bench editor in headless Chromium", () => {
  const baseURL = inject("baseURL");
  let browser: Browser;
  let page: Page;
  const pageErrors: string[] = [];
  let benchUrl = "";

  beforeAll(async () => {
    browser = await launchChromium();
    page = await browser.newPage({
      viewport: { width: 1600, height: 1000 },
      acceptDownloads: true,
    });
    page.on("pageerror", (error) => pageErrors.push(error.message));
    await signIn(page, ENGINEER, demoPassword(ENGINEER), "/benches");
  });

  afterAll(async () => {
    await browser?.close();
  });

  it("creates a bench and builds it from the shelf, wiring a port to a bus-bar by dragging", async () => {
    await page.getByLabel("New bench name").fill("Hall wiring from scratch");
    await Promise.all([
      page.waitForURL(/\/benches\/[^/]+$/),
      page.getByRole("button", { name: "Create bench" }).click(),
    ]);
    benchUrl = page.url();
    await page.getByRole("application", { name: "Bench canvas" }).waitFor();

    await page.getByRole("button", { name: "Add Push-button" }).click();
    await page.getByRole("button", { name: "Add Switch actuator" }).click();
    await page.getByRole("tab", { name: /Addresses/ }).click();
    const form = page.getByRole("form", { name: "Add a group address" });
    await form.getByLabel("Name").fill("Hall light");
    await form.getByLabel("DPT").fill("1.001");
    await form.getByRole("button", { name: "Add address" }).click();
    await page.getByLabel("Name of 1/0/1").waitFor();

    // Fit the view so the cards and the new bus-bar are all on screen.
    await page.getByRole("application", { name: "Bench canvas" }).focus();
    await page.keyboard.press("f");
    await page.waitForTimeout(400);

    // 1/0/1 is raw 2049 (knx-reference.md, Addresses: main<<11 | middle<<8 | sub).
    const bar = page.getByTestId("bus-bar-2049").locator(".bus-bar-handle");
    await drag(page, page.getByTestId("port-push-button-1-0"), bar);
    await drag(page, page.getByTestId("port-switch-actuator-1-0"), bar);
    const rocker = page.getByTestId("device-card-push-button-1");
    await expect.poll(() => rocker.innerText()).toContain("▸1/0/1");
    await expect
      .poll(() => page.getByTestId("device-card-switch-actuator-1").innerText())
      .toContain("▸1/0/1");
    expect(await rocker.innerText()).toContain("1.1.1");
  });

  it("refuses a link between sizes that do not match, with the reason on the canvas", async () => {
    await page.getByRole("tab", { name: /Addresses/ }).click();
    const form = page.getByRole("form", { name: "Add a group address" });
    await form.getByLabel("Name").fill("Hall dim value");
    await form.getByLabel("DPT").fill("5.001");
    await form.getByRole("button", { name: "Add address" }).click();
    await page.getByLabel("Name of 1/0/2").waitFor();
    await page.getByRole("application", { name: "Bench canvas" }).focus();
    await page.keyboard.press("f");
    await page.waitForTimeout(400);
    // DPT spec §3: a 1-bit status object does not fit a one-octet 5.001 address.
    await drag(
      page,
      page.getByTestId("port-switch-actuator-1-1"),
      page.getByTestId("bus-bar-2050").locator(".bus-bar-handle"),
    );
    const notice = page.getByTestId("canvas-notice");
    await expect.poll(() => notice.innerText()).toMatch(/5\.001 \(8 bit\).*1\.001 \(1 bit\)/);
  });

  it("saves a revision with a summary and shows the bench again after a reload", async () => {
    await page.getByRole("button", { name: "Save", exact: true }).click();
    await expect.poll(() => page.getByTestId("revision-label").innerText()).toBe("revision 2");
    await page.goto(benchUrl);
    const rocker = page.getByTestId("device-card-push-button-1");
    await rocker.waitFor();
    expect(await rocker.innerText()).toContain("▸1/0/1");
    expect(await page.getByTestId("revision-label").innerText()).toBe("revision 2");
  });

  it("shows every error of an imported file with its field and saves nothing", async () => {
    const broken = {
      format: 1,
      name: "Broken import",
      lines: [{ id: "main", address: "1.1", name: "Main line" }],
      testToolAddress: "1.1.250",
      devices: [{ id: "x-1", type: "toaster", name: "Toaster", individualAddress: "1.1.9" }],
    };
    await page.getByTestId("import-input").setInputFiles({
      name: "broken.bench.json",
      mimeType: "application/json",
      buffer: Buffer.from(JSON.stringify(broken)),
    });
    const result = page.getByRole("alert", { name: "Import result" });
    await result.waitFor();
    const text = await result.innerText();
    expect(text).toContain("nothing was saved");
    expect(text).toContain("devices[0].type");
    await page.reload();
    await page.getByTestId("device-card-push-button-1").waitFor();
    expect(await page.getByTestId("revision-label").innerText()).toBe("revision 2");
  });

  it("exports the current bench as a Benchline bench file", async () => {
    const [download] = await Promise.all([
      page.waitForEvent("download"),
      page.getByRole("button", { name: "Export" }).click(),
    ]);
    expect(download.suggestedFilename()).toBe("hall-wiring-from-scratch.bench.json");
    const exported = JSON.parse(readFileSync((await download.path())!, "utf8")) as {
      format: number;
      devices: { id: string }[];
      links: unknown[];
    };
    // The current bench format (2 since benches carry a topology), whatever format it was made in.
    expect(exported.format).toBe(BENCH_FORMAT);
    expect(exported.devices.map((d) => d.id)).toEqual(["push-button-1", "switch-actuator-1"]);
    expect(exported.links).toHaveLength(2);
  });

  it("draws an uploaded PNG floor plan under the canvas", async () => {
    // Every PNG ends with the IEND chunk CRC AE 42 60 82 (recalled from memory, PNG spec §5.5).
    expect(crc32(Buffer.from("IEND", "ascii"))).toBe(0xae426082);
    await page.getByTestId("floor-plan-input").setInputFiles({
      name: "ground-floor.png",
      mimeType: "image/png",
      buffer: greyPng(64, 40),
    });
    const plan = page
      .getByRole("application", { name: "Bench canvas" })
      .locator(".react-flow__node-floorPlan")
      .getByRole("img", { name: "Floor plan" });
    await plan.waitFor();
    expect(await plan.getAttribute("src")).toMatch(/^\/api\/benches\/[^/]+\/floor-plan\?v=/);
    // Decoded by the browser at its own size, so it really is the uploaded image.
    await expect
      .poll(() => plan.evaluate((img: HTMLImageElement) => [img.naturalWidth, img.naturalHeight]))
      .toEqual([64, 40]);
  });

  it("lists the revisions after a save, opens an earlier one read-only and restores it", async () => {
    const benchId = new URL(benchUrl).pathname.split("/").pop()!;
    expect(await page.getByRole("link", { name: "Run live" }).getAttribute("href")).toBe(
      `/benches/${benchId}/live`,
    );
    expect(await page.getByRole("link", { name: "Bench scenarios" }).getAttribute("href")).toBe(
      "/scenarios",
    );
    await page.getByRole("tab", { name: "History" }).click();
    const history = page.getByRole("list", { name: "Revision history" });
    await history.waitFor();
    const latest = history.getByRole("listitem", { name: "Revision 2" });
    expect(await latest.innerText()).toContain("Tomas Ravelin");
    expect(await latest.innerText()).toContain("current");
    expect(await history.getByRole("listitem").count()).toBe(2);

    await page.getByRole("button", { name: "Open revision 1 read-only" }).click();
    const view = page.getByRole("region", { name: "Revision 1, read only" });
    await view.getByRole("application", { name: "Revision 1 canvas" }).waitFor();
    await expect.poll(() => view.innerText()).toContain("0 devices");
    expect(await view.getByTestId("device-card-push-button-1").count()).toBe(0);

    await view.getByRole("button", { name: "Restore as new revision" }).click();
    await expect.poll(() => page.getByTestId("revision-label").innerText()).toBe("revision 3");
    await expect
      .poll(() => history.getByRole("listitem").first().innerText())
      .toContain("Restored revision 1");
    expect(await page.getByTestId("device-card-push-button-1").count()).toBe(0);
  });

  it("opens a generated 300-device, 1,000-address bench and pans it without errors", async () => {
    const document = largeBench(100);
    const created = await page.evaluate(
      async (body) => {
        const response = await fetch("/api/benches", {
          method: "POST",
          headers: { "Content-Type": "application/json" },
          body: JSON.stringify(body),
        });
        return (await response.json()) as { bench: { id: string } };
      },
      { document },
    );
    const start = Date.now();
    await page.goto(`${baseURL}/benches/${created.bench.id}`);
    await page.locator(".react-flow__node").first().waitFor();
    const firstRenderMs = Date.now() - start;
    // A figure to read, not a threshold (see npm run bench:canvas).
    console.log(
      `bench-editor e2e: 300-device bench, navigation to first canvas node in ${firstRenderMs} ms`,
    );
    expect(await page.getByText("300 devices · 1000 addresses").isVisible()).toBe(true);
    const pane = page.locator(".react-flow__pane");
    const box = (await pane.boundingBox())!;
    for (let i = 0; i < 3; i++) {
      await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
      await page.mouse.down();
      await page.mouse.move(box.x + box.width / 2 - 400, box.y + box.height / 2 - 300, {
        steps: 10,
      });
      await page.mouse.up();
    }
    expect(await page.locator(".react-flow__node").count()).toBeGreaterThan(0);
    expect(pageErrors).toEqual([]);
  });
});
