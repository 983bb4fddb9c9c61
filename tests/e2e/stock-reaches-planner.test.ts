import type { Browser } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { useBrowser } from "./browser";
import { signInCookie } from "./session";

let browser: Browser;
useBrowser((launched) => (browser = launched));
const baseUrl = inject("baseUrl");

const sameSite = { Origin: baseUrl, "Sec-Fetch-Site": "same-origin", "Content-Type": "application/x-www-form-urlencoded" };

describe("a nursery's stock on the planner's list", () => {
  it("shows the two species a nursery marks as stocked beside them on the planting list", async () => {
    const nursery = await signInCookie(baseUrl, "nursery@demo.visitwort.test");
    const planner = await signInCookie(baseUrl, "planner@demo.visitwort.test");
    // Two species of the north band's default list that the demo nursery does not stock in plugs.
    const recommendation = await (await fetch(`${baseUrl}/api/planting/recommendation?band=north`, { headers: { Cookie: planner } })).json();
    const stockBefore = await (await fetch(`${baseUrl}/api/nursery/stock`, { headers: { Cookie: nursery } })).json();
    const inPlugs = new Set(stockBefore.stock.filter((s: { form: string }) => s.form === "plug").map((s: { plantTaxonId: number }) => s.plantTaxonId));
    const chosen = recommendation.species.filter((s: { id: number }) => !inPlugs.has(s.id)).slice(0, 2) as { id: number; scientificName: string }[];
    expect(chosen).toHaveLength(2);

    const added: number[] = [];
    try {
      for (const species of chosen) {
        const response = await fetch(`${baseUrl}/nursery?index`, {
          method: "POST",
          redirect: "manual",
          headers: { ...sameSite, Cookie: nursery },
          body: new URLSearchParams({
            intent: "add", plantTaxonId: String(species.id), form: "plug", sourceRegion: "Seed from a prairie remnant in the county",
            availability: "now", availabilityNote: "", grownWithoutSystemicInsecticides: "on",
          }),
        });
        expect(response.status).toBeLessThan(400);
      }
      const stockAfter = await (await fetch(`${baseUrl}/api/nursery/stock`, { headers: { Cookie: nursery } })).json();
      for (const species of chosen) {
        const entry = stockAfter.stock.find((s: { plantTaxonId: number; form: string }) => s.plantTaxonId === species.id && s.form === "plug");
        expect(entry, species.scientificName).toBeDefined();
        added.push(entry.id);
      }

      const [name, ...value] = planner.split("=");
      const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
      await context.addCookies([{ name: name!, value: value.join("="), url: baseUrl }]);
      const page = await context.newPage();
      await page.goto(`${baseUrl}/planting?band=north`);
      for (const species of chosen) {
        const card = page.getByTestId("plan-species").filter({ has: page.locator("h3", { hasText: species.scientificName }) });
        await expect.poll(() => card.textContent()).toMatch(/Rowan Ashby: plugs/);
        await expect.poll(() => card.textContent()).toMatch(/Declared grown without systemic insecticides/);
      }
      await context.close();
    } finally {
      for (const id of added) {
        await fetch(`${baseUrl}/nursery?index`, { method: "POST", redirect: "manual", headers: { ...sameSite, Cookie: nursery }, body: new URLSearchParams({ intent: "remove", stockItemId: String(id) }) });
      }
    }
  });
});
