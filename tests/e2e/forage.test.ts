import { readFile } from "node:fs/promises";
import path from "node:path";
import type { Browser, BrowserContext } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { screenshotDir, useBrowser } from "./browser";
import { signInCookie } from "./session";

let browser: Browser;
useBrowser((launched) => (browser = launched));
const baseUrl = inject("baseUrl");

const DESKTOP = { viewport: { width: 1280, height: 900 } };
const PHONE = { viewport: { width: 360, height: 740 }, deviceScaleFactor: 2, hasTouch: true, isMobile: true };

/** A browser signed in as the demo planner (sign-in over HTTP, cookie handed to Chromium). */
async function asPlanner(options: Parameters<Browser["newContext"]>[0]): Promise<{ context: BrowserContext; cookie: string }> {
  const cookie = await signInCookie(baseUrl, "planner@demo.visitwort.test");
  const [name, ...value] = cookie.split("=");
  const context = await browser.newContext({ ...options, acceptDownloads: true });
  await context.addCookies([{ name: name!, value: value.join("="), url: baseUrl }]);
  return { context, cookie };
}

async function api<T>(cookie: string, pathAndQuery: string): Promise<T> {
  const response = await fetch(`${baseUrl}${pathAndQuery}`, { headers: { Cookie: cookie } });
  expect(response.status).toBe(200);
  return (await response.json()) as T;
}

describe("the forage pages, for a planner", () => {
  it("ranks early-spring forage for queens in the north band, with a chart and a table that match the API", async () => {
    const { context, cookie } = await asPlanner(DESKTOP);
    const page = await context.newPage();
    await page.goto(`${baseUrl}/forage/ranking?caste=queen&band=north`);
    expect(await page.title()).toBe("Forage ranking · Visitwort");

    const expected = await api<{ totalVisits: number; items: { plant: { scientificName: string } }[] }>(cookie, "/api/forage/ranking?caste=queen&band=north&window=early-spring&determination=confirmed");
    // The demo seed (scripts/demo/visits.ts) favours willows and other spring shrubs for queens, so the north band's early spring has visits.
    expect(expected.items.length).toBeGreaterThan(0);

    const rows = page.getByTestId("ranking-row");
    await expect.poll(() => rows.count()).toBe(expected.items.length);
    // Same order as the API: the page must not re-sort what the API ranked.
    expect(await rows.first().locator("th").textContent()).toContain(expected.items[0]!.plant.scientificName);
    expect(await page.getByTestId("ranking-chart-row").count()).toBe(Math.min(15, expected.items.length));
    expect(await page.getByTestId("ranking-chart").getByTestId("interval-bar").count()).toBe(Math.min(15, expected.items.length));
    expect(await page.getByTestId("filter-summary").textContent()).toContain("queens · north band · early spring");
    // A caption names the table for screen readers (WCAG 2.1 technique H39).
    expect(await page.locator("[data-testid=ranking-table] caption").textContent()).toContain("Forage ranking");
    expect(await page.getByTestId("method-note").textContent()).toContain("Wilson 1927");
    const link = rows.first().getByRole("link");
    expect(await link.getAttribute("href")).toMatch(/^\/checklist\/\d+$/);
    await page.screenshot({ path: path.join(screenshotDir, "forage-ranking-desktop.png"), fullPage: true });

    // The CSV is made in the browser: a header row, then one line per plant, CRLF line ends (RFC 4180 §2.1, §2.3).
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: "Download CSV" }).click()]);
    const csv = await readFile((await download.path())!, "utf8");
    const lines = csv.split("\r\n");
    expect(lines[0]).toMatch(/^rank,scientificName,family,visits,share,/);
    expect(lines.length).toBe(expected.items.length + 2);
    await context.close();
  });

  it("shows the API's own message when the filters are refused", async () => {
    const { context } = await asPlanner(DESKTOP);
    const page = await context.newPage();
    await page.goto(`${baseUrl}/forage/ranking?from=2025&to=2020`);
    // The API contract: errors are { error, fields? } with status 400; the page shows `error`.
    await expect.poll(() => page.getByTestId("forage-error").textContent()).toContain("must not be after to");
    await context.close();
  });

  it("fits the ranking on a 360 px phone as cards", async () => {
    const { context } = await asPlanner(PHONE);
    const page = await context.newPage();
    await page.goto(`${baseUrl}/forage/ranking?caste=queen&band=north`);
    await expect.poll(() => page.getByTestId("ranking-card").count()).toBeGreaterThan(0);
    await page.getByTestId("ranking-chart").waitFor();
    // Nothing wider than the screen: no sideways scrolling of the whole page (WCAG 2.1 SC 1.4.10 reflow at 320 CSS px).
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    await page.screenshot({ path: path.join(screenshotDir, "forage-ranking-360.png"), fullPage: true });
    await page.getByRole("button", { name: "Change" }).click();
    await page.getByLabel("Season window").waitFor();
    await page.screenshot({ path: path.join(screenshotDir, "forage-ranking-filters-360.png") });
    await context.close();
  });

  it("draws the forage matrix as a heat map with a legend, and switches to a sortable table of the same numbers", async () => {
    const { context, cookie } = await asPlanner(DESKTOP);
    const page = await context.newPage();
    await page.goto(`${baseUrl}/forage`);
    expect(await page.title()).toBe("Forage matrix · Visitwort");
    const heatmap = page.getByTestId("forage-heatmap");
    await heatmap.locator("svg").waitFor();
    const matrix = await api<{ cells: { bee: string; plant: string }[] }>(cookie, "/api/forage/matrix?band=all&determination=confirmed");
    const plants = new Set(matrix.cells.map((c) => c.plant));
    const bees = new Set(matrix.cells.map((c) => c.bee));
    // nivo draws one cell per plant × bee (up to the first 40 plants), empty ones included.
    await expect.poll(() => heatmap.locator("[data-testid^='cell.']").count()).toBe(Math.min(40, plants.size) * bees.size);
    expect(await page.getByTestId("heat-legend").locator("li").count()).toBeGreaterThan(1);
    await page.screenshot({ path: path.join(screenshotDir, "forage-matrix-desktop.png"), fullPage: true });

    await page.getByRole("group", { name: "Show as" }).getByRole("link", { name: "Table" }).click();
    await page.waitForURL(/display=table/);
    const table = page.getByTestId("forage-matrix-table");
    await table.locator("caption").waitFor();
    expect(await table.locator("tbody tr").count()).toBe(plants.size);
    // Column headers carry aria-sort (WAI-ARIA 1.2, aria-sort on columnheader): most visits first.
    const totalHeader = table.locator("th", { hasText: "Total" });
    expect(await totalHeader.getAttribute("aria-sort")).toBe("descending");
    await totalHeader.getByRole("button").click();
    await expect.poll(() => totalHeader.getAttribute("aria-sort")).toBe("ascending");
    await page.screenshot({ path: path.join(screenshotDir, "forage-matrix-table-desktop.png"), fullPage: true });

    // The CSV of the view is the table: a header row and one line per plant (RFC 4180 §2.3).
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: "Download CSV" }).click()]);
    const lines = (await readFile((await download.path())!, "utf8")).split("\r\n");
    expect(lines[0]).toMatch(/^plant,.*,total visits$/);
    expect(lines.length).toBe(plants.size + 2);

    // Plants × months for spring, kept in the address so the view can be shared.
    await page.goto(`${baseUrl}/forage?view=plant-month&months=4,5`);
    await heatmap.locator("svg").waitFor();
    expect(await heatmap.locator("svg").textContent()).toContain("Apr");
    expect(await page.getByTestId("filter-summary").textContent()).toContain("Apr, May");
    await context.close();
  });

  it("lets the heat map scroll sideways inside its box on a 360 px phone", async () => {
    const { context } = await asPlanner(PHONE);
    const page = await context.newPage();
    await page.goto(`${baseUrl}/forage`);
    const heatmap = page.getByTestId("forage-heatmap");
    await heatmap.locator("svg").waitFor();
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    expect(await heatmap.evaluate((box) => box.scrollWidth > box.clientWidth)).toBe(true);
    await page.screenshot({ path: path.join(screenshotDir, "forage-matrix-360.png"), fullPage: true });
    await context.close();
  });

  it("shows the season calendar for both bands, with the three windows named in each", async () => {
    for (const [label, options] of [["desktop", DESKTOP], ["360", PHONE]] as const) {
      const { context } = await asPlanner(options);
      const page = await context.newPage();
      await page.goto(`${baseUrl}/season`);
      expect(await page.title()).toBe("Season calendar · Visitwort");
      for (const band of ["north", "south"]) {
        const section = page.getByTestId(`season-band-${band}`);
        await section.waitFor();
        expect(await section.getByTestId("season-window").count()).toBe(3);
        // Windows named in words, not told apart by colour alone (WCAG 2.1 SC 1.4.1).
        const text = await section.textContent();
        for (const name of ["Early spring", "Second wave", "Overwintering"]) expect(text).toContain(name);
      }
      expect(await page.getByRole("heading", { name: "North (42° N and above)" }).count()).toBe(1);
      expect(await page.getByRole("heading", { name: "South (below 42° N)" }).count()).toBe(1);
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(options.viewport.width);
      await page.screenshot({ path: path.join(screenshotDir, `season-${label}.png`), fullPage: true });
      if (label === "desktop") {
        await page.getByRole("button", { name: /Workers, males/ }).click();
        await page.waitForURL(/castes=all/);
        await expect.poll(() => page.getByRole("list", { name: "Bar key" }).locator("li").count()).toBe(4);
        await page.screenshot({ path: path.join(screenshotDir, "season-all-castes-desktop.png"), fullPage: true });
      }
      await context.close();
    }
  });
});
