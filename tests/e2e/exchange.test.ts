import { readFileSync } from "node:fs";
import path from "node:path";
import { parse } from "csv-parse/sync";
import { strFromU8, unzipSync } from "fflate";
import type { Browser, Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { DEMO_PASSWORD } from "~/db/demo-seed.server";
import { screenshotDir, useBrowser } from "./browser";
import { signInCookie } from "./session";

let browser: Browser;
useBrowser((launched) => (browser = launched));
const baseUrl = inject("baseUrl");

async function signIn(page: Page, email: string, next: string) {
  await page.goto(`${baseUrl}/login?next=${encodeURIComponent(next)}`);
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`${baseUrl}${next}`);
}

/** Clicks a download link and returns the downloaded file's bytes and suggested name. */
async function downloadVia(page: Page, linkName: RegExp) {
  const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: linkName }).click()]);
  const file = await download.path();
  return { name: download.suggestedFilename(), bytes: readFileSync(file) };
}

/** The number of visits the page says the download holds. */
async function shownCount(page: Page): Promise<number> {
  const text = (await page.getByRole("status").first().textContent()) ?? "";
  return Number(/([\d,]+) visits?/.exec(text)![1]!.replace(/,/g, ""));
}

const SENSITIVE = "Bombus affinis";

/** Nothing sticks out sideways on a phone (common practice, no source). */
const pageWidth = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth);

describe("exporting visits", () => {
  it("lets the coordinator choose queens and download both files, with exact places", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, acceptDownloads: true });
    const page = await context.newPage();
    await signIn(page, "coordinator@demo.visitwort.test", "/exchange");
    const everything = await shownCount(page);
    expect(everything).toBeGreaterThan(100);
    await page.screenshot({ path: path.join(screenshotDir, "exchange-coordinator-1280.png"), fullPage: true });

    // Choosing a filter recounts and moves the links, without pressing Apply.
    await page.getByLabel("Caste").selectOption({ label: "Queen" });
    await page.waitForURL(/caste=queen/);
    await expect.poll(() => shownCount(page)).toBeLessThan(everything);
    const queens = await shownCount(page);
    expect(await page.getByRole("link", { name: /spreadsheet/ }).getAttribute("href")).toBe("/exchange/occurrences.csv?caste=queen");

    const csv = await downloadVia(page, /spreadsheet \(CSV\)/);
    expect(csv.name).toMatch(/^visitwort-occurrences-\d{4}-\d{2}-\d{2}\.csv$/);
    const rows: Record<string, string>[] = parse(csv.bytes.toString("utf8"), { columns: true });
    expect(rows).toHaveLength(queens);
    expect(new Set(rows.map((row) => row.caste))).toEqual(new Set(["queen"]));
    // A coordinator's copy: nothing generalised (the rule of app/exchange/generalise.ts).
    expect(rows.filter((row) => row.dataGeneralizations)).toHaveLength(0);

    const zip = await downloadVia(page, /Darwin Core Archive/);
    expect(zip.name).toMatch(/^visitwort-darwin-core-\d{4}-\d{2}-\d{2}\.zip$/);
    const files = unzipSync(new Uint8Array(zip.bytes));
    // REFERENCES.md "Darwin Core": meta.xml beside the data files.
    expect(Object.keys(files).sort()).toEqual(["eml.xml", "meta.xml", "occurrence.txt", "resourcerelationship.txt"]);
    expect(strFromU8(files["occurrence.txt"]!).trimEnd().split("\n")).toHaveLength(queens + 1);
    expect(strFromU8(files["eml.xml"]!)).toContain("selected by caste: queen");
    await page.screenshot({ path: path.join(screenshotDir, "exchange-coordinator-queens-1280.png"), fullPage: true });
    await context.close();
  });

  it("lets the planner download both files on a phone, with sensitive places generalised", async () => {
    const context = await browser.newContext({ viewport: { width: 360, height: 740 }, deviceScaleFactor: 2, hasTouch: true, isMobile: true, acceptDownloads: true });
    const page = await context.newPage();
    await signIn(page, "planner@demo.visitwort.test", "/exchange");
    await page.screenshot({ path: path.join(screenshotDir, "exchange-planner-360.png"), fullPage: true });
    expect(await pageWidth(page)).toBeLessThanOrEqual(360);
    expect(await page.getByRole("status").first().textContent()).toMatch(/generalised in your copy/);
    await page.getByRole("region", { name: "Download" }).screenshot({ path: path.join(screenshotDir, "exchange-planner-download-360.png") });
    const shown = await shownCount(page);

    const csv = await downloadVia(page, /spreadsheet \(CSV\)/);
    const rows: Record<string, string>[] = parse(csv.bytes.toString("utf8"), { columns: true });
    expect(rows).toHaveLength(shown);
    const sensitive = rows.filter((row) => row.scientificName === SENSITIVE);
    expect(sensitive.length).toBeGreaterThan(0);
    for (const row of sensitive) {
      // Chapman 2020, Table 7: 0.1° cells for highly sensitive species; the centre of a cell ends in 5 at the second decimal.
      expect(row.dataGeneralizations).toMatch(/0\.1° grid cell/);
      expect(row.decimalLatitude).toMatch(/^-?\d+\.\d5$/);
      expect(row.locality).toBe("");
    }

    const zip = await downloadVia(page, /Darwin Core Archive/);
    const files = unzipSync(new Uint8Array(zip.bytes));
    const occurrences = strFromU8(files["occurrence.txt"]!).trimEnd().split("\n");
    expect(occurrences).toHaveLength(shown + 1);
    expect(strFromU8(files["eml.xml"]!)).toMatch(/generalised to the centre of a 0\.1° grid cell/);

    // A sensitive bee chosen at a site: none of its visits are given with the site (the page says why).
    const site = (await page.getByLabel("Site").locator("option").nth(1).textContent())!;
    await page.getByLabel("Site").selectOption({ label: site });
    await page.waitForURL(/site=\d+/);
    await expect.poll(() => page.locator("main").textContent()).toContain("With a site chosen, visits of sensitive species are left out");
    await page.screenshot({ path: path.join(screenshotDir, "exchange-planner-site-360.png"), fullPage: true });
    expect(await pageWidth(page)).toBeLessThanOrEqual(360);
    await context.close();
  });

  it("keeps the downloads from people without the planner role, and from nobody signed in", async () => {
    // As tests/e2e/route-access.ts classifies them: planners (and coordinators, who pass every role check).
    const cookie = await signInCookie(baseUrl, "recorder@demo.visitwort.test");
    for (const file of ["/exchange/occurrences.csv", "/exchange/archive.zip"]) {
      expect((await fetch(`${baseUrl}${file}`, { headers: { Cookie: cookie } })).status).toBe(403);
      const anonymous = await fetch(`${baseUrl}${file}`, { redirect: "manual" });
      expect(anonymous.status).toBe(302);
      expect(anonymous.headers.get("location")).toMatch(/^\/login\?next=/);
    }
  });
});
