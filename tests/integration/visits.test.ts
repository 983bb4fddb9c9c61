import type { MikroORM } from "@mikro-orm/postgresql";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { createUser } from "~/auth/accounts.server";
import { seedChecklists } from "~/db/seed.server";
import { Determination, Photo, PlantTaxon, Visit } from "~/entities";
import { startS3Fake, type S3Fake } from "~/storage/s3-fake.server";
import { photoKey, presignPhotoUpload } from "~/storage/s3.server";
import { photoInspector } from "~/storage/photo-inspector.server";
import { createVisit, VisitRefused } from "~/visits/visits.server";
import { visitInput, type VisitInput } from "~/visits/visit-schema";
import { emptyAllTables, openTestOrm } from "../support/database";
import { makeJpegWithExif } from "../support/photos";

let orm: MikroORM;
let fake: S3Fake;
let folder: string;
let recorderId: number;

beforeAll(async () => {
  orm = await openTestOrm();
  folder = mkdtempSync(path.join(os.tmpdir(), "visitwort-visits-s3-"));
  fake = await startS3Fake({ port: 0, directory: folder });
  vi.stubEnv("S3_ENDPOINT", "");
  vi.stubEnv("S3_FAKE_PORT", String(fake.port));
});
afterAll(async () => {
  vi.unstubAllEnvs();
  await fake.close();
  rmSync(folder, { recursive: true, force: true });
  await orm.close(true);
});
beforeEach(async () => {
  await emptyAllTables(orm);
  await seedChecklists(orm.em.fork());
  recorderId = (await createUser(orm.em.fork(), { email: "field@example.org", name: "Field Recorder", password: "a long enough password", roles: ["recorder"] })).id;
});

/** A browser's upload: presign, then PUT the bytes. Returns the key to attach. */
async function uploadAs(userId: number, bytes: Uint8Array, contentType = "image/jpeg") {
  const key = photoKey({ userId });
  const presigned = await presignPhotoUpload({ key, contentType, contentLength: bytes.byteLength });
  const response = await fetch(presigned.url, { method: "PUT", headers: presigned.headers, body: new Blob([bytes as Uint8Array<ArrayBuffer>]) });
  expect(response.status).toBe(200);
  return key;
}

function input(overrides: Record<string, unknown> = {}): VisitInput {
  return visitInput.parse({
    clientSubmissionId: crypto.randomUUID(),
    eventDate: "2025-04-27T09:41:00-05:00",
    eventTimeZone: "America/Chicago",
    decimalLatitude: 43.0731,
    decimalLongitude: -89.4012,
    coordinateUncertaintyInMeters: 15,
    beeScientificName: "Bombus impatiens",
    caste: "queen",
    beeIdentificationConfidence: "probable",
    behavior: "nectar_foraging",
    plantScientificName: "Salix discolor",
    ...overrides,
  });
}

const counts = async () => ({
  visits: await orm.em.fork().count(Visit, {}),
  photos: await orm.em.fork().count(Photo, {}),
  determinations: await orm.em.fork().count(Determination, {}),
});

describe("recording a visit", () => {
  it("stores the visit, its photo and the recorder's proposed determinations of plant and bee", async () => {
    const key = await uploadAs(recorderId, makeJpegWithExif({ width: 64, height: 48 }));
    const { visit, created } = await createVisit(orm.em.fork(), recorderId, input({ photos: [{ key, subject: "bee", views: ["face", "side"] }] }), photoInspector());
    expect(created).toBe(true);
    const stored = await orm.em.fork().findOneOrFail(Visit, { id: visit.id }, { populate: ["plantTaxon", "beeTaxon"] });
    expect(stored.plantTaxon?.scientificName).toBe("Salix discolor");
    expect(stored.beeTaxon?.scientificName).toBe("Bombus impatiens");
    expect([stored.plantStatus, stored.beeStatus]).toEqual(["proposed", "proposed"]);
    // The local wall-clock date, not the UTC one (Darwin Core eventDate keeps the offset).
    expect(String(stored.eventLocalDate)).toBe("2025-04-27");
    const photo = await orm.em.fork().findOneOrFail(Photo, { visit: visit.id });
    expect(photo).toMatchObject({ subject: "bee", contentType: "image/jpeg", views: ["face", "side"] });
    expect(await counts()).toEqual({ visits: 1, photos: 1, determinations: 2 });
  });

  it("makes one visit of the same submission sent twice", async () => {
    const submission = input();
    const first = await createVisit(orm.em.fork(), recorderId, submission, photoInspector());
    const second = await createVisit(orm.em.fork(), recorderId, submission, photoInspector());
    expect(second).toMatchObject({ created: false });
    expect(second.visit.id).toBe(first.visit.id);
    expect((await counts()).visits).toBe(1);
  });

  it("makes one visit of the same submission sent twice at the same moment", async () => {
    const submission = input();
    const [a, b] = await Promise.all([
      createVisit(orm.em.fork(), recorderId, submission, photoInspector()),
      createVisit(orm.em.fork(), recorderId, submission, photoInspector()),
    ]);
    expect(a.visit.id).toBe(b.visit.id);
    expect((await counts()).visits).toBe(1);
  });

  it("accepts the plant by an old synonym", async () => {
    const { visit } = await createVisit(orm.em.fork(), recorderId, input({ plantScientificName: "Aster novae-angliae" }), photoInspector());
    const stored = await orm.em.fork().findOneOrFail(Visit, { id: visit.id }, { populate: ["plantTaxon"] });
    expect(stored.plantTaxon?.scientificName).toBe("Symphyotrichum novae-angliae");
  });
});

describe("refusals write nothing", () => {
  async function refusal(promise: Promise<unknown>) {
    const error = await promise.catch((e) => e);
    expect(error).toBeInstanceOf(VisitRefused);
    expect(await counts()).toEqual({ visits: 0, photos: 0, determinations: 0 });
    return (error as VisitRefused).fields;
  }

  it("refuses a file that claims to be a JPEG but is text (type read from its first bytes)", async () => {
    const key = await uploadAs(recorderId, new TextEncoder().encode("this is not a photo at all"), "image/jpeg");
    const fields = await refusal(createVisit(orm.em.fork(), recorderId, input({ photos: [{ key, subject: "plant" }] }), photoInspector()));
    expect(fields.photos?.[0]).toMatch(/not a JPEG, PNG, WebP or HEIC photo/);
  });

  it("refuses a 21 MB photo", async () => {
    // JPEG magic bytes (ITU T.81: SOI FF D8, then an APP0 marker FF E0), then 21 MiB of zeros.
    const big = new Uint8Array(21 * 1024 * 1024);
    big.set([0xff, 0xd8, 0xff, 0xe0]);
    const key = photoKey({ userId: recorderId });
    // Presigning refuses the declared size up front; a client that lies about the size is
    // caught after upload: presign with the limit raised, as such a client would get around it.
    const presigned = await presignPhotoUpload({ key, contentType: "image/jpeg", contentLength: big.byteLength, maxBytes: 64 * 1024 * 1024 });
    await fetch(presigned.url, { method: "PUT", headers: presigned.headers, body: new Blob([big]) });
    const fields = await refusal(createVisit(orm.em.fork(), recorderId, input({ photos: [{ key, subject: "bee" }] }), photoInspector()));
    expect(fields.photos?.[0]).toMatch(/21\.0 MB; photos may be at most 20 MB/);
  });

  it("refuses a photo that never arrived", async () => {
    const key = photoKey({ userId: recorderId });
    const fields = await refusal(createVisit(orm.em.fork(), recorderId, input({ photos: [{ key, subject: "bee" }] }), photoInspector()));
    expect(fields.photos?.[0]).toMatch(/did not arrive/);
  });

  it("refuses a photo uploaded by somebody else", async () => {
    const key = await uploadAs(recorderId + 1000, makeJpegWithExif());
    const fields = await refusal(createVisit(orm.em.fork(), recorderId, input({ photos: [{ key, subject: "bee" }] }), photoInspector()));
    expect(fields.photos?.[0]).toMatch(/not uploaded by you/);
  });

  it("refuses an unknown plant name", async () => {
    const fields = await refusal(createVisit(orm.em.fork(), recorderId, input({ plantScientificName: "Plantago imaginaria" }), photoInspector()));
    expect(fields.plantScientificName?.[0]).toMatch(/No plant on the checklist/);
  });

  it("cannot even be asked to record an unidentified plant without a plant photo", () => {
    const parsed = visitInput.safeParse({ ...input(), plantScientificName: undefined, plantNotIdentified: true, photos: [] });
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues.map((i) => i.message)).toContain("Add at least one photo of the plant, so a botanist can identify it");
  });

  it("keeps a plant taxon's visits: a taxon in use cannot be deleted", async () => {
    await createVisit(orm.em.fork(), recorderId, input(), photoInspector());
    const salix = await orm.em.fork().findOneOrFail(PlantTaxon, { scientificName: "Salix discolor" });
    await expect(orm.em.fork().nativeDelete(PlantTaxon, { id: salix.id })).rejects.toThrow(/foreign key/);
  });
});
