import { type Browser, chromium } from "playwright-core";

/** Debian's Chromium; test/e2e/ensure-chromium.sh installs it or explains how. */
export const chromiumPath = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

/**
 * Launch the system Chromium headless. No browser download: playwright-core
 * only drives the executable. Background networking, updates and sync are
 * off so the browser talks to nothing but the app under test.
 */
export function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: chromiumPath,
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}
