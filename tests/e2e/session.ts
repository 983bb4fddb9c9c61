import { DEMO_PASSWORD } from "~/db/demo-seed.server";

/** Signs in over HTTP as a browser on our own site would, and returns the session cookie. */
export async function signInCookie(baseUrl: string, email: string, password = DEMO_PASSWORD): Promise<string> {
  const response = await fetch(`${baseUrl}/login`, {
    method: "POST",
    redirect: "manual",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: baseUrl, "Sec-Fetch-Site": "same-origin" },
    body: new URLSearchParams({ email, password, next: "/" }),
  });
  const cookie = response.headers.get("set-cookie");
  if (response.status !== 302 || !cookie) throw new Error(`Sign-in as ${email} failed with ${response.status}`);
  return cookie.split(";")[0]!;
}
