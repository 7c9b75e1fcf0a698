import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchChromium } from "./chromium";
import { connectTunnelClient, type TunnelClient } from "./support/knx-tunnel-client";
import { seriousViolations } from "./support/axe";
import { demoPassword, signIn } from "./support/sign-in";

/**
 * A live session hosted by the server, published on KNXnet/IP, with a real
 * client: the `knx` npm package (test-only devDependency, "Libraries" in
 * knx-reference.md) tunnels from this test process to 127.0.0.1 and the port
 * the console shows. The console must list the client with its tunnel
 * individual address, mark the telegram it sent as IP in the log, and
 * disconnect it. Every wait is bounded; the client and the session are ended
 * at the end. The write is DPT 1.001 "on" to 1/0/1 (Ceiling lights on the
 * demo bench, scenarios/benches/fernhill-training-centre.bench.json).
 */
describe("server session with a KNXnet/IP client in headless Chromium", () => {
  const engineer = "tomas.engineer@fernhill.example";
  const WAIT_MS = 15_000;
  let browser: Browser;
  let page: Page;
  let sessionId = "";
  let port = 0;
  let tunnel: TunnelClient | null = null;
  let tunnelAddress = "";
  const pageErrors: string[] = [];

  beforeAll(async () => {
    browser = await launchChromium();
    // A context of its own: axe-core's Playwright runner needs one.
    page = await (await browser.newContext()).newPage();
    page.on("pageerror", (error) => pageErrors.push(error.message));
    await signIn(page, engineer, demoPassword(engineer), "/console");
  });

  afterAll(async () => {
    await tunnel?.close();
    // Ends the session if a test stopped half-way (the UI's Stop is the last test).
    if (sessionId && page)
      await page
        .evaluate(
          (id) => fetch(`/api/live-sessions/${id}`, { method: "DELETE" }).then((r) => r.status),
          sessionId,
        )
        .catch(() => undefined);
    await browser?.close();
  });

  it("starts the demo bench on the server, fixed at real time", async () => {
    await page
      .getByRole("button", { name: "Start Fernhill Training Centre on the server" })
      .click();
    await page.waitForURL(/\/console\/sessions\/[^/]+$/, { timeout: WAIT_MS });
    sessionId = decodeURIComponent(new URL(page.url()).pathname.split("/")[3]!);
    const toolbar = page.getByRole("toolbar", { name: "Time controls" });
    await toolbar.waitFor({ timeout: WAIT_MS });
    await expect.poll(() => toolbar.innerText()).toContain("Real time (1x)");
    expect(await page.getByRole("group", { name: "Speed" }).count()).toBe(0);
    await expect
      .poll(() => page.getByRole("status", { name: "Link to the session" }).innerText(), {
        timeout: WAIT_MS,
      })
      .toBe("live");
  });

  it("publishes the session on KNXnet/IP on loopback, with the caution", async () => {
    const panel = page.getByRole("region", { name: "KNXnet/IP endpoint" });
    await panel.getByRole("button", { name: "Publish on KNXnet/IP" }).click();
    const address = panel.getByTestId("endpoint-address");
    await address.waitFor({ timeout: WAIT_MS });
    port = Number(await address.getAttribute("data-port"));
    expect(port).toBeGreaterThan(0);
    expect(await address.innerText()).toBe(`127.0.0.1:${port}`);
    expect(await panel.getByText("loopback only").count()).toBe(1);
    expect(await panel.getByRole("note", { name: "Endpoint caution" }).innerText()).toMatch(
      /never connect this endpoint to the network of a real installation/,
    );
  });

  it("lists a connected client with its tunnel individual address", async () => {
    tunnel = await connectTunnelClient(port, WAIT_MS);
    const clients = page.getByRole("table", { name: "Tunnel clients" });
    const row = clients.getByRole("row").nth(1);
    await row.waitFor({ timeout: WAIT_MS });
    const cells = await row.getByRole("cell").allInnerTexts();
    expect(cells[0]).toMatch(/^127\.0\.0\.1:\d+$/);
    tunnelAddress = cells[1]!.trim();
    expect(tunnelAddress).toMatch(/^\d{1,2}\.\d{1,2}\.\d{1,3}$/);
    // The console shows what the API says about the same tunnel.
    const view = (await page.evaluate(
      (id) => fetch(`/api/live-sessions/${id}`).then((r) => r.json()),
      sessionId,
    )) as { session: { endpoint: { clients: { individualAddress: string }[] } } };
    expect(view.session.endpoint.clients.map((c) => c.individualAddress)).toEqual([tunnelAddress]);
  });

  it("shows a trainer the same session to watch: the client listed, no controls", async () => {
    const trainer = "ada.trainer@fernhill.example";
    const context = await browser.newContext();
    try {
      const watcher = await context.newPage();
      await signIn(watcher, trainer, demoPassword(trainer), "/console");
      await watcher
        .getByRole("list", { name: "Sessions running on the server" })
        .getByRole("link", { name: /^Watch .+'s session of Fernhill Training Centre$/ })
        .click();
      await watcher.waitForURL(/\/console\/sessions\/[^/]+$/, { timeout: WAIT_MS });
      const clients = watcher.getByRole("table", { name: "Tunnel clients" });
      await clients.getByText(tunnelAddress).waitFor({ timeout: WAIT_MS });
      expect(await watcher.getByRole("button", { name: /^Disconnect tunnel/ }).count()).toBe(0);
      expect(await watcher.getByRole("button", { name: "Unpublish" }).count()).toBe(0);
      expect(await watcher.getByRole("button", { name: "Stop session" }).count()).toBe(0);
      expect(await watcher.getByText("You are watching").count()).toBe(1);
      // The control pad is there to follow, greyed out: only the owner sends.
      expect(await watcher.getByRole("combobox", { name: "Group address" }).isDisabled()).toBe(
        true,
      );
    } finally {
      await context.close();
    }
  });

  it("has no serious accessibility violations with a client listed (axe-core, WCAG 2.x A/AA)", async () => {
    expect(await seriousViolations(page)).toEqual([]);
  });

  it("marks the telegram the client sent as IP in the telegram log", async () => {
    tunnel!.write("1/0/1", 1, "DPT1.001");
    await page.getByRole("textbox", { name: "Filter by address" }).fill("1/0/1");
    const fromTunnel = page
      .getByRole("table", { name: "Telegram log" })
      .getByRole("row")
      .filter({
        has: page.locator(`abbr[title="Came in over KNXnet/IP, tunnel ${tunnelAddress}"]`),
      });
    await fromTunnel.first().waitFor({ timeout: WAIT_MS });
    expect(await fromTunnel.first().innerText()).toContain(tunnelAddress);
    // The telegram counts follow the stream's session updates.
    await expect
      .poll(
        () =>
          page
            .getByRole("table", { name: "Tunnel clients" })
            .getByRole("row")
            .nth(1)
            .getByRole("cell")
            .nth(3)
            .innerText(),
        { timeout: WAIT_MS },
      )
      .not.toBe("0");
  });

  it("disconnects the client from the console", async () => {
    const ended = tunnel!.disconnectedByServer(WAIT_MS);
    await page
      .getByRole("button", {
        name: new RegExp(`^Disconnect tunnel ${tunnelAddress.replace(/\./g, "\\.")} `),
      })
      .click();
    await ended;
    await page.getByTestId("no-tunnel-clients").waitFor({ timeout: WAIT_MS });
  });

  it("stops the session and says clearly that it ended", async () => {
    await page.getByRole("button", { name: "Stop session" }).click();
    const banner = page.getByRole("alert").filter({ hasText: "This session has ended." });
    await banner.waitFor({ timeout: WAIT_MS });
    expect(await banner.innerText()).toContain("owner stopped it");
    sessionId = "";
    // A reload after the end (or an old link) says the session is not running.
    const response = await page.reload();
    expect(response?.status()).toBe(404);
    await page.getByRole("heading", { name: "This session is not running" }).waitFor();
    expect(pageErrors).toEqual([]);
  });
});
