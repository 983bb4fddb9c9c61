import path from "node:path";
import type { Browser, Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { DEMO_PASSWORD } from "~/db/demo-seed.server";
import { listCaughtMail } from "~/mail/caught-mail.server";
import { screenshotDir, useBrowser } from "./browser";

let browser: Browser;
const baseUrl = inject("baseUrl");
const mailFolder = inject("mailFolder");

useBrowser((launched) => (browser = launched));

/** Waits for the outbox worker to hand a message for `to` to the catcher; returns its link. */
async function linkInMailTo(to: string, linkPath: string): Promise<string> {
  let link: string | undefined;
  await expect
    .poll(
      async () => {
        const mail = (await listCaughtMail(50, mailFolder)).find((m) => m.to.includes(to));
        link = mail?.text.match(new RegExp(`${baseUrl}${linkPath}/[\\w-]+`))?.[0];
        return link;
      },
      { timeout: 15_000, interval: 250 },
    )
    .toBeDefined();
  return link!;
}

async function signIn(page: Page, email: string, password: string) {
  await page.goto(`${baseUrl}/login`);
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect.poll(() => page.getByRole("button", { name: "Sign out" }).count()).toBe(1);
}

describe("joining and resetting a password, by e-mail", () => {
  const invitee = `invitee.${Date.now()}@example.org`;

  it("a coordinator invites a botanist, who joins through the e-mailed link", async () => {
    const coordinator = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(coordinator, "coordinator@demo.visitwort.test", DEMO_PASSWORD);
    await coordinator.goto(`${baseUrl}/admin/users`);
    await coordinator.getByLabel("E-mail address").fill(invitee);
    await coordinator.getByRole("checkbox", { name: "Recorder" }).first().uncheck();
    await coordinator.getByRole("checkbox", { name: "Botanist" }).first().check();
    await coordinator.getByRole("button", { name: "Send the invitation" }).click();
    await expect.poll(() => coordinator.getByRole("status").first().textContent()).toContain(`Invitation sent to ${invitee}`);
    await coordinator.screenshot({ path: path.join(screenshotDir, "people-desktop.png"), fullPage: true });

    const link = await linkInMailTo(invitee, "/invite");
    const page = await browser.newPage({ viewport: { width: 360, height: 740 } });
    await page.goto(link);
    expect(await page.locator("main").textContent()).toContain("Botanist");
    await page.getByLabel("Your name").fill("Fern Okafor-Lind");
    await page.getByLabel("Choose a password").fill("catkins in the rain");
    await page.getByLabel("The password again").fill("catkins in the rain");
    await page.getByRole("button", { name: "Join" }).click();
    await page.waitForURL(/\/account/);
    expect(await page.locator("main").textContent()).toContain("Botanist");

    // The link was for one use.
    await page.goto(link);
    expect(await page.getByRole("heading", { level: 1 }).textContent()).toBe("This invitation cannot be used");
    await page.close();
    await coordinator.close();
  });

  it("the new member resets a forgotten password through the e-mailed link", async () => {
    const page = await browser.newPage({ viewport: { width: 360, height: 740 } });
    await page.goto(`${baseUrl}/forgot-password`);
    await page.getByLabel("E-mail address").fill(invitee);
    await page.getByRole("button", { name: "Send a reset link" }).click();
    await expect.poll(() => page.getByRole("status").first().textContent()).toContain("If an account uses that address");

    const link = await linkInMailTo(invitee, "/reset-password");
    await page.goto(link);
    await page.getByLabel("New password").fill("violets after rain");
    await page.getByLabel("The password again").fill("violets after rain");
    await page.getByRole("button", { name: "Save the new password" }).click();
    await page.waitForURL(/\/login\?reset/);
    await signIn(page, invitee, "violets after rain");
    await page.close();
  });

  it("gives the same answer for an address without an account", async () => {
    const page = await browser.newPage();
    await page.goto(`${baseUrl}/forgot-password`);
    await page.getByLabel("E-mail address").fill("nobody-here@example.org");
    await page.getByRole("button", { name: "Send a reset link" }).click();
    await expect.poll(() => page.getByRole("status").first().textContent()).toContain("If an account uses that address");
    await page.close();
  });
});
