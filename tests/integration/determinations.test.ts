import type { MikroORM } from "@mikro-orm/postgresql";
import { beforeEach, describe, expect, it } from "vitest";
import { createUser } from "~/auth/accounts.server";
import type { CurrentUser } from "~/auth/current-user.server";
import type { Role } from "~/auth/roles";
import { seedChecklists } from "~/db/seed.server";
import { BeeTaxon, Determination, OutboxMessage, PlantTaxon, User, Visit } from "~/entities";
import { determinationInput, determine, DeterminationRefused, listQueue, sendDailyDigests } from "~/determinations/determinations.server";
import { createVisit } from "~/visits/visits.server";
import { visitInput } from "~/visits/visit-schema";
import { useEmptyTestDatabase } from "../support/database";

let orm: MikroORM;
useEmptyTestDatabase((opened) => (orm = opened));

const ORIGIN = "http://127.0.0.1:3000";
const noPhotos = { check: async () => ({ ok: false as const, reason: "no storage in this test" }) };

async function person(email: string, roles: Role[]): Promise<CurrentUser> {
  const user = await createUser(orm.em.fork(), { email, name: email.split("@")[0]!, password: "a long enough password", roles });
  return { id: user.id, name: user.name, email: user.email, roles, via: "session" };
}

let recorder: CurrentUser;
let botanist: CurrentUser;
let verifier: CurrentUser;

beforeEach(async () => {
  await seedChecklists(orm.em.fork());
  recorder = await person("recorder@example.org", ["recorder"]);
  botanist = await person("botanist@example.org", ["botanist"]);
  verifier = await person("verifier@example.org", ["bee_verifier"]);
});

async function recordVisit(plant = "Salix discolor") {
  const input = visitInput.parse({
    clientSubmissionId: crypto.randomUUID(), eventDate: "2025-04-27T09:41:00-05:00", decimalLatitude: 43.07, decimalLongitude: -89.4,
    beeScientificName: "Bombus impatiens", caste: "queen", beeIdentificationConfidence: "probable", behavior: "nectar_foraging", plantScientificName: plant,
  });
  return (await createVisit(orm.em.fork(), recorder.id, input, noPhotos)).visit;
}

const versionOf = async (id: number) => (await orm.em.fork().findOneOrFail(Visit, { id })).version;
const taxonId = async (name: string) => (await orm.em.fork().findOneOrFail(PlantTaxon, { scientificName: name })).id;
const beeId = async (name: string) => (await orm.em.fork().findOneOrFail(BeeTaxon, { scientificName: name })).id;
const input = (values: Record<string, unknown>) => determinationInput.parse(values);

describe("determination history", () => {
  it("appends every action in order, and the visit's status follows the latest row", async () => {
    const visit = await recordVisit();
    await determine(orm.em.fork(), botanist, visit.id, input({ subject: "plant", action: "confirm", version: await versionOf(visit.id) }), ORIGIN);
    await determine(orm.em.fork(), botanist, visit.id, input({ subject: "plant", action: "correct", plantTaxonId: await taxonId("Salix humilis"), version: await versionOf(visit.id), remarks: "Leaves narrower than S. discolor" }), ORIGIN);
    await determine(orm.em.fork(), verifier, visit.id, input({ subject: "bee", action: "correct", beeTaxonId: await beeId("Bombus bimaculatus"), caste: "queen", version: await versionOf(visit.id) }), ORIGIN);
    await determine(orm.em.fork(), verifier, visit.id, input({ subject: "bee", action: "cannot_be_determined", remarks: "Face not visible", version: await versionOf(visit.id) }), ORIGIN);
    await determine(orm.em.fork(), botanist, visit.id, input({ subject: "plant", action: "confirm", version: await versionOf(visit.id) }), ORIGIN);

    const history = await orm.em.fork().find(Determination, { visit: visit.id }, { orderBy: { dateIdentified: "asc", id: "asc" }, populate: ["plantTaxon", "beeTaxon", "identifiedBy"] });
    expect(history.map((d) => `${d.subject} ${d.status} ${d.plantTaxon?.scientificName ?? d.beeTaxon?.scientificName ?? "-"} by ${d.identifiedBy.name}`)).toEqual([
      "plant proposed Salix discolor by recorder",
      "bee proposed Bombus impatiens by recorder",
      "plant confirmed Salix discolor by botanist",
      "plant corrected Salix humilis by botanist",
      "bee corrected Bombus bimaculatus by verifier",
      "bee cannot_be_determined - by verifier",
      "plant confirmed Salix humilis by botanist",
    ]);
    const current = await orm.em.fork().findOneOrFail(Visit, { id: visit.id }, { populate: ["plantTaxon", "beeTaxon"] });
    expect([current.plantTaxon?.scientificName, current.plantStatus]).toEqual(["Salix humilis", "confirmed"]);
    // "Cannot be determined" keeps the last name but says it is not verified.
    expect(current.beeStatus).toBe("cannot_be_determined");
  });

  it("lets only botanists determine plants and only bee verifiers bees", async () => {
    const visit = await recordVisit();
    const wrong = determine(orm.em.fork(), verifier, visit.id, input({ subject: "plant", action: "confirm", version: await versionOf(visit.id) }), ORIGIN);
    await expect(wrong).rejects.toMatchObject({ status: 403 });
    expect(await orm.em.fork().count(Determination, { visit: visit.id })).toBe(2);
  });

  it("needs a reason for 'cannot be determined'", () => {
    const parsed = determinationInput.safeParse({ subject: "plant", action: "cannot_be_determined", version: 1 });
    expect(parsed.error?.issues[0]?.message).toMatch(/Say why/);
  });
});

describe("two determiners at once", () => {
  it("lets exactly one win; the other gets 409 and nothing of theirs is written", async () => {
    const visit = await recordVisit();
    const seen = await versionOf(visit.id);
    const results = await Promise.allSettled([
      determine(orm.em.fork(), botanist, visit.id, input({ subject: "plant", action: "confirm", version: seen }), ORIGIN),
      determine(orm.em.fork(), botanist, visit.id, input({ subject: "plant", action: "correct", plantTaxonId: await taxonId("Salix humilis"), version: seen }), ORIGIN),
    ]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const loser = results.find((r) => r.status === "rejected") as PromiseRejectedResult;
    expect(loser.reason).toBeInstanceOf(DeterminationRefused);
    expect(loser.reason.status).toBe(409);
    expect(await orm.em.fork().count(Determination, { visit: visit.id, subject: "plant" })).toBe(2);
  });

  it("refuses a determination made on a stale version, even one at a time", async () => {
    const visit = await recordVisit();
    const seen = await versionOf(visit.id);
    await determine(orm.em.fork(), botanist, visit.id, input({ subject: "plant", action: "confirm", version: seen }), ORIGIN);
    await expect(determine(orm.em.fork(), verifier, visit.id, input({ subject: "bee", action: "confirm", version: seen }), ORIGIN)).rejects.toMatchObject({ status: 409 });
  });
});

describe("notices to the recorder", () => {
  it("queues an e-mail with a link to the visit for each determination", async () => {
    const visit = await recordVisit();
    await determine(orm.em.fork(), botanist, visit.id, input({ subject: "plant", action: "confirm", version: await versionOf(visit.id) }), ORIGIN);
    const mail = await orm.em.fork().find(OutboxMessage, { template: "determination_notice" });
    expect(mail).toHaveLength(1);
    expect(mail[0]!.toAddress).toBe("recorder@example.org");
    expect(mail[0]!.textBody).toContain(`${ORIGIN}/visits/${visit.id}`);
    expect(mail[0]!.textBody).toContain("botanist confirmed the plant as Salix discolor");
  });

  it("sends one daily digest instead, when the recorder chose it", async () => {
    await orm.em.fork().nativeUpdate(User, { id: recorder.id }, { noticePreference: "daily_digest" });
    const first = await recordVisit();
    const second = await recordVisit("Mertensia virginica");
    await determine(orm.em.fork(), botanist, first.id, input({ subject: "plant", action: "confirm", version: await versionOf(first.id) }), ORIGIN);
    await determine(orm.em.fork(), verifier, second.id, input({ subject: "bee", action: "confirm", version: await versionOf(second.id) }), ORIGIN);
    expect(await orm.em.fork().count(OutboxMessage, { template: "determination_notice" })).toBe(0);

    expect(await sendDailyDigests(orm.em.fork(), ORIGIN, new Date(Date.now() + 1000))).toBe(1);
    const digest = await orm.em.fork().findOneOrFail(OutboxMessage, { template: "daily_digest" });
    expect(digest.subject).toBe("2 visits were looked at today");
    // Not again within the day.
    expect(await sendDailyDigests(orm.em.fork(), ORIGIN, new Date(Date.now() + 3600_000))).toBe(0);
  });
});

describe("the queues", () => {
  it("hold visits whose plant or bee is only proposed, oldest first, and let go of determined ones", async () => {
    const a = await recordVisit();
    const b = await recordVisit("Mertensia virginica");
    expect((await listQueue(orm.em.fork(), "plant", {})).items.map((i) => i.id)).toEqual([a.id, b.id]);
    await determine(orm.em.fork(), botanist, a.id, input({ subject: "plant", action: "confirm", version: await versionOf(a.id) }), ORIGIN);
    expect((await listQueue(orm.em.fork(), "plant", {})).items.map((i) => i.id)).toEqual([b.id]);
    expect((await listQueue(orm.em.fork(), "bee", {})).items.map((i) => i.id)).toEqual([a.id, b.id]);
  });
});
