/** A form POST as a browser on our own site sends it (Origin and Sec-Fetch-Site included). */
export function formPost(path: string, fields: Record<string, string | string[]>, headers: Record<string, string> = {}): Request {
  const body = new URLSearchParams();
  for (const [key, value] of Object.entries(fields)) {
    for (const v of Array.isArray(value) ? value : [value]) body.append(key, v);
  }
  return new Request(`http://127.0.0.1:3000${path}`, {
    method: "POST",
    body,
    headers: {
      "Content-Type": "application/x-www-form-urlencoded",
      Origin: "http://127.0.0.1:3000",
      "Sec-Fetch-Site": "same-origin",
      "x-visitwort-client-address": "192.0.2.10",
      ...headers,
    },
  });
}
