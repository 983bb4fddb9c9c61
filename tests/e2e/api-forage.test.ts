import { beforeAll, describe, expect, inject, it } from "vitest";
import { signInCookie } from "./session";

const baseUrl = inject("baseUrl");
let cookie: string;

beforeAll(async () => {
  cookie = await signInCookie(baseUrl, "planner@demo.visitwort.test");
});

const get = (path: string, headers: Record<string, string> = { Cookie: cookie }) => fetch(`${baseUrl}${path}`, { headers });

describe("the forage API over the demo programme", () => {
  it("answers the matrix in its documented shape, non-zero cells only", async () => {
    const response = await get("/api/forage/matrix?caste=queen&band=all&determination=any");
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(Object.keys(body).sort()).toEqual(["bees", "cells", "months", "plants"]);
    expect(body.months).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
    expect(body.cells.length).toBeGreaterThan(0);
    for (const cell of body.cells) {
      expect(Object.keys(cell).sort()).toEqual(["bee", "month", "plant", "visits"]);
      expect(cell.visits).toBeGreaterThan(0);
      expect(body.bees).toContain(cell.bee);
      expect(body.plants).toContain(cell.plant);
    }
  });

  it("answers the ranking in its documented shape, ranks 1..n in order of the lower limit", async () => {
    const response = await get("/api/forage/ranking?caste=queen&band=north&window=early-spring&determination=any");
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(Object.keys(body).sort()).toEqual(["items", "totalVisits", "window"]);
    expect(body.window).toMatchObject({ name: "early-spring", band: "north" });
    expect(body.items.length).toBeGreaterThan(0);
    const keys = ["fewRecords", "jacobsD", "plant", "rank", "recorders", "selectionHigh", "selectionLow", "selectionRatio", "share", "sites", "visits", "wilsonHigh", "wilsonLow", "years"];
    body.items.forEach((item: { rank: number; share: number; wilsonLow: number; wilsonHigh: number }, index: number) => {
      expect(Object.keys(item).sort()).toEqual(keys);
      expect(item.rank).toBe(index + 1);
      expect(item.wilsonLow).toBeLessThanOrEqual(item.share);
      expect(item.share).toBeLessThanOrEqual(item.wilsonHigh);
      if (index > 0) expect(body.items[index - 1].wilsonLow).toBeGreaterThanOrEqual(item.wilsonLow);
    });
    expect(body.items.reduce((sum: number, item: { visits: number }) => sum + item.visits, 0)).toBe(body.totalVisits);
  });

  it("answers the season calendar for both bands", async () => {
    const body = await (await get("/api/forage/season")).json();
    expect(body.bands.map((b: { band: string }) => b.band)).toEqual(["north", "south"]);
    expect(body.bands[0].months).toHaveLength(12);
  });

  it("refuses bad parameters with a 400 and a message", async () => {
    for (const path of [
      "/api/forage/ranking?band=east",
      "/api/forage/ranking?window=early-spring&months=4",
      "/api/forage/ranking?months=0",
      "/api/forage/matrix?from=2026&to=2020",
      "/api/forage/matrix?bee=Bombus%20imaginarius",
      "/api/forage/matrix?determination=maybe",
    ]) {
      const response = await get(path);
      expect(response.status, path).toBe(400);
      expect(typeof (await response.json()).error, path).toBe("string");
    }
  });

  it("answers 401 without a session", async () => {
    expect((await get("/api/forage/ranking", {})).status).toBe(401);
  });
});
