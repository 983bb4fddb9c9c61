import { beforeAll, describe, expect, inject, it } from "vitest";
import routes from "~/routes";
import { hasAnyRole, ROLES, type Role } from "~/auth/roles";
import { DEMO_ACCOUNTS } from "~/db/demo-seed.server";
import { ROUTE_ACCESS, type Access } from "./route-access";
import { signInCookie } from "./session";

const baseUrl = inject("baseUrl");
type Viewer = "anonymous" | Role;
const VIEWERS: Viewer[] = ["anonymous", ...ROLES];
const cookies = new Map<Viewer, string>();

beforeAll(async () => {
  for (const role of ROLES) {
    const account = DEMO_ACCOUNTS.find((a) => a.roles.length === 1 && a.roles[0] === role)!;
    cookies.set(role, await signInCookie(baseUrl, account.email));
  }
});

/** The outcome a viewer should get: a status, and for redirects where they lead. */
function expected(access: Access, viewer: Viewer, api: boolean, okStatus = 200): { status: number; location?: RegExp } {
  const anonymous = viewer === "anonymous";
  const toLogin = api ? { status: 401 } : { status: 302, location: /^\/login\?next=/ };
  switch (access) {
    case "anyone":
      return { status: 200 };
    case "missing":
      return { status: 404 };
    case "redirect":
      return { status: 302 };
    case "anonymous":
      return anonymous ? { status: 200 } : { status: 302 };
    case "signed-in":
      return anonymous ? toLogin : { status: 200 };
    default:
      if (anonymous) return toLogin;
      return hasAnyRole([viewer], access) ? { status: okStatus } : { status: 403 };
  }
}

const request = (path: string, viewer: Viewer, init: RequestInit = {}) =>
  fetch(`${baseUrl}${path}`, {
    redirect: "manual",
    ...init,
    headers: { ...(init.headers as Record<string, string>), ...(cookies.get(viewer) ? { Cookie: cookies.get(viewer)! } : {}) },
  });

describe("route × role matrix", () => {
  it("classifies every route in app/routes.ts", () => {
    const files = routes.map((route) => route.file);
    expect(files.filter((file) => !(file in ROUTE_ACCESS))).toEqual([]);
    expect(Object.keys(ROUTE_ACCESS).filter((file) => !files.includes(file))).toEqual([]);
  });

  for (const [file, { sample, access, okStatus }] of Object.entries(ROUTE_ACCESS)) {
    it(`GET ${sample} (${file}) answers each viewer as classified`, async () => {
      const outcomes: string[] = [];
      const wanted: string[] = [];
      for (const viewer of VIEWERS) {
        const response = await request(sample, viewer);
        const want = expected(access, viewer, sample.startsWith("/api/"), okStatus);
        const location = response.headers.get("location") ?? "";
        outcomes.push(`${viewer}: ${response.status}${want.location && want.location.test(location) ? " →login" : ""}`);
        wanted.push(`${viewer}: ${want.status}${want.location ? " →login" : ""}`);
        if (sample.startsWith("/api/") && response.status >= 400) {
          expect(response.headers.get("content-type"), `${viewer} gets JSON`).toMatch(/json/);
        }
      }
      expect(outcomes).toEqual(wanted);
    });
  }

  for (const [file, { sample, access, write }] of Object.entries(ROUTE_ACCESS)) {
    if (!write || typeof access === "string") continue;
    it(`POST ${sample} (${file}) is refused to viewers without the role`, async () => {
      for (const viewer of VIEWERS) {
        const want = expected(access, viewer, sample.startsWith("/api/"));
        if (want.status === 200) continue;
        const response = await request(sample, viewer, {
          method: "POST",
          headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: baseUrl, "Sec-Fetch-Site": "same-origin" },
          body: new URLSearchParams(write),
        });
        expect(`${viewer}: ${response.status}`).toBe(`${viewer}: ${want.status}`);
      }
    });
  }
});

describe("cross-site writes", () => {
  const actionRoutes = Object.values(ROUTE_ACCESS).filter((r) => r.access !== "missing");
  const tokenCount = async () => {
    const page = await (await request("/account", "coordinator")).text();
    return [...page.matchAll(/name="tokenId"/g)].length;
  };
  const crossSitePost = (sample: string, headers: Record<string, string>) =>
    request(sample, "coordinator", {
      method: "POST",
      headers: { "Content-Type": "application/x-www-form-urlencoded", ...headers },
      body: new URLSearchParams({ intent: "create-token", label: "stolen" }),
    });

  // React Router itself answers 400 when Origin names another site; our middleware answers 403
  // for what it leaves through (Sec-Fetch-Site cross-site, or no provenance at all).
  it.each(actionRoutes.map((r) => r.sample))("POST %s with another site's Origin is refused", async (sample) => {
    const response = await crossSitePost(sample, { Origin: "https://elsewhere.example", "Sec-Fetch-Site": "cross-site" });
    expect([400, 403]).toContain(response.status);
  });

  it.each(actionRoutes.map((r) => r.sample))("POST %s marked cross-site by the browser is refused with 403", async (sample) => {
    const response = await crossSitePost(sample, { "Sec-Fetch-Site": "cross-site" });
    expect(response.status).toBe(403);
  });

  it("refuses a cookie-carrying POST with neither Origin nor Sec-Fetch-Site", async () => {
    expect((await crossSitePost("/account", {})).status).toBe(403);
  });

  it("leaves nothing behind: no token was created by any refused request", async () => {
    const before = await tokenCount();
    await crossSitePost("/account", { Origin: "https://elsewhere.example" });
    await crossSitePost("/account", { "Sec-Fetch-Site": "same-site" });
    await crossSitePost("/account", {});
    expect(await tokenCount()).toBe(before);
  });
});

describe("API tokens", () => {
  it("act with their owner's roles, and stop working when revoked", async () => {
    const cookie = cookies.get("planner")!;
    const form = { Cookie: cookie, "Content-Type": "application/x-www-form-urlencoded", Origin: baseUrl, "Sec-Fetch-Site": "same-origin" };
    const created = await fetch(`${baseUrl}/account`, { method: "POST", headers: form, body: new URLSearchParams({ intent: "create-token", label: "test script" }) });
    const html = await created.text();
    const secret = html.match(/vw_[\w-]+/)?.[0];
    expect(secret, "the new token is shown once").toBeDefined();

    const me = await fetch(`${baseUrl}/api/me`, { headers: { Authorization: `Bearer ${secret}` } });
    expect(me.status).toBe(200);
    expect(await me.json()).toMatchObject({ roles: ["planner"], via: "token" });

    const page = await (await fetch(`${baseUrl}/account`, { headers: { Cookie: cookie } })).text();
    const tokenId = [...page.matchAll(/name="tokenId" value="(\d+)"/g)].at(0)?.[1];
    await fetch(`${baseUrl}/account`, { method: "POST", headers: form, body: new URLSearchParams({ intent: "revoke-token", tokenId: tokenId! }) });
    const after = await fetch(`${baseUrl}/api/me`, { headers: { Authorization: `Bearer ${secret}` } });
    expect(after.status).toBe(401);
  });

  it("refuses an unknown token with 401 JSON", async () => {
    const response = await fetch(`${baseUrl}/api/me`, { headers: { Authorization: "Bearer vw_not-a-token" } });
    expect(response.status).toBe(401);
    expect((await response.json()).error).toMatch(/API token/);
  });
});

describe("security headers", () => {
  it("sends a Content-Security-Policy with a nonce, frame-ancestors and nosniff on pages", async () => {
    const response = await fetch(`${baseUrl}/checklist`);
    const csp = response.headers.get("content-security-policy") ?? "";
    expect(csp).toMatch(/script-src 'self' 'nonce-[\w+/=]+'/);
    expect(csp).toContain("frame-ancestors 'none'");
    expect(response.headers.get("x-content-type-options")).toBe("nosniff");
    expect(response.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
    const nonce = csp.match(/'nonce-([^']+)'/)![1];
    const html = await response.text();
    // Every inline script carries the nonce, or the browser would refuse to run it.
    const scripts = [...html.matchAll(/<script(?![^>]*\bsrc=)([^>]*)>/g)];
    expect(scripts.length).toBeGreaterThan(0);
    for (const [, attributes] of scripts) expect(attributes).toContain(`nonce="${nonce}"`);
  });
});

describe("sign-in throttling over HTTP", () => {
  it("answers the sixth wrong password in a row with 429 and a message saying how long to wait", async () => {
    const email = `throttle.${Date.now()}@example.org`;
    const attempt = () =>
      fetch(`${baseUrl}/login`, {
        method: "POST",
        redirect: "manual",
        headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: baseUrl, "Sec-Fetch-Site": "same-origin" },
        body: new URLSearchParams({ email, password: "wrong password", next: "/" }),
      });
    for (let i = 1; i <= 5; i++) expect((await attempt()).status).toBe(400);
    const sixth = await attempt();
    expect(sixth.status).toBe(429);
    expect(Number(sixth.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(await sixth.text()).toContain("Too many failed sign-ins");
  });
});
