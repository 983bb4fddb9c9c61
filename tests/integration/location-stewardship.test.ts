import type { MikroORM } from "@mikro-orm/postgresql";
import { beforeEach, describe, expect, it } from "vitest";
import { createUser } from "~/auth/accounts.server";
import type { CurrentUser } from "~/auth/current-user.server";
import type { Role } from "~/auth/roles";
import { seedChecklists } from "~/db/seed.server";
import { Site } from "~/entities";
import { createVisit, findVisitForViewer } from "~/visits/visits.server";
import { toVisitRecord } from "~/visits/visit-record.server";
import { visitInput } from "~/visits/visit-schema";
import { useEmptyTestDatabase } from "../support/database";

let orm: MikroORM;
useEmptyTestDatabase((opened) => (orm = opened));

const noPhotos = { check: async () => ({ ok: false as const, reason: "no storage in this test" }) };

async function person(email: string, roles: Role[]): Promise<CurrentUser> {
  const user = await createUser(orm.em.fork(), { email, name: email.split("@")[0]!, password: "a long enough password", roles });
  return { id: user.id, name: user.name, email: user.email, roles, via: "session" };
}

let recorder: CurrentUser;
let others: Record<string, CurrentUser>;

beforeEach(async () => {
  await seedChecklists(orm.em.fork());
  recorder = await person("finder@example.org", ["recorder"]);
  others = {
    coordinator: await person("coordinator@example.org", ["coordinator"]),
    botanist: await person("botanist@example.org", ["botanist"]),
    verifier: await person("verifier@example.org", ["bee_verifier"]),
  };
});

async function recordAndView(bee: string, viewer: CurrentUser, place: { siteId?: number } = {}) {
  const input = visitInput.parse({
    clientSubmissionId: crypto.randomUUID(),
    eventDate: "2025-05-03T09:10:00-05:00",
    ...(place.siteId ? { siteId: place.siteId } : { decimalLatitude: 43.07342, decimalLongitude: -89.40121, coordinateUncertaintyInMeters: 12 }),
    beeScientificName: bee,
    caste: "queen",
    beeIdentificationConfidence: "probable",
    behavior: "nectar_foraging",
    plantScientificName: "Salix discolor",
  });
  const { visit } = await createVisit(orm.em.fork(), recorder.id, input, noPhotos);
  const found = await findVisitForViewer(orm.em.fork(), viewer, visit.id);
  if (!found || found === "forbidden") throw new Error("visit not visible");
  return toVisitRecord(found.visit, found.photos, found.determinations, viewer);
}

describe("the place of a sensitive species' visit", () => {
  it("is exact for its recorder and for coordinators", async () => {
    for (const viewer of [recorder, others.coordinator!]) {
      const record = await recordAndView("Bombus affinis", viewer);
      expect(record).toMatchObject({ decimalLatitude: 43.07342, decimalLongitude: -89.40121, coordinateUncertaintyInMeters: 12, dataGeneralizations: null });
    }
  });

  it("is the centre of its 0.1° cell for botanists and bee verifiers, saying so, with the site withheld", async () => {
    const em = orm.em.fork();
    const site = em.create(Site, { name: "Hidden fen", decimalLatitude: 43.07342, decimalLongitude: -89.40121 });
    await em.flush();
    for (const viewer of [others.botanist!, others.verifier!]) {
      const loose = await recordAndView("Bombus affinis", viewer);
      // Chapman & Grafton 2008 (GBIF): generalise to a grid and record it in dataGeneralizations.
      expect(loose).toMatchObject({ decimalLatitude: 43.05, decimalLongitude: -89.45 });
      // By hand: half a cell is 0.05° × 111.3 km × cos 43.05° = 4.07 km east–west and 5.56 km
      // north–south; centre to corner √(4.07² + 5.56²) = 6.89 km, plus the recorder's 12 m.
      expect(loose.coordinateUncertaintyInMeters).toBeGreaterThan(6890);
      expect(loose.coordinateUncertaintyInMeters).toBeLessThan(7000);
      expect(loose.dataGeneralizations).toMatch(/0\.1° grid cell/);
      const atSite = await recordAndView("Bombus affinis", viewer, { siteId: site.id });
      expect(atSite.site).toBeNull();
      expect(atSite.informationWithheld).toMatch(/Site withheld/);
      expect(JSON.stringify(atSite)).not.toContain("43.07342");
    }
  });

  it("leaves other bees' places exact for everyone who may see the visit", async () => {
    const record = await recordAndView("Bombus impatiens", others.botanist!);
    expect(record).toMatchObject({ decimalLatitude: 43.07342, decimalLongitude: -89.40121, dataGeneralizations: null });
  });
});
