import { mkdirSync } from "node:fs";
import path from "node:path";
import { chromium, type Browser } from "playwright-core";
import { afterAll, beforeAll } from "vitest";

export const screenshotDir = path.resolve(import.meta.dirname, "../../test-results");

/** Debian's Chromium, headless, with the flags this closed network needs (playwright gives each launch a fresh profile). */
export async function launchBrowser(): Promise<Browser> {
  mkdirSync(screenshotDir, { recursive: true });
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    headless: true,
    args: [
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

/** For a test file: one browser for all its tests, handed to `receive` once launched. */
export function useBrowser(receive: (browser: Browser) => void) {
  let browser: Browser | undefined;
  beforeAll(async () => {
    browser = await launchBrowser();
    receive(browser);
  });
  afterAll(async () => {
    await browser?.close();
  });
}
