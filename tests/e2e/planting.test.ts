import { writeFile } from "node:fs/promises";
import path from "node:path";
import { MikroORM } from "@mikro-orm/postgresql";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import config from "../../mikro-orm.config.ts";
import { databaseUrl } from "~/db/database-url.server";
import { PlantTaxon, StockItem, User } from "~/entities";
import { PLANTING_CAUTIONS } from "~/components/PlantingCautions";
import { screenshotDir, useBrowser } from "./browser";
import { signInCookie } from "./session";

let browser: Browser;
useBrowser((launched) => (browser = launched));
const baseUrl = inject("baseUrl");

const DESKTOP = { viewport: { width: 1280, height: 900 } };
const PHONE = { viewport: { width: 360, height: 740 }, deviceScaleFactor: 2, hasTouch: true, isMobile: true };
const PLANNER = "planner@demo.visitwort.test";

async function asPlanner(options: Parameters<Browser["newContext"]>[0]): Promise<{ context: BrowserContext; cookie: string }> {
  const cookie = await signInCookie(baseUrl, PLANNER);
  const [name, ...value] = cookie.split("=");
  const context = await browser.newContext(options);
  await context.addCookies([{ name: name!, value: value.join("="), url: baseUrl }]);
  return { context, cookie };
}

const shot = (page: Page, name: string, fullPage = true) => page.screenshot({ path: path.join(screenshotDir, `${name}.png`), fullPage });
const speciesNames = (page: Page) => page.getByTestId("plan-species").locator("h3").allTextContents();

/** Pages in a PDF: its page objects, "/Type /Page" but not the "/Type /Pages" tree nodes (PDF 1.7, ISO 32000-1 §7.7.3). */
function pdfPageCount(pdf: Buffer): number {
  return pdf.toString("latin1").match(/\/Type\s*\/Page(?![a-zA-Z])/g)?.length ?? 0;
}

const DEMO_NURSERY = { email: "nursery@demo.visitwort.test", name: "Rowan Ashby" };

/**
 * Puts one stock item of the demo nursery on a taxon (unless it already offers the taxon), so
 * the page has a nursery to show; returns the undo. Written straight to the e2e database: the
 * nursery's own pages belong to another part of the app.
 */
async function demoStock(taxonId: number): Promise<() => Promise<void>> {
  const orm = await MikroORM.init({ ...config, clientUrl: databaseUrl("e2e"), debug: false });
  const em = orm.em.fork();
  const nursery = await em.findOneOrFail(User, { email: DEMO_NURSERY.email });
  let createdId: number | null = null;
  if (!(await em.count(StockItem, { nursery, plantTaxon: taxonId }))) {
    const item = em.create(StockItem, {
      nursery,
      plantTaxon: em.getReference(PlantTaxon, taxonId),
      form: "container",
      sourceRegion: "Driftless Area seed",
      availability: "now",
      availabilityNote: "from May",
      grownWithoutSystemicInsecticides: true,
    });
    await em.flush();
    createdId = item.id;
  }
  return async () => {
    if (createdId !== null) await orm.em.fork().nativeDelete(StockItem, { id: createdId });
    await orm.close(true);
  };
}

interface RecommendationBody {
  species: { id: number; scientificName: string; monthsCovered: number[] }[];
  perMonth: { month: number; count: number; met: boolean }[];
  unmet: unknown[];
}

describe("planting lists, for the demo planner", () => {
  it("builds a list for the north band, swaps a species, saves, prints, shares and deletes it", async () => {
    const { context, cookie } = await asPlanner(DESKTOP);
    const api = await fetch(`${baseUrl}/api/planting/recommendation?band=north&months=4-9&minPerMonth=3`, { headers: { Cookie: cookie } });
    expect(api.status).toBe(200);
    const recommendation = (await api.json()) as RecommendationBody;
    expect(recommendation.species.length).toBeGreaterThan(0);
    const undoStock = await demoStock(recommendation.species[0]!.id);
    try {
      const page = await context.newPage();
      const response = await page.goto(`${baseUrl}/planting?band=north`);
      expect(response?.status()).toBe(200);
      expect(await page.title()).toBe("Planting list · Visitwort");

      // The page and the API agree: same species, same order (issue 7, the API's contract).
      expect(await speciesNames(page)).toEqual(recommendation.species.map((s) => s.scientificName));
      // April–September: six month columns in the bloom chart, each with its count (common practice, no source).
      expect(await page.getByTestId("month-count").count()).toBe(6);
      expect(await page.getByTestId("month-count").allTextContents()).toEqual(recommendation.perMonth.map((m) => (m.met ? String(m.count) : expect.stringContaining(String(m.count)))));
      // Every species shows its forage evidence and its nurseries, in words.
      expect(await page.getByTestId("species-evidence").count()).toBe(recommendation.species.length);
      // Who stocks it: the nursery's name, form, availability and its insecticide declaration, in words.
      const stock = (await page.getByTestId("species-stock").first().textContent())!;
      expect(stock).toContain(DEMO_NURSERY.name);
      expect(stock).toMatch(/available now|later in the season/);
      expect(stock).toMatch(/Declared grown without systemic insecticides|No insecticide-free declaration/);
      // The planting cautions of DESIGN.md are on the page.
      const cautions = await page.getByTestId("planting-cautions").textContent();
      for (const caution of PLANTING_CAUTIONS) expect(cautions).toContain(caution);
      await shot(page, "planting-desktop");

      // Swap the last species for the first alternative offered.
      const before = await speciesNames(page);
      const lastCard = page.getByTestId("plan-species").last();
      await lastCard.getByTestId("swap-panel").locator("summary").click();
      const firstAlternative = lastCard.getByTestId("swap-alternative").first();
      const incoming = (await firstAlternative.locator("i").first().textContent())!;
      await shot(page, "planting-swap-open-desktop");
      await firstAlternative.getByRole("link", { name: /Use .* instead of/ }).click();
      await page.waitForURL(/swap=\d+-\d+/);
      await expect.poll(() => speciesNames(page)).toEqual([...before.slice(0, -1), incoming]);
      // A swap keeps every month at the minimum it met (app/planting/swap.ts header): still no short month.
      expect(await page.getByTestId("unmet-months").textContent()).toMatch(/Every month from April to September has at least 3/);
      expect(await page.locator("[data-short=yes]").count()).toBe(0);

      // Save it under a name.
      const name = `North meadow strip ${Date.now()}`;
      await page.getByTestId("save-form").getByLabel("Name").fill(name);
      await page.getByRole("button", { name: "Save as a named list" }).click();
      await page.waitForURL(/\/planting\/lists\/\d+\?saved=1$/);
      const listUrl = page.url().replace(/\?saved=1$/, "");
      const listId = Number(/lists\/(\d+)/.exec(listUrl)![1]);
      await expect.poll(() => page.locator("h1").textContent()).toBe(name);
      expect(await speciesNames(page)).toEqual([...before.slice(0, -1), incoming]);
      expect(await page.getByTestId("planting-cautions").count()).toBe(1);
      await shot(page, "planting-list-desktop");

      // The API and the CSV give the same list.
      const listJson = (await (await fetch(`${baseUrl}/api/planting/lists/${listId}`, { headers: { Cookie: cookie } })).json()) as { name: string; species: { scientificName: string }[] };
      expect(listJson.name).toBe(name);
      expect(listJson.species.map((s) => s.scientificName)).toEqual([...before.slice(0, -1), incoming]);
      const csv = await (await fetch(`${baseUrl}/planting/lists/${listId}/export.csv`, { headers: { Cookie: cookie } })).text();
      // RFC 4180: CRLF-separated records, a header first.
      expect(csv.split("\r\n")[0]).toMatch(/^position,scientificName,vernacularName,family,growthForm,regionalStatus,bloomMonths,earlySpringRank,/);
      expect(csv.split("\r\n").filter(Boolean)).toHaveLength(before.length + 1);
      expect(csv).toContain(`${DEMO_NURSERY.name} (`);

      // The print view: one or two pages of PDF, with the cautions.
      await page.getByRole("link", { name: "Print view" }).click();
      await page.getByTestId("print-sheet").waitFor();
      expect(page.url()).toMatch(/\/print$/);
      expect(await page.getByRole("button", { name: "Print" }).isVisible()).toBe(true);
      const printText = (await page.getByTestId("print-sheet").textContent())!;
      for (const caution of PLANTING_CAUTIONS) expect(printText).toContain(caution);
      expect(await page.getByTestId("print-table").locator("tbody tr").count()).toBe(before.length);
      await shot(page, "planting-print-screen-desktop");
      // Chromium's PDF with the browser's usual margins (common practice, no source).
      const pdf = await page.pdf({ format: "A4", margin: { top: "12mm", bottom: "12mm", left: "12mm", right: "12mm" }, printBackground: true });
      expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
      await writeFile(path.join(screenshotDir, "planting-print.pdf"), pdf);
      const pages = pdfPageCount(pdf);
      expect(pages).toBeGreaterThanOrEqual(1);
      expect(pages).toBeLessThanOrEqual(2);
      // A4 less 12 mm margins is 186 mm, about 703 CSS px: the width the PDF was laid out at.
      await page.setViewportSize({ width: 703, height: 1000 });
      await page.emulateMedia({ media: "print" });
      // In print the site's header and footer and the Print button are left off (Tailwind print: variants).
      expect(await page.locator("body > header").isVisible()).toBe(false);
      expect(await page.locator("body > footer").isVisible()).toBe(false);
      expect(await page.getByRole("button", { name: "Print" }).isVisible()).toBe(false);
      await shot(page, "planting-print-media");
      await page.emulateMedia({ media: "screen" });
      await page.setViewportSize(DESKTOP.viewport);

      // Share it, and read it without an account.
      await page.goto(listUrl);
      await page.getByRole("button", { name: "Create a share link" }).click();
      const shareUrl = await page.getByTestId("share-url").inputValue();
      // 32 random bytes, base64url: 43 characters (RFC 4648 §5), more than the 128 bits asked for.
      expect(shareUrl).toMatch(new RegExp(`^${baseUrl}/planting/shared/[A-Za-z0-9_-]{43}$`));
      const anonymous = await browser.newContext(DESKTOP);
      const reader = await anonymous.newPage();
      expect((await reader.goto(shareUrl))?.status()).toBe(200);
      expect(await reader.locator("h1").textContent()).toBe(name);
      expect(await speciesNames(reader)).toEqual([...before.slice(0, -1), incoming]);
      expect(await reader.getByTestId("swap-panel").count()).toBe(0);
      expect(await reader.locator("main form").count()).toBe(0);
      const sharedText = (await reader.locator("main").textContent())!;
      expect(sharedText).not.toContain(PLANNER);
      expect(sharedText).not.toContain("Ivo Marchetti");
      for (const caution of PLANTING_CAUTIONS) expect(sharedText).toContain(caution);
      await shot(reader, "planting-shared-desktop");
      const phone = await browser.newContext(PHONE);
      const phoneReader = await phone.newPage();
      await phoneReader.goto(shareUrl);
      // WCAG 2.1 SC 1.4.10: no sideways scrolling of the page at phone width.
      expect(await phoneReader.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
      await shot(phoneReader, "planting-shared-360");
      await phone.close();
      // A made-up token, and a well-formed one that was never issued, are both 404 (route-access matrix: "missing").
      expect((await reader.goto(`${baseUrl}/planting/shared/not-a-real-token`))?.status()).toBe(404);
      expect((await reader.goto(`${baseUrl}/planting/shared/${"A".repeat(43)}`))?.status()).toBe(404);

      // Stop sharing: the link goes dead.
      await page.getByRole("button", { name: "Stop sharing" }).click();
      await page.getByRole("button", { name: "Create a share link" }).waitFor();
      expect((await reader.goto(shareUrl))?.status()).toBe(404);
      await anonymous.close();

      // Delete it: gone for everyone.
      await page.locator("summary", { hasText: "Delete this list" }).click();
      await page.getByRole("button", { name: "Delete for good" }).click();
      await page.waitForURL(/\/planting\?deleted=1$/);
      expect((await fetch(`${baseUrl}/api/planting/lists/${listId}`, { headers: { Cookie: cookie } })).status).toBe(404);
    } finally {
      await undoStock();
      await context.close();
    }
  });

  it("answers a bare save with 400 and a message, and bad API parameters with 400 { error, fields }", async () => {
    const cookie = await signInCookie(baseUrl, PLANNER);
    // The route-access matrix posts { intent: "save" } alone; a 5xx is always a bug (DESIGN.md).
    const saved = await fetch(`${baseUrl}/planting`, {
      method: "POST",
      redirect: "manual",
      headers: { Cookie: cookie, "Content-Type": "application/x-www-form-urlencoded", Origin: baseUrl, "Sec-Fetch-Site": "same-origin" },
      body: new URLSearchParams({ intent: "save" }),
    });
    expect(saved.status).toBe(400);
    expect(await saved.text()).toContain("settings were not understood");
    // DESIGN.md, "Interfaces others rely on": errors are { error, fields? } with a 4xx status.
    const bad = await fetch(`${baseUrl}/api/planting/recommendation?band=east&months=11-2`, { headers: { Cookie: cookie } });
    expect(bad.status).toBe(400);
    const body = (await bad.json()) as { error: string; fields: Record<string, string[]> };
    expect(Object.keys(body.fields).sort()).toEqual(["band", "months"]);
    expect(body.error).toMatch(/not understood/);
    const missing = await fetch(`${baseUrl}/api/planting/lists/999999`, { headers: { Cookie: cookie } });
    expect(missing.status).toBe(404);
    expect(await missing.json()).toEqual({ error: "No planting list has this id." });
  });

  it("fits the planting page on a 360 px phone", async () => {
    const { context } = await asPlanner(PHONE);
    const page = await context.newPage();
    await page.goto(`${baseUrl}/planting?band=north`);
    await page.getByTestId("plan-species").first().waitFor();
    // No sideways scrolling of the page (WCAG 2.1 SC 1.4.10 reflow at 320 CSS px).
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    // Targets of at least 44 px for the field (DESIGN.md; WCAG 2.1 SC 2.5.5).
    const save = await page.getByRole("button", { name: "Save as a named list" }).boundingBox();
    expect(save!.height).toBeGreaterThanOrEqual(44);
    await shot(page, "planting-360");
    await page.getByTestId("plan-species").first().getByTestId("swap-panel").locator("summary").click();
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    await page.getByTestId("plan-species").first().screenshot({ path: path.join(screenshotDir, "planting-swap-360.png") });
    await page.goto(`${baseUrl}/planting`);
    await shot(page, "planting-form-360");
    await context.close();
  });
});
