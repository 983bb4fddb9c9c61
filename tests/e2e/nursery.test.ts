import { readFileSync } from "node:fs";
import path from "node:path";
import { MikroORM } from "@mikro-orm/postgresql";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import config from "../../mikro-orm.config.ts";
import { databaseUrl } from "~/db/database-url.server";
import { DEMO_PASSWORD } from "~/db/demo-seed.server";
import { STOCK_CSV_COLUMNS } from "~/nursery/stock-schema";
import { DEMO_NURSERY_EMAIL } from "../../scripts/demo/stock";
import { screenshotDir, useBrowser } from "./browser";
import { signInCookie } from "./session";

let browser: Browser;
useBrowser((launched) => (browser = launched));
const baseUrl = inject("baseUrl");

// The e2e database is shared by every browser test, and a later one checks that planners see
// the demo stock: every entry this file adds carries this source region, and is removed
// before and after (a run that failed half-way leaves nothing behind for the next).
const MARK = "Added by the nursery browser test";
let orm: MikroORM;
let nurseryId: number;

const sql = <T extends object>(query: string, params: unknown[] = []) => orm.em.fork().getConnection().execute<T[]>(query, params);
const removeTestStock = () => sql(`delete from stock_item where nursery_id = ? and source_region = ?`, [nurseryId, MARK]);
const stockSnapshot = () => sql(`select id, plant_taxon_id, form, availability, updated_at from stock_item where nursery_id = ? order by id`, [nurseryId]);

beforeAll(async () => {
  orm = await MikroORM.init({ ...config, clientUrl: databaseUrl("e2e"), debug: false });
  const [nursery] = await sql<{ id: number }>(`select id from app_user where email = ?`, [DEMO_NURSERY_EMAIL]);
  nurseryId = nursery!.id;
  await removeTestStock();
});

afterAll(async () => {
  if (!orm) return;
  await removeTestStock();
  await orm.close(true);
});

async function signIn(page: Page, next: string) {
  await page.goto(`${baseUrl}/login?next=${encodeURIComponent(next)}`);
  await page.getByLabel("E-mail address").fill(DEMO_NURSERY_EMAIL);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`${baseUrl}${next}`);
  // Interaction before React has attached would be lost (a picker typed into, a file chosen).
  await page.waitForFunction(() => (window as unknown as { __reactRouterRouteModules?: unknown }).__reactRouterRouteModules);
}

/** The scientific names of the species a band's "What to grow" marks "Not stocked", in its order. */
async function notStocked(page: Page, band: "north" | "south"): Promise<string[]> {
  const items = page.getByTestId(`what-to-grow-${band}`).getByTestId("grow-species").filter({ hasText: "Not stocked" });
  return items.locator("i").allTextContents();
}

const growItem = (page: Page, band: "north" | "south", scientificName: string) =>
  page.getByTestId(`what-to-grow-${band}`).getByTestId("grow-species").filter({ has: page.locator("i", { hasText: scientificName }) });

/** Fills the add form through the plant picker and saves. */
async function addToStock(page: Page, scientificName: string) {
  const picker = page.getByRole("combobox", { name: "Plant" });
  await picker.pressSequentially(scientificName, { delay: 15 });
  await page.getByRole("option", { name: new RegExp(scientificName) }).first().click();
  expect(await picker.inputValue()).toBe(scientificName);
  await page.getByRole("radio", { name: "Plugs" }).check();
  await page.getByLabel("Source region or ecotype").fill(MARK);
  await page.getByRole("radio", { name: "Available now" }).check();
  await page.getByLabel("Availability note").fill("From May");
  await page.getByRole("checkbox", { name: /Grown without systemic insecticides such as neonicotinoids/ }).check();
  await page.getByRole("button", { name: "Save to the stock list" }).click();
  await expect.poll(() => page.getByRole("status").first().textContent()).toBe(`Added ${scientificName} (plugs) to your stock list.`);
}

describe("the demo nursery keeps its stock list", () => {
  it("on a phone: is told what is missing, adds a recommended species through the picker and sees it stocked", async () => {
    const context = await browser.newContext({ viewport: { width: 360, height: 740 }, deviceScaleFactor: 2, hasTouch: true, isMobile: true });
    const page = await context.newPage();
    await signIn(page, "/nursery");
    await page.screenshot({ path: path.join(screenshotDir, "nursery-360.png"), fullPage: true });
    // The cautions of DESIGN.md, on the page where stock is listed.
    const cautions = await page.getByRole("complementary", { name: "Before you list a plant" }).textContent();
    expect(cautions).toContain("systemic insecticides such as neonicotinoids");
    expect(cautions).toContain("noxious-weed and invasive-plant rules");
    expect(cautions).toContain("Prefer seed and parent plants from your own region");
    expect(cautions).toContain("Local regulations and qualified practitioners have the last word");

    // Saved with nothing filled in: refused, each field says what it needs (the brief: 400, not a crash).
    await page.getByRole("button", { name: "Save to the stock list" }).click();
    await expect.poll(() => page.getByRole("alert").first().textContent()).toContain("Nothing was saved");
    const main = page.locator("main");
    expect(await main.textContent()).toContain("Choose the plant from the checklist");
    expect(await main.textContent()).toContain("Choose how the plant is sold: plug, container, seed");

    const [species] = await notStocked(page, "north");
    expect(species, "the demo stock leaves some recommended species unstocked").toBeDefined();
    await addToStock(page, species!);
    const row = page.getByTestId("stock-row").filter({ has: page.locator("i", { hasText: species! }) });
    await expect.poll(() => row.count()).toBe(1);
    // On a phone the columns fold into the plant's cell: words, not colour alone.
    expect(await row.textContent()).toContain("Insecticide-free declaration");
    // "What to grow" says it in words too, with the form stocked.
    await expect.poll(() => growItem(page, "north", species!).getByTestId("stock-state").textContent()).toBe("✓ Stocked: plugs");

    // Nothing sticks out sideways: the page and its sections fit the screen (common practice, no source).
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    expect(await page.locator("main section").evaluateAll((sections) => sections.filter((el) => el.scrollWidth > el.clientWidth).length)).toBe(0);
    await page.screenshot({ path: path.join(screenshotDir, "nursery-added-360.png"), fullPage: true });
    await context.close();
  });

  it("at desktop width: adds a second species, sees it stocked, removes it again and exports the list", async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(page, "/nursery");
    const candidates = [...(await notStocked(page, "south")), ...(await notStocked(page, "north"))];
    const species = candidates[0];
    expect(species, "a second recommended species is unstocked").toBeDefined();
    const band = (await notStocked(page, "south")).includes(species!) ? "south" : "north";
    await addToStock(page, species!);
    await expect.poll(() => growItem(page, band, species!).getByTestId("stock-state").textContent()).toBe("✓ Stocked: plugs");
    const row = page.getByTestId("stock-row").filter({ has: page.locator("i", { hasText: species! }) });
    const cells = (await row.locator("td").allTextContents()).map((cell) => cell.trim());
    expect(cells.slice(0, 4)).toEqual(["Plugs", MARK, "Available now — From May", "✓ Declared"]);
    expect(await page.getByRole("columnheader").allTextContents()).toContain("Insecticide-free declaration");
    await page.screenshot({ path: path.join(screenshotDir, "nursery-1280.png"), fullPage: true });

    // The export is a download of the list in the import's columns, RFC 4180 line ends (§2.1).
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Export CSV" }).click()]);
    expect(download.suggestedFilename()).toBe("visitwort-nursery-stock.csv");
    const exported = readFileSync((await download.path())!, "utf8");
    expect(exported.split("\r\n")[0]).toBe(STOCK_CSV_COLUMNS.join(","));
    expect(exported).toContain(`${species},plug,${MARK},now,From May,yes\r\n`);

    // Removed again through its button: the recommendation shows it unstocked.
    await row.getByRole("button", { name: new RegExp(`^Remove\\W+${species}, plugs$`) }).click();
    await expect.poll(() => page.getByRole("status").first().textContent()).toBe(`Removed ${species} (plugs) from your stock list.`);
    await expect.poll(() => growItem(page, band, species!).getByTestId("stock-state").textContent()).toBe("Not stocked");
    await page.close();
  });

  it("imports a file with one bad row: shows the row's problem and the closest names, and writes nothing", async () => {
    const before = await stockSnapshot();
    const csv = [STOCK_CSV_COLUMNS.join(","), `Zizia aurea,seed,${MARK},now,,yes`, `Monarda fistulosaa,plug,${MARK},now,,yes`].join("\r\n") + "\r\n";
    const page = await browser.newPage({ viewport: { width: 360, height: 740 }, deviceScaleFactor: 2 });
    await signIn(page, "/nursery/import");
    await page.getByLabel(/Stock list file/).setInputFiles({ name: "stock-with-a-bad-row.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
    const check = page.getByRole("button", { name: "Check the file" });
    await expect.poll(() => check.isEnabled()).toBe(true);
    await check.click();

    const problems = page.getByTestId("import-problems");
    await problems.waitFor();
    const text = (await problems.textContent())!.replace(/\s+/g, " ");
    expect(text).toContain("Line 3: scientificName: “Monarda fistulosaa” is not on the plant checklist");
    expect(text).toContain("Did you mean Monarda fistulosa (wild bergamot)");
    expect(await page.getByTestId("import-rows").textContent()).toContain("Zizia aurea");
    expect(await page.getByRole("button", { name: "Write to my stock list" }).isDisabled()).toBe(true);
    await page.screenshot({ path: path.join(screenshotDir, "nursery-import-problems-360.png"), fullPage: true });
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    await page.setViewportSize({ width: 1280, height: 900 });
    await page.screenshot({ path: path.join(screenshotDir, "nursery-import-problems-1280.png"), fullPage: true });
    await page.close();

    // All or nothing: not even the good row was written.
    expect(await stockSnapshot()).toEqual(before);
  });

  it("serves the nursery's own stock as JSON with Darwin Core names", async () => {
    const cookie = await signInCookie(baseUrl, DEMO_NURSERY_EMAIL);
    const response = await fetch(`${baseUrl}/api/nursery/stock`, { headers: { Cookie: cookie } });
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(body.count).toBe(body.stock.length);
    expect(body.count).toBeGreaterThanOrEqual(12);
    // Darwin Core terms: scientificName, taxonID, vernacularName, family (https://dwc.tdwg.org/terms/).
    expect(body.stock[0]).toEqual(expect.objectContaining({ scientificName: expect.any(String), taxonID: expect.stringMatching(/^visitwort:plant:\d+$/), family: expect.any(String), grownWithoutSystemicInsecticides: expect.any(Boolean) }));
  });

  it("takes an entry as JSON through the same schema as the form, and refuses an invasive plant with 400", async () => {
    const cookie = await signInCookie(baseUrl, DEMO_NURSERY_EMAIL);
    const idOf = async (name: string) => (await sql<{ id: number }>(`select id from plant_taxon where scientific_name = ?`, [name]))[0]!.id;
    const native = { id: await idOf("Lonicera dioica") };
    const invasive = { id: await idOf("Lythrum salicaria") };
    const post = (body: unknown) =>
      fetch(`${baseUrl}/api/nursery/stock`, {
        method: "POST",
        headers: { Cookie: cookie, "Content-Type": "application/json", Origin: baseUrl, "Sec-Fetch-Site": "same-origin" },
        body: JSON.stringify(body),
      });
    const entry = { plantTaxonId: native.id, form: "container", sourceRegion: MARK, availability: "season", availabilityNote: "", grownWithoutSystemicInsecticides: true };
    const created = await post(entry);
    expect(created.status).toBe(201);
    expect(await created.json()).toMatchObject({ scientificName: "Lonicera dioica", form: "container", grownWithoutSystemicInsecticides: true });
    // The same plant and form again is an update (200), not a second entry.
    expect((await post({ ...entry, availability: "now" })).status).toBe(200);
    const refused = await post({ ...entry, plantTaxonId: invasive.id });
    expect(refused.status).toBe(400);
    expect((await refused.json()).fields.plantTaxonId[0]).toContain("listed as invasive");
    const listed = (await (await fetch(`${baseUrl}/api/nursery/stock`, { headers: { Cookie: cookie } })).json()).stock;
    expect(listed.filter((e: { scientificName: string }) => e.scientificName === "Lonicera dioica")).toEqual([expect.objectContaining({ availability: "now" })]);
  });
});

describe("the route-access matrix's bare writes, from people allowed to write", () => {
  // tests/e2e/route-access.ts posts these forms; an allowed role must get a refusal or a preview, not a crash.
  it.each([
    [DEMO_NURSERY_EMAIL, "/nursery", { intent: "add" }, 400],
    ["coordinator@demo.visitwort.test", "/nursery", { intent: "add" }, 400],
    [DEMO_NURSERY_EMAIL, "/nursery/import", { intent: "preview", csv: "scientificName\n" }, 200],
    ["coordinator@demo.visitwort.test", "/nursery/import", { intent: "preview", csv: "scientificName\n" }, 200],
  ])("%s posting to %s gets %s", async (email, sample, form, status) => {
    const cookie = await signInCookie(baseUrl, email);
    const response = await fetch(`${baseUrl}${sample}`, {
      method: "POST",
      redirect: "manual",
      headers: { Cookie: cookie, "Content-Type": "application/x-www-form-urlencoded", Origin: baseUrl, "Sec-Fetch-Site": "same-origin" },
      body: new URLSearchParams(form),
    });
    expect(response.status).toBe(status);
    // The preview's problem is on the page the post gets back.
    if (sample === "/nursery/import") expect(await response.text()).toContain("Missing columns: form, sourceRegion");
  });
});
