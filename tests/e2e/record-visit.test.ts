import path from "node:path";
import type { Browser } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { DEMO_PASSWORD } from "~/db/demo-seed.server";
import { makeJpegWithExif } from "../support/photos";
import { screenshotDir, useBrowser } from "./browser";

let browser: Browser;
useBrowser((launched) => (browser = launched));
const baseUrl = inject("baseUrl");

describe("recording a visit in the field, on a phone", () => {
  it("fills date and place from the photo, finds the plant from a misspelt name, and lists the visit with its photo", async () => {
    const context = await browser.newContext({ viewport: { width: 360, height: 740 }, deviceScaleFactor: 2, hasTouch: true, isMobile: true });
    const page = await context.newPage();
    await page.goto(`${baseUrl}/login?next=/visits/new`);
    await page.getByLabel("E-mail address").fill("recorder@demo.visitwort.test");
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(`${baseUrl}/visits/new`);
    await page.screenshot({ path: path.join(screenshotDir, "record-visit-empty-360.png") });

    // A photo taken at 43°4'30.5"N 89°24'7.2"W on 27 April 2025 at 09:41 (written with piexifjs).
    const photo = makeJpegWithExif({
      width: 640,
      height: 480,
      pattern: "petals",
      dateTimeOriginal: "2025:04:27 09:41:05",
      gps: { latitude: { degrees: 43, minutes: 4, seconds: 30.5, ref: "N" }, longitude: { degrees: 89, minutes: 24, seconds: 7.2, ref: "W" } },
    });
    await page.locator("input[type=file][data-subject=bee]").setInputFiles({ name: "queen.jpg", mimeType: "image/jpeg", buffer: photo });
    await expect.poll(() => page.getByTestId("photo-draft").textContent(), { timeout: 15_000 }).toContain("Uploaded");
    await page.getByRole("button", { name: /Use this photo’s time and place/ }).click();
    expect(await page.getByLabel("Date and time").inputValue()).toBe("2025-04-27T09:41");
    // 43 + 4/60 + 30.5/3600 = 43.075139; -(89 + 24/60 + 7.2/3600) = -89.402000
    expect(await page.getByLabel("Latitude").inputValue()).toBe("43.075139");
    expect(await page.getByLabel("Longitude").inputValue()).toBe("-89.402000");
    await page.getByLabel("Face").check();

    await page.getByLabel("Species").selectOption({ label: "two-spotted bumble bee — Bombus bimaculatus" });
    await page.getByText("Queen", { exact: true }).click();
    await page.getByText("Probably", { exact: true }).click();
    await page.getByText("Drinking nectar", { exact: true }).click();

    const picker = page.getByRole("combobox", { name: "Plant" });
    await picker.pressSequentially("pusy wilow", { delay: 15 });
    const option = page.getByRole("option", { name: /Salix discolor/ });
    await option.waitFor();
    await page.screenshot({ path: path.join(screenshotDir, "record-visit-picker-360.png") });
    await option.click();
    expect(await picker.inputValue()).toBe("Salix discolor");

    await page.screenshot({ path: path.join(screenshotDir, "record-visit-filled-360.png"), fullPage: true });
    await page.getByRole("button", { name: "Save the visit" }).click();
    await page.waitForURL(/\/visits\/\d+\?recorded/);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toContain("Salix discolor");
    await expect.poll(() => page.getByTestId("visit-photo").evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBe(640);

    await page.goto(`${baseUrl}/visits?sort=eventDate&order=desc&plant=&month=4`);
    const row = page.getByTestId("visit-card").filter({ hasText: "2025-04-27" }).filter({ hasText: "Salix discolor" }).first();
    await row.waitFor();
    await expect.poll(() => row.locator("img").evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth > 0)).toBe(true);
    await page.screenshot({ path: path.join(screenshotDir, "visits-360.png") });
    await context.close();
  });

  it("says what is missing and saves nothing when the form is incomplete", async () => {
    const page = await browser.newPage({ viewport: { width: 360, height: 740 } });
    await page.goto(`${baseUrl}/login?next=/visits/new`);
    await page.getByLabel("E-mail address").fill("recorder@demo.visitwort.test");
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(`${baseUrl}/visits/new`);
    await page.getByRole("button", { name: "Save the visit" }).click();
    await expect.poll(() => page.getByRole("alert").first().textContent()).toContain("Nothing was saved");
    expect(await page.locator("main").textContent()).toContain("Choose the plant, or say you could not identify it");
    expect(new URL(page.url()).pathname).toBe("/visits/new");
    await page.close();
  });
});

describe("POST /api/visits with a personal token", () => {
  it("creates a visit once, however often it is sent", async () => {
    const { signInCookie } = await import("./session");
    const cookie = await signInCookie(baseUrl, "recorder@demo.visitwort.test");
    const form = { Cookie: cookie, "Content-Type": "application/x-www-form-urlencoded", Origin: baseUrl, "Sec-Fetch-Site": "same-origin" };
    const page = await (await fetch(`${baseUrl}/account`, { method: "POST", headers: form, body: new URLSearchParams({ intent: "create-token", label: "field app" }) })).text();
    const token = page.match(/vw_[\w-]+/)![0];
    const body = {
      clientSubmissionId: crypto.randomUUID(),
      eventDate: "2025-05-03T10:15:00-05:00",
      decimalLatitude: 41.6,
      decimalLongitude: -87.9,
      coordinateUncertaintyInMeters: 20,
      beeScientificName: "Bombus griseocollis",
      caste: "queen",
      beeIdentificationConfidence: "certain",
      behavior: "pollen_collecting",
      plantScientificName: "Mertensia virginica",
    };
    const send = () => fetch(`${baseUrl}/api/visits`, { method: "POST", headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/json" }, body: JSON.stringify(body) });
    const first = await send();
    expect(first.status).toBe(201);
    const created = await first.json();
    expect(created).toMatchObject({ scientificName: "Bombus griseocollis", associatedTaxa: '"visited flowers of":"Mertensia virginica"', basisOfRecord: "HumanObservation" });
    const again = await send();
    expect(again.status).toBe(200);
    expect((await again.json()).id).toBe(created.id);

    const bad = await fetch(`${baseUrl}/api/visits`, { method: "POST", headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/json" }, body: JSON.stringify({ ...body, clientSubmissionId: crypto.randomUUID(), decimalLatitude: 123, eventDate: "2999-01-01T00:00:00Z" }) });
    expect(bad.status).toBe(400);
    const refusal = await bad.json();
    expect(refusal.fields.decimalLatitude).toEqual(["Latitude runs from -90 to 90"]);
    expect(refusal.fields.eventDate).toEqual(["The date cannot be in the future"]);
  });
});
