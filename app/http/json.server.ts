import { createHash } from "node:crypto";

/**
 * A JSON response with a strong ETag derived from its body, answering 304 when the client
 * already holds the same version (the picker reloads the checklist only when it changed).
 */
export function jsonWithEtag(request: Request, body: unknown, cacheControl = "public, max-age=0, must-revalidate"): Response {
  const text = JSON.stringify(body);
  const etag = `"${createHash("sha256").update(text).digest("base64url").slice(0, 27)}"`;
  const headers = { ETag: etag, "Cache-Control": cacheControl, Vary: "Accept-Encoding" };
  const presented = request.headers.get("If-None-Match");
  if (presented && presented.split(",").some((tag) => tag.trim().replace(/^W\//, "") === etag)) {
    return new Response(null, { status: 304, headers });
  }
  return new Response(text, { status: 200, headers: { ...headers, "Content-Type": "application/json; charset=utf-8" } });
}

/** The API's error shape: `{ error, fields? }` with a 4xx status. */
export function jsonError(status: number, error: string, fields?: Record<string, string[]>): Response {
  return Response.json(fields ? { error, fields } : { error }, { status });
}
