import path from "node:path";
import { MikroORM } from "@mikro-orm/postgresql";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import config from "../../mikro-orm.config.ts";
import { databaseUrl } from "~/db/database-url.server";
import { DEMO_PASSWORD } from "~/db/demo-seed.server";
import { listSeasonWindows, saveSeasonWindows } from "~/forage/season-windows.server";
import type { SeasonWindow } from "~/forage/seasons";
import { screenshotDir, useBrowser } from "./browser";

let browser: Browser;
useBrowser((launched) => (browser = launched));
const baseUrl = inject("baseUrl");

// The e2e database is shared by every browser test: this file puts back what it changes.
const SURVEY_SITE = "Quarry Ridge Prairie";
const SURVEY_DATE = "2025-05-06";
let orm: MikroORM;
let windowsBefore: SeasonWindow[];

const removeTestSurvey = () =>
  orm.em.getConnection().execute(`delete from floral_count where survey_date = ? and site_id = (select id from site where name = ?)`, [SURVEY_DATE, SURVEY_SITE]);

beforeAll(async () => {
  orm = await MikroORM.init({ ...config, clientUrl: databaseUrl("e2e"), debug: false });
  await removeTestSurvey();
  windowsBefore = await listSeasonWindows(orm.em.fork());
});

afterAll(async () => {
  if (!orm) return;
  await removeTestSurvey();
  const now = await listSeasonWindows(orm.em.fork());
  if (JSON.stringify(now) !== JSON.stringify(windowsBefore)) await saveSeasonWindows(orm.em.fork(), windowsBefore);
  await orm.close(true);
});

async function signIn(page: Page, email: string, next: string) {
  await page.goto(`${baseUrl}/login?next=${encodeURIComponent(next)}`);
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`${baseUrl}${next}`);
}

async function choosePlant(page: Page, label: string, typed: string, option: RegExp) {
  const picker = page.getByRole("combobox", { name: label });
  await picker.pressSequentially(typed, { delay: 15 });
  await page.getByRole("option", { name: option }).first().click();
}

describe("counting flowers on a phone", () => {
  it("records a survey of two plants, keeps what was typed through a refusal, and lists it", async () => {
    const context = await browser.newContext({ viewport: { width: 360, height: 740 }, deviceScaleFactor: 2, hasTouch: true, isMobile: true });
    const page = await context.newPage();
    await signIn(page, "recorder@demo.visitwort.test", "/floral-counts/new");
    await page.screenshot({ path: path.join(screenshotDir, "floral-count-empty-360.png") });

    await page.getByLabel("Site", { exact: true }).selectOption({ label: SURVEY_SITE });
    // The date starts at today (the brief); a fixed past date keeps reruns on the same survey.
    expect(await page.getByLabel("Date of the count").inputValue()).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    await page.getByLabel("Date of the count").fill(SURVEY_DATE);
    await choosePlant(page, "Plant 1", "golden alex", /Zizia aurea/);
    await page.getByLabel("Flowering units of plant 1").fill("140");
    await page.getByRole("button", { name: "Add another plant" }).click();
    // The new row's plant field takes the focus, ready for typing (common practice, no source).
    await expect.poll(() => page.getByRole("combobox", { name: "Plant 2" }).evaluate((el) => el === document.activeElement)).toBe(true);
    await choosePlant(page, "Plant 2", "wild geranium", /Geranium maculatum/);

    // Plant 2's number left out: refused, and nothing typed is lost (the brief).
    await page.getByRole("button", { name: "Save the count" }).click();
    await expect.poll(() => page.getByRole("alert").first().textContent()).toContain("Nothing was saved");
    expect(await page.locator("main").textContent()).toContain("Enter how many flowering units you counted (0 if none were open)");
    expect(await page.getByLabel("Site", { exact: true }).inputValue()).not.toBe("");
    expect(await page.getByLabel("Date of the count").inputValue()).toBe(SURVEY_DATE);
    expect(await page.getByRole("combobox", { name: "Plant 1" }).inputValue()).toBe("Zizia aurea");
    expect(await page.getByRole("combobox", { name: "Plant 2" }).inputValue()).toBe("Geranium maculatum");
    expect(await page.getByLabel("Flowering units of plant 1").inputValue()).toBe("140");
    expect(new URL(page.url()).pathname).toBe("/floral-counts/new");
    await page.screenshot({ path: path.join(screenshotDir, "floral-count-refused-360.png"), fullPage: true });

    await page.getByLabel("Flowering units of plant 2").fill("60");
    await page.screenshot({ path: path.join(screenshotDir, "floral-count-filled-360.png"), fullPage: true });
    await page.getByRole("button", { name: "Save the count" }).click();
    await page.waitForURL(/\/floral-counts\?/);
    await expect.poll(() => page.getByRole("status").first().textContent()).toContain(`Saved the flower count at ${SURVEY_SITE} on ${SURVEY_DATE}: 2 new counts.`);

    const survey = page.getByTestId("survey").filter({ hasText: SURVEY_DATE }).filter({ hasText: SURVEY_SITE });
    const summary = await survey.locator("summary").textContent();
    expect(summary).toContain("2 plants");
    expect(summary).toContain("200 flowering units");
    expect(summary).toContain("Wren Halloway");
    // The survey just saved is opened, its plants largest first.
    const plants = await survey.locator("tbody tr").allTextContents();
    expect(plants.map((row) => row.replace(/\s+/g, " "))).toEqual([expect.stringContaining("Zizia aurea"), expect.stringContaining("Geranium maculatum")]);
    expect(plants[0]).toContain("140");
    await page.screenshot({ path: path.join(screenshotDir, "floral-counts-360.png"), fullPage: true });
    await context.close();
  });

  it("lists the demo surveys at desktop width", async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(page, "botanist@demo.visitwort.test", "/floral-counts");
    await page.getByTestId("survey").first().locator("summary").click();
    await page.screenshot({ path: path.join(screenshotDir, "floral-counts-1280.png") });
    expect(await page.getByTestId("survey").count()).toBeGreaterThan(10);
    await page.close();
  });
});

describe("season windows for the coordinator", () => {
  const northSpringStart = "North (42° N and above), Early spring (queens emerge): first day";

  it("saves a moved start, then refuses an impossible date and keeps it in the field", async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(page, "coordinator@demo.visitwort.test", "/admin/seasons");
    const start = page.getByLabel(northSpringStart);
    const before = windowsBefore.find((w) => w.band === "north" && w.name === "early-spring")!.start;
    expect(await start.inputValue()).toBe(before);
    const moved = before === "04-22" ? "04-23" : "04-22";

    await start.fill(moved);
    await page.getByRole("button", { name: "Save the windows" }).click();
    await expect.poll(() => page.getByRole("status").first().textContent()).toMatch(/Saved\. Every visit was refiled under these windows in \d/);
    expect(await start.inputValue()).toBe(moved);
    const saved = await listSeasonWindows(orm.em.fork());
    expect(saved.find((w) => w.band === "north" && w.name === "early-spring")!.start).toBe(moved);
    await page.screenshot({ path: path.join(screenshotDir, "admin-seasons-saved-1280.png"), fullPage: true });

    await page.reload();
    expect(await page.getByLabel(northSpringStart).inputValue()).toBe(moved);

    // Month 13, day 40: no day of the year (the brief's bad value).
    await page.getByLabel(northSpringStart).fill("13-40");
    await page.getByRole("button", { name: "Save the windows" }).click();
    await expect.poll(() => page.getByRole("alert").first().textContent()).toContain("Nothing was saved");
    expect(await page.getByLabel(northSpringStart).inputValue()).toBe("13-40");
    expect(await page.getByLabel(northSpringStart).getAttribute("aria-invalid")).toBe("true");
    expect(await page.locator("main").textContent()).toContain("Starts: Must be a day of the year written MM-DD, e.g. 04-20");
    // Only the bad date is blamed, not the seasons beside it.
    expect(await page.locator("main [role=alert]").allTextContents()).toEqual(["Nothing was saved. Check the marked date below.", expect.stringContaining("Starts: Must be")]);
    const unchanged = await listSeasonWindows(orm.em.fork());
    expect(unchanged.find((w) => w.band === "north" && w.name === "early-spring")!.start).toBe(moved);
    await page.screenshot({ path: path.join(screenshotDir, "admin-seasons-refused-1280.png"), fullPage: true });

    // Put back what was there, through the page (the shared database; afterAll checks again).
    await page.getByLabel(northSpringStart).fill(before);
    await page.getByRole("button", { name: "Save the windows" }).click();
    await expect.poll(() => page.getByRole("status").first().textContent()).toContain("Saved.");
    expect(await listSeasonWindows(orm.em.fork())).toEqual(windowsBefore);
    await page.close();
  });

  it("fits a phone", async () => {
    const page = await browser.newPage({ viewport: { width: 360, height: 740 } });
    await signIn(page, "coordinator@demo.visitwort.test", "/admin/seasons");
    await page.screenshot({ path: path.join(screenshotDir, "admin-seasons-360.png"), fullPage: true });
    // Nothing sticks out sideways or hides behind a scroll: page and tables fit the screen (common practice, no source).
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    expect(await page.locator("main section").evaluateAll((sections) => sections.filter((el) => el.scrollWidth > el.clientWidth).length)).toBe(0);
    await page.close();
  });
});

describe("the route-access matrix's bare writes, from people allowed to write", () => {
  // tests/e2e/route-access.ts posts these forms; an allowed role must get a refusal, not a crash.
  it.each([
    ["recorder@demo.visitwort.test", "/floral-counts/new", { siteId: "1" }],
    ["botanist@demo.visitwort.test", "/floral-counts/new", { siteId: "1" }],
    ["coordinator@demo.visitwort.test", "/floral-counts/new", { siteId: "1" }],
    ["coordinator@demo.visitwort.test", "/admin/seasons", { intent: "save" }],
  ])("%s posting to %s gets 400", async (email, sample, form) => {
    const { signInCookie } = await import("./session");
    const cookie = await signInCookie(baseUrl, email);
    const response = await fetch(`${baseUrl}${sample}`, {
      method: "POST",
      redirect: "manual",
      headers: { Cookie: cookie, "Content-Type": "application/x-www-form-urlencoded", Origin: baseUrl, "Sec-Fetch-Site": "same-origin" },
      body: new URLSearchParams(form),
    });
    expect(response.status).toBe(400);
  });
});
