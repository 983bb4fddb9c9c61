import path from "node:path";
import type { Browser, Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { DEMO_PASSWORD } from "~/db/demo-seed.server";
import { screenshotDir, useBrowser } from "./browser";

let browser: Browser;
useBrowser((launched) => (browser = launched));
const baseUrl = inject("baseUrl");

// The e2e database is not emptied between runs: every taxon made here has a name of its own.
const runLetters = String(Date.now())
  .split("")
  .map((digit) => "abcdefghij"[Number(digit)])
  .join("");
/** An invented binomial, unique to this run, that fits the checklist's name pattern (letters only). */
const inventedName = (suffix: string) => `Fictiflora ${runLetters}${suffix}`;

async function signInAsBotanist(page: Page, next: string) {
  await page.goto(`${baseUrl}/login?next=${encodeURIComponent(next)}`);
  await page.getByLabel("E-mail address").fill("botanist@demo.visitwort.test");
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`${baseUrl}${next}`);
}

/** Interaction before React has attached would be lost (a file chosen, a picker typed into). */
async function waitForHydration(page: Page) {
  await page.waitForFunction(() => (window as unknown as { __reactRouterRouteModules?: unknown }).__reactRouterRouteModules);
}

async function fillTaxon(page: Page, scientificName: string) {
  await page.getByLabel("Scientific name").fill(scientificName);
  await page.getByLabel("Authorship").fill("Nemo");
  await page.getByLabel("Family").fill("Fictifloraceae");
  await page.getByLabel("Common names").fill("meadow fictiflower\ninvented bellflower");
  await page.getByLabel("Status").selectOption({ label: "Native" });
  await page.getByLabel("Growth form").selectOption("forb");
  await page.getByLabel("Bloom starts").selectOption({ label: "May" });
  await page.getByLabel("Bloom ends").selectOption({ label: "July" });
  await page.getByLabel("Source").fill("invented for a browser test");
}

async function addTaxon(page: Page, scientificName: string): Promise<number> {
  await page.goto(`${baseUrl}/checklist/new`);
  await fillTaxon(page, scientificName);
  await page.getByRole("button", { name: "Add to the checklist" }).click();
  await page.waitForURL(/\/checklist\/\d+\?added=1$/);
  return Number(new URL(page.url()).pathname.split("/")[2]);
}

describe("keeping the plant checklist, as a botanist on a phone", () => {
  it("says what is missing and saves nothing, then adds the taxon", async () => {
    const page = await browser.newPage({ viewport: { width: 360, height: 740 }, deviceScaleFactor: 2 });
    await signInAsBotanist(page, "/checklist");
    const stewardship = page.getByRole("navigation", { name: "Checklist stewardship" });
    // The URL changes before React has drawn the page that follows sign-in: wait for the links.
    await expect.poll(() => stewardship.getByRole("link").allTextContents()).toEqual(["Add a taxon", "Import", "Export CSV"]);
    await page.screenshot({ path: path.join(screenshotDir, "checklist-steward-links-360.png") });
    await stewardship.getByRole("link", { name: "Add a taxon" }).click();
    await page.waitForURL(`${baseUrl}/checklist/new`);

    await page.getByRole("button", { name: "Add to the checklist" }).click();
    await expect.poll(() => page.getByRole("alert").first().textContent()).toContain("Nothing was saved");
    const main = page.locator("main");
    expect(await main.textContent()).toContain("Needs at least one common name");
    expect(await main.textContent()).toContain("Is required: say where the facts come from");
    expect(new URL(page.url()).pathname).toBe("/checklist/new");
    await page.screenshot({ path: path.join(screenshotDir, "checklist-new-refused-360.png"), fullPage: true });

    const name = inventedName("a");
    await fillTaxon(page, name);
    await page.getByRole("button", { name: "Add to the checklist" }).click();
    await page.waitForURL(/\/checklist\/\d+\?added=1$/);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toContain(name);
    await expect.poll(() => page.getByRole("status").filter({ hasText: "Added to the checklist" }).count()).toBe(1);
    // The genus was left empty: it is the first word of the name.
    expect(await main.textContent()).toContain("GenusFictiflora");
    expect(await page.getByRole("link", { name: "Edit", exact: true }).count()).toBe(1);
    expect(await page.getByRole("link", { name: "Merge", exact: true }).count()).toBe(1);
    await page.screenshot({ path: path.join(screenshotDir, "checklist-taxon-added-360.png"), fullPage: true });
    await page.close();
  });

  it("previews an import file with a bad row, showing its line and reason, and will not write it", async () => {
    const exported = await fetch(`${baseUrl}/checklist/export.csv`);
    expect(exported.headers.get("content-disposition")).toBe('attachment; filename="visitwort-plant-checklist.csv"');
    const header = (await exported.text()).split("\r\n")[0];
    const row = (name: string, bloomEnd: number) =>
      [name, "Nemo", "Fictifloraceae", "Fictiflora", "species", "meadow fictiflower", "", "native", "forb", "5", String(bloomEnd), "invented for a browser test"].join(",");
    // Line 1 the header, line 2 a good row, line 3 a row blooming into a thirteenth month.
    const csv = [header, row(inventedName("b"), 7), row(inventedName("c"), 13)].join("\r\n") + "\r\n";

    const page = await browser.newPage({ viewport: { width: 360, height: 740 }, deviceScaleFactor: 2 });
    await signInAsBotanist(page, "/checklist/import");
    await waitForHydration(page);
    await page.getByLabel(/Checklist file/).setInputFiles({ name: "checklist-with-a-bad-row.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
    const check = page.getByRole("button", { name: "Check the file" });
    await expect.poll(() => check.isEnabled()).toBe(true);
    await check.click();

    const problems = page.getByTestId("import-problems");
    await problems.waitFor();
    // Months run 1–12 (ISO 8601 calendar months 01–12).
    expect(await problems.textContent()).toContain("Line 3: bloomEnd months run 1–12");
    expect(await page.getByTestId("import-preview").textContent()).toContain(inventedName("b"));
    expect(await page.getByRole("button", { name: "Write these changes" }).isDisabled()).toBe(true);
    await page.screenshot({ path: path.join(screenshotDir, "checklist-import-problems-360.png"), fullPage: true });
    await page.setViewportSize({ width: 1280, height: 900 });
    await page.screenshot({ path: path.join(screenshotDir, "checklist-import-problems-desktop.png"), fullPage: true });
    await page.close();

    // Nothing was written: the good row of the refused file is not on the checklist.
    const search = await (await fetch(`${baseUrl}/api/taxa?group=plants`)).json();
    expect(search.taxa.some((t: { scientificName: string }) => t.scientificName === inventedName("b"))).toBe(false);
  });

  it("merges a duplicate into the taxon kept and says what moved", async () => {
    const page = await browser.newPage({ viewport: { width: 360, height: 740 }, deviceScaleFactor: 2 });
    await signInAsBotanist(page, "/checklist");
    const keepName = inventedName("d");
    const duplicateName = inventedName("e");
    const keepId = await addTaxon(page, keepName);
    const duplicateId = await addTaxon(page, duplicateName);

    await page.getByRole("link", { name: "Merge", exact: true }).click();
    await page.waitForURL(`${baseUrl}/checklist/${duplicateId}/edit#merge`);
    await waitForHydration(page);
    const picker = page.getByRole("combobox", { name: "Taxon to keep" });
    await picker.pressSequentially(keepName, { delay: 10 });
    const option = page.getByRole("option", { name: new RegExp(keepName) });
    await option.waitFor();
    await option.click();
    await page.getByLabel(/Merge .* and delete it/).check();
    await page.screenshot({ path: path.join(screenshotDir, "checklist-merge-360.png") });
    await page.getByRole("button", { name: "Merge and delete this taxon" }).click();

    await page.waitForURL(new RegExp(`/checklist/${keepId}\\?merged=`));
    await expect.poll(() => page.getByRole("status").filter({ hasText: `${duplicateName} was merged into this taxon` }).count()).toBe(1);
    expect(await page.locator("main").textContent()).toContain(duplicateName);
    const gone = await fetch(`${baseUrl}/checklist/${duplicateId}`);
    expect(gone.status).toBe(404);
    await page.close();
  });
});
