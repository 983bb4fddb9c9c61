import type { MiddlewareFunction } from "react-router";
import { bearerToken } from "../auth/current-user.server.ts";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Refuses cross-site writes. A browser says where a request comes from (Sec-Fetch-Site, Origin);
 * a write that is not from our own pages is refused before any action runs. Requests that carry
 * a Bearer token are not ambient credentials a foreign page could borrow, so they pass.
 */
export function isCrossSiteWrite(request: Request): boolean {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return false;
  if (bearerToken(request)) return false;
  const site = request.headers.get("Sec-Fetch-Site");
  if (site && site !== "same-origin" && site !== "none") return true;
  const origin = request.headers.get("Origin");
  if (origin) {
    try {
      return new URL(origin).host !== new URL(request.url).host;
    } catch {
      return true;
    }
  }
  // Neither header: no browser of the last years omits both on a form post.
  return !site;
}

export const crossSiteMiddleware: MiddlewareFunction<Response> = async ({ request }, next) => {
  if (isCrossSiteWrite(request)) {
    const message = "This request came from another site and was refused. Reload the page and try again.";
    if (new URL(request.url).pathname.startsWith("/api/")) throw Response.json({ error: message }, { status: 403 });
    throw new Response(message, { status: 403, headers: { "Content-Type": "text/plain; charset=utf-8" } });
  }
  return next();
};

/** Headers every response carries; the document's Content-Security-Policy is set where it is rendered. */
export const securityHeadersMiddleware: MiddlewareFunction<Response> = async (_args, next) => {
  const response = await next();
  const headers = response.headers;
  headers.set("X-Content-Type-Options", "nosniff");
  headers.set("Referrer-Policy", "strict-origin-when-cross-origin");
  headers.set("X-Frame-Options", "DENY");
  headers.set("Cross-Origin-Opener-Policy", "same-origin");
  headers.set("Permissions-Policy", "camera=(self), geolocation=(self), microphone=()");
  return response;
};

/** `photoOrigin`: object storage, which the browser uploads photos to and shows them from. */
export function contentSecurityPolicy(nonce: string, photoOrigin?: string): string {
  const photos = photoOrigin ? ` ${photoOrigin}` : "";
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}'`,
    "style-src 'self' 'unsafe-inline'",
    `img-src 'self' data: blob:${photos}`,
    "font-src 'self'",
    `connect-src 'self'${photos}`,
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}
