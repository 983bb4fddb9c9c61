import { describe, expect, inject, it } from "vitest";

const baseUrl = inject("baseUrl");

describe("GET /api/taxa", () => {
  it("returns the plant checklist with Darwin Core field names and an ETag", async () => {
    const response = await fetch(`${baseUrl}/api/taxa`);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toMatch(/^application\/json/);
    const body = await response.json();
    expect(body.count).toBeGreaterThanOrEqual(150);
    const bloodroot = body.taxa.find((t: { scientificName: string }) => t.scientificName === "Sanguinaria canadensis");
    // Darwin Core terms (TDWG term list): establishmentMeans is native or introduced.
    expect(bloodroot).toMatchObject({ family: "Papaveraceae", taxonRank: "species", establishmentMeans: "native" });
    expect(response.headers.get("etag")).toMatch(/^"[\w-]+"$/);
  });

  it("answers 304 Not Modified when the client holds the same version (RFC 9110 §13.1.2)", async () => {
    const first = await fetch(`${baseUrl}/api/taxa`);
    const etag = first.headers.get("etag")!;
    const second = await fetch(`${baseUrl}/api/taxa`, { headers: { "If-None-Match": etag } });
    expect(second.status).toBe(304);
    expect(await second.text()).toBe("");
  });

  it("returns the bee checklist with the endangered species flagged", async () => {
    const body = await (await fetch(`${baseUrl}/api/taxa?group=bees`)).json();
    expect(body.taxa.find((t: { scientificName: string }) => t.scientificName === "Bombus affinis")?.sensitive).toBe(true);
  });

  it("refuses an unknown group with the API's error shape", async () => {
    const response = await fetch(`${baseUrl}/api/taxa?group=fungi`);
    expect(response.status).toBe(400);
    expect(await response.json()).toEqual({ error: "group must be plants or bees", fields: { group: ["must be plants or bees"] } });
  });
});

describe("GET /api/taxa/search", () => {
  it("ranks a misspelt name like the picker does", async () => {
    const body = await (await fetch(`${baseUrl}/api/taxa/search?q=bloodrot`)).json();
    expect(body.results[0].scientificName).toBe("Sanguinaria canadensis");
  });

  it("refuses an empty query with a 400 and field messages", async () => {
    const response = await fetch(`${baseUrl}/api/taxa/search?q=`);
    expect(response.status).toBe(400);
    expect((await response.json()).fields.q).toBeDefined();
  });
});
