import path from "node:path";
import type { Browser } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { screenshotDir, useBrowser } from "./browser";

let browser: Browser;
const baseUrl = inject("baseUrl");

useBrowser((launched) => (browser = launched));

describe("the plant checklist in a browser", () => {
  it("finds bloodroot from a misspelt common name, on a phone-sized screen", async () => {
    const page = await browser.newPage({ viewport: { width: 360, height: 780 }, deviceScaleFactor: 2 });
    await page.goto(`${baseUrl}/checklist`);
    await expect.poll(() => page.locator("[data-testid=checklist-results] > li").count()).toBeGreaterThanOrEqual(150);
    await page.screenshot({ path: path.join(screenshotDir, "checklist-360.png") });

    // Wait for hydration: typing before React attaches would be lost.
    await page.waitForFunction(() => document.querySelector("#checklist-q") && (window as unknown as { __reactRouterRouteModules?: unknown }).__reactRouterRouteModules);
    await page.getByLabel("Find a plant").pressSequentially("bloodrot", { delay: 20 });
    const first = page.locator("[data-testid=checklist-results] > li").first();
    await expect.poll(() => first.textContent()).toContain("Sanguinaria canadensis");
    expect(page.url()).toContain("q=bloodrot");
    await page.screenshot({ path: path.join(screenshotDir, "checklist-search-360.png") });

    await first.getByRole("link").click();
    await page.waitForURL(/\/checklist\/\d+$/);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toContain("Sanguinaria canadensis");
    await page.close();
  });

  it("filters on the server when scripts have not run (a search link opened cold)", async () => {
    const context = await browser.newContext({ javaScriptEnabled: false });
    const page = await context.newPage();
    await page.goto(`${baseUrl}/checklist?q=${encodeURIComponent("pusy willow")}`);
    const first = await page.locator("[data-testid=checklist-results] > li").first().textContent();
    expect(first).toContain("Salix discolor");
    await context.close();
  });

  it("looks designed at desktop width", async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await page.goto(`${baseUrl}/checklist`);
    const fontFamily = await page.locator("h1").evaluate((el) => getComputedStyle(el).fontFamily);
    expect(fontFamily).toMatch(/Lora/);
    await page.evaluate(() => document.fonts.ready);
    expect(await page.evaluate(() => document.fonts.check("600 16px Lora"))).toBe(true);
    await page.screenshot({ path: path.join(screenshotDir, "checklist-desktop.png") });
    await page.close();
  });
});

describe("a plant's page", () => {
  it("shows when bees were seen on it and which, from the records", async () => {
    const search = await (await fetch(`${baseUrl}/api/taxa/search?q=Salix%20discolor&limit=1`)).json();
    const page = await browser.newPage({ viewport: { width: 360, height: 780 } });
    await page.goto(`${baseUrl}/checklist/${search.results[0].id}`);
    const records = page.getByRole("region", { name: "What the records say" });
    await expect.poll(() => records.textContent()).toMatch(/\d+ visits recorded, \d+ verified by a botanist/);
    expect(await records.getByRole("img").getAttribute("aria-label")).toMatch(/^Visits by month — (March|April|May)/);
    expect(await records.textContent()).toContain("Bombus");
    await page.screenshot({ path: path.join(screenshotDir, "taxon-360.png"), fullPage: true });
    await page.close();
  });
});
