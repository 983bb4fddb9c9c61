import path from "node:path";
import type { Browser, Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { DEMO_PASSWORD } from "~/db/demo-seed.server";
import { listCaughtMail } from "~/mail/caught-mail.server";
import { makeJpegWithExif } from "../support/photos";
import { screenshotDir, useBrowser } from "./browser";
import { signInCookie } from "./session";

let browser: Browser;
useBrowser((launched) => (browser = launched));
const baseUrl = inject("baseUrl");
const mailFolder = inject("mailFolder");

/** Records a visit as the demo recorder through the API, with a plant photo when asked. */
async function recordVisit(cookie: string, fields: Record<string, unknown>, withPlantPhoto = false) {
  const sameSite = { Cookie: cookie, Origin: baseUrl, "Sec-Fetch-Site": "same-origin", "Content-Type": "application/json" };
  const photos: unknown[] = [];
  if (withPlantPhoto) {
    const bytes = makeJpegWithExif({ width: 320, height: 240, pattern: "petals" });
    const ticket = await (await fetch(`${baseUrl}/api/photos/uploads`, { method: "POST", headers: sameSite, body: JSON.stringify({ contentType: "image/jpeg", contentLength: bytes.byteLength, subject: "plant" }) })).json();
    expect((await fetch(ticket.url, { method: "PUT", headers: ticket.headers, body: new Blob([new Uint8Array(bytes)]) })).status).toBe(200);
    photos.push({ key: ticket.key, subject: "plant", views: [] });
  }
  const response = await fetch(`${baseUrl}/api/visits`, {
    method: "POST",
    headers: sameSite,
    body: JSON.stringify({
      clientSubmissionId: crypto.randomUUID(), eventDate: "2025-11-02T11:20:00-06:00", decimalLatitude: 45.04, decimalLongitude: -93.41,
      coordinateUncertaintyInMeters: 25, caste: "queen", beeIdentificationConfidence: "unsure", behavior: "nectar_foraging", photos, ...fields,
    }),
  });
  expect(response.status).toBe(201);
  return (await response.json()).id as number;
}

async function signIn(page: Page, email: string) {
  await page.goto(`${baseUrl}/login`);
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect.poll(() => page.getByRole("button", { name: "Sign out" }).count()).toBe(1);
}

async function historyOf(cookie: string, visitId: number) {
  const visit = await (await fetch(`${baseUrl}/api/visits/${visitId}`, { headers: { Cookie: cookie } })).json();
  return visit as { plantIdentificationVerificationStatus: string; beeIdentificationVerificationStatus: string; plantScientificName: string; scientificName: string; caste: string; determinations: { identifiedBy: string; identificationVerificationStatus: string; scientificName: string }[] };
}

describe("determining plants and bees from the queue", () => {
  it("a botanist confirms one plant by key and corrects an unidentified one; a bee verifier corrects species and caste; the recorder hears of it", async () => {
    const recorderCookie = await signInCookie(baseUrl, "recorder@demo.visitwort.test");
    const proposed = await recordVisit(recorderCookie, { plantScientificName: "Mertensia virginica", beeScientificName: "Bombus impatiens" });
    const unidentified = await recordVisit(recorderCookie, { plantNotIdentified: true, beeScientificName: "Bombus impatiens" }, true);

    const botanist = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(botanist, "botanist@demo.visitwort.test");
    await botanist.goto(`${baseUrl}/determinations?subject=plant&visit=${proposed}`);
    await expect.poll(() => botanist.getByTestId("determiner").textContent()).toContain("Mertensia virginica");
    await botanist.screenshot({ path: path.join(screenshotDir, "determinations-desktop.png") });
    // Keyboard alone: C confirms.
    await botanist.keyboard.press("c");
    await expect.poll(async () => (await historyOf(recorderCookie, proposed)).plantIdentificationVerificationStatus).toBe("confirmed");

    await botanist.goto(`${baseUrl}/determinations?subject=plant&visit=${unidentified}`);
    await expect.poll(() => botanist.getByTestId("determiner").textContent()).toContain("not identified by the recorder");
    await botanist.keyboard.press("r");
    const picker = botanist.getByRole("combobox", { name: "The plant it is" });
    await expect.poll(() => picker.evaluate((el) => el === document.activeElement)).toBe(true);
    await picker.pressSequentially("wild geranim", { delay: 15 });
    // Keyboard alone: the best suggestion is first; Enter takes it, Tab reaches the save button.
    await expect.poll(() => botanist.getByRole("listbox").getByRole("option").first().textContent()).toContain("Geranium maculatum");
    await botanist.keyboard.press("Enter");
    await expect.poll(() => picker.inputValue()).toBe("Geranium maculatum");
    await botanist.keyboard.press("Tab");
    await expect.poll(() => botanist.evaluate(() => document.activeElement?.textContent)).toBe("Save the correction");
    await botanist.keyboard.press("Enter");
    await expect.poll(async () => (await historyOf(recorderCookie, unidentified)).plantScientificName).toBe("Geranium maculatum");

    const verifier = await browser.newPage({ viewport: { width: 360, height: 740 } });
    await signIn(verifier, "beeverifier@demo.visitwort.test");
    await verifier.goto(`${baseUrl}/determinations?subject=bee&visit=${proposed}`);
    await expect.poll(() => verifier.getByTestId("determiner").textContent()).toContain("Bombus impatiens");
    await verifier.getByRole("button", { name: /^Correct/ }).click();
    await verifier.getByLabel("The bee it is").selectOption({ label: "Bombus griseocollis — brown-belted bumble bee" });
    await verifier.getByText("Worker", { exact: true }).click();
    await verifier.screenshot({ path: path.join(screenshotDir, "determinations-bee-360.png"), fullPage: true });
    await verifier.getByRole("button", { name: "Save the correction" }).click();
    await expect.poll(async () => {
      const visit = await historyOf(recorderCookie, proposed);
      return `${visit.scientificName} ${visit.caste} ${visit.beeIdentificationVerificationStatus}`;
    }).toBe("Bombus griseocollis worker corrected");

    // Every determination is in the history, with who.
    const history = (await historyOf(recorderCookie, proposed)).determinations.map((d) => `${d.identificationVerificationStatus} by ${d.identifiedBy}`);
    expect(history).toEqual(["proposed by Wren Halloway", "proposed by Wren Halloway", "confirmed by Sorrel Pike", "corrected by Tamsin Bracken"]);

    // The recorder's notices arrive in the catcher (the outbox worker sends them).
    await expect
      .poll(async () => (await listCaughtMail(200, mailFolder)).filter((m) => m.to.includes("recorder@demo.visitwort.test") && m.text.includes(`/visits/${proposed}`)).length, { timeout: 20_000 })
      .toBe(2);
    const page = await browser.newPage({ viewport: { width: 360, height: 740 } });
    await page.context().addCookies([{ name: recorderCookie.split("=")[0]!, value: recorderCookie.split("=").slice(1).join("="), url: baseUrl }]);
    await page.goto(`${baseUrl}/visits/${proposed}`);
    expect(await page.locator("main").textContent()).toContain("Tamsin Bracken");
    await page.screenshot({ path: path.join(screenshotDir, "visit-history-360.png"), fullPage: true });
    await Promise.all([botanist.close(), verifier.close(), page.close()]);
  });

  it("answers 409 through the API when the visit changed since the caller looked", async () => {
    const recorderCookie = await signInCookie(baseUrl, "recorder@demo.visitwort.test");
    const visitId = await recordVisit(recorderCookie, { plantScientificName: "Zizia aurea", beeScientificName: "Bombus vagans" });
    const botanistCookie = await signInCookie(baseUrl, "botanist@demo.visitwort.test");
    const headers = { Cookie: botanistCookie, Origin: baseUrl, "Sec-Fetch-Site": "same-origin", "Content-Type": "application/json" };
    const { version } = await (await fetch(`${baseUrl}/api/visits/${visitId}`, { headers })).json();
    const first = await fetch(`${baseUrl}/api/visits/${visitId}/determinations`, { method: "POST", headers, body: JSON.stringify({ subject: "plant", action: "confirm", version }) });
    expect(first.status).toBe(201);
    const second = await fetch(`${baseUrl}/api/visits/${visitId}/determinations`, { method: "POST", headers, body: JSON.stringify({ subject: "plant", action: "cannot_be_determined", remarks: "blurred", version }) });
    expect(second.status).toBe(409);
    const body = await second.json();
    expect(body.error).toMatch(/Somebody determined this visit/);
    expect(body.visit.plantIdentificationVerificationStatus).toBe("confirmed");
  });
});
