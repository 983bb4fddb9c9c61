import path from "node:path";
import type { Browser, Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from "~/db/demo-seed.server";
import { navigationFor } from "~/auth/navigation";
import { screenshotDir, useBrowser } from "./browser";

let browser: Browser;
const baseUrl = inject("baseUrl");

useBrowser((launched) => (browser = launched));

async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto(`${baseUrl}/login`);
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

const mainNavigation = (page: Page) => page.getByRole("navigation", { name: "Main" }).getByRole("link").allTextContents();

describe("signing in with the demo accounts", () => {
  for (const account of DEMO_ACCOUNTS) {
    it(`${account.roles.join(", ")}: sees the navigation of the role, then signs out`, async () => {
      const page = await browser.newPage({ viewport: { width: 360, height: 740 } });
      await signIn(page, account.email);
      await expect.poll(() => page.getByRole("button", { name: "Sign out" }).count()).toBe(1);
      const expected = navigationFor(account.roles).map((item) => item.label);
      expect(await mainNavigation(page)).toEqual(expected);
      if (account.roles.includes("coordinator")) {
        expect(expected).toContain("People");
        await page.screenshot({ path: path.join(screenshotDir, "signed-in-coordinator-360.png") });
      } else {
        expect(expected).not.toContain("People");
      }
      await page.getByRole("button", { name: "Sign out" }).click();
      await expect.poll(() => page.getByRole("link", { name: "Sign in" }).count()).toBe(1);
      // The session is gone on the server too: the account page sends us to sign in.
      await page.goto(`${baseUrl}/account`);
      expect(new URL(page.url()).pathname).toBe("/login");
      await page.close();
    });
  }

  it("shows a clear message for a wrong password, keeping the address typed", async () => {
    const page = await browser.newPage({ viewport: { width: 360, height: 740 } });
    await signIn(page, "planner@demo.visitwort.test", "not the password");
    await expect.poll(() => page.getByRole("alert").first().textContent()).toContain("do not match");
    expect(await page.getByLabel("E-mail address").inputValue()).toBe("planner@demo.visitwort.test");
    await page.screenshot({ path: path.join(screenshotDir, "sign-in-refused-360.png") });
    await page.close();
  });

  it("returns to the page that asked for sign-in", async () => {
    const page = await browser.newPage();
    await page.goto(`${baseUrl}/account`);
    expect(page.url()).toContain("/login?next=%2Faccount");
    await page.getByLabel("E-mail address").fill("botanist@demo.visitwort.test");
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(`${baseUrl}/account`);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Your account");
    await page.close();
  });
});
