import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import type { MikroORM } from "@mikro-orm/postgresql";
import { parse } from "csv-parse/sync";
import { strFromU8, unzipSync } from "fflate";
import { RouterContextProvider } from "react-router";
import { beforeEach, describe, expect, it } from "vitest";
import { createUser } from "~/auth/accounts.server";
import { currentUserContext, type CurrentUser } from "~/auth/current-user.server";
import type { Role } from "~/auth/roles";
import { entityManagerContext } from "~/db/orm.server";
import { seedChecklists } from "~/db/seed.server";
import { determinationInput, determine } from "~/determinations/determinations.server";
import { Site } from "~/entities";
import { OCCURRENCE_TERMS, RELATIONSHIP_TERMS } from "~/exchange/darwin-core";
import { loader as archiveLoader } from "~/routes/exchange/archive";
import { loader as csvLoader } from "~/routes/exchange/occurrences";
import { createVisit } from "~/visits/visits.server";
import { visitInput } from "~/visits/visit-schema";
import { useEmptyTestDatabase } from "../support/database";

let orm: MikroORM;
useEmptyTestDatabase((opened) => (orm = opened));

// Photo storage is not under test: every uploaded object is taken for a JPEG.
const acceptingStorage = { check: async () => ({ ok: true as const, size: 2048, contentType: "image/jpeg" }) };

async function person(email: string, name: string, roles: Role[]): Promise<CurrentUser> {
  const user = await createUser(orm.em.fork(), { email, name, password: "a long enough password", roles });
  return { id: user.id, name: user.name, email: user.email, roles, via: "session" };
}

/** Calls a download route's loader as a signed-in request would, and returns its response. */
async function download(loader: typeof archiveLoader | typeof csvLoader, viewer: CurrentUser, path: string): Promise<Response> {
  const context = new RouterContextProvider();
  context.set(entityManagerContext, orm.em.fork());
  context.set(currentUserContext, viewer);
  const request = new Request(new URL(path, "http://visitwort.test"));
  return (await loader({ request, context, params: {} } as never)) as Response;
}

const bytesOf = async (response: Response) => new Uint8Array(await response.arrayBuffer());

/** The archive's files as text, by name. */
async function archiveOf(viewer: CurrentUser, query = "") {
  const response = await download(archiveLoader, viewer, `/exchange/archive.zip${query}`);
  expect(response.status).toBe(200);
  const files = unzipSync(await bytesOf(response));
  return { response, files: Object.fromEntries(Object.entries(files).map(([name, data]) => [name, strFromU8(data)])) };
}

const tsvRows = (text: string) => text.split("\n").filter(Boolean).map((line) => line.split("\t"));

// The exact place of the sensitive bee's visits, and the site there; neither may leave for a planner.
const SECRET = { decimalLatitude: 43.07342, decimalLongitude: -89.40121 };
const SECRET_SITE = "Hidden Tamarack Fen";

let coordinator: CurrentUser;
let planner: CurrentUser;
let recorder: CurrentUser;

async function record(bee: string, options: { plant?: string; siteId?: number; caste?: string; place?: { decimalLatitude: number; decimalLongitude: number } } = {}) {
  const input = visitInput.parse({
    clientSubmissionId: crypto.randomUUID(),
    eventDate: "2025-05-03T09:10:00-05:00",
    eventTimeZone: "America/Chicago",
    ...(options.siteId ? { siteId: options.siteId } : { ...(options.place ?? { decimalLatitude: 42.51234, decimalLongitude: -88.61234 }), coordinateUncertaintyInMeters: 12 }),
    beeScientificName: bee,
    caste: options.caste ?? "queen",
    beeIdentificationConfidence: "probable",
    behavior: "nectar_foraging",
    ...(options.plant === undefined
      ? { plantScientificName: "Salix discolor" }
      : options.plant
        ? { plantScientificName: options.plant }
        : { plantNotIdentified: true, photos: [{ key: `visits/u${recorder.id}/${crypto.randomUUID()}.bin`, subject: "plant" }] }),
  });
  return (await createVisit(orm.em.fork(), recorder.id, input, acceptingStorage)).visit;
}

describe("the Darwin Core export", () => {
  let siteId: number;
  let openSiteId: number;
  let visitIds: number[];

  beforeEach(async () => {
    await seedChecklists(orm.em.fork());
    coordinator = await person("coordinator@example.org", "Juniper Vale", ["coordinator"]);
    planner = await person("planner@example.org", "Ivo Marchetti", ["planner"]);
    recorder = await person("recorder@example.org", "Odile Fenwick", ["recorder"]);
    const verifier = await person("verifier@example.org", "Tamsin Bracken", ["bee_verifier"]);
    const em = orm.em.fork();
    const site = em.create(Site, { name: SECRET_SITE, ...SECRET, isoRegionCode: "US-WI" });
    const open = em.create(Site, { name: "Quarry Ridge Prairie", decimalLatitude: 41.2235, decimalLongitude: -83.6644, isoRegionCode: "US-OH" });
    await em.flush();
    siteId = site.id;
    openSiteId = open.id;
    const affinisAtSite = await record("Bombus affinis", { siteId });
    const affinisInField = await record("Bombus affinis", { place: SECRET });
    const impatiens = await record("Bombus impatiens", { siteId: openSiteId, caste: "worker" });
    const unsure = await record("Bombus sp.", { plant: "" });
    // First reported as B. affinis, then corrected: its first report's place stays protected.
    const corrected = await record("Bombus affinis", { place: { decimalLatitude: 44.35711, decimalLongitude: -89.81127 } });
    const beeId = (name: string) => orm.em.getConnection().execute<{ id: number }[]>(`select id from bee_taxon where scientific_name = ?`, [name]).then((rows) => rows[0]!.id);
    await determine(
      orm.em.fork(),
      verifier,
      corrected.id,
      determinationInput.parse({ subject: "bee", action: "correct", beeTaxonId: await beeId("Bombus bimaculatus"), caste: "queen", version: corrected.version }),
      "http://visitwort.test",
    );
    visitIds = [affinisAtSite.id, affinisInField.id, impatiens.id, unsure.id, corrected.id];
  });

  it("packs meta.xml, eml.xml, occurrence.txt and resourcerelationship.txt, whose columns meta.xml numbers", async () => {
    const { response, files } = await archiveOf(planner);
    // REFERENCES.md "Darwin Core": the metafile is named meta.xml (the archive's other names are ours).
    expect(Object.keys(files).sort()).toEqual(["eml.xml", "meta.xml", "occurrence.txt", "resourcerelationship.txt"]);
    expect(response.headers.get("content-type")).toBe("application/zip");
    expect(response.headers.get("content-disposition")).toMatch(/^attachment; filename="visitwort-darwin-core-\d{4}-\d{2}-\d{2}\.zip"$/);

    const meta = files["meta.xml"]!;
    for (const [tag, file] of [["core", "occurrence.txt"], ["extension", "resourcerelationship.txt"]] as const) {
      const block = new RegExp(`<${tag} [\\s\\S]*?</${tag}>`).exec(meta)![0];
      expect(block).toContain(`<location>${file}</location>`);
      const fields = [...block.matchAll(/<field index="(\d+)" term="http:\/\/rs\.tdwg\.org\/dwc\/terms\/(\w+)"\/>/g)].map((m) => [Number(m[1]), m[2]] as const);
      const header = tsvRows(files[file]!)[0]!;
      // Darwin Core text guide: index = the column's position, from 0 (from memory).
      expect(fields).toEqual(header.map((term, index) => [index, term]));
    }

    const occurrences = tsvRows(files["occurrence.txt"]!);
    expect(occurrences[0]).toEqual([...OCCURRENCE_TERMS]);
    // One occurrence per visit, each with every column (common practice, no source).
    expect(occurrences.slice(1).map((row) => row[0]).sort()).toEqual(visitIds.map((id) => `visitwort:visit:${id}`).sort());
    for (const row of occurrences) expect(row).toHaveLength(OCCURRENCE_TERMS.length);

    const relationships = tsvRows(files["resourcerelationship.txt"]!);
    expect(relationships[0]).toEqual([...RELATIONSHIP_TERMS]);
    // Every visit with a plant has one, pointing at a core row; the "not identified" plant has none.
    expect(relationships).toHaveLength(1 + visitIds.length - 1);
    const ids = new Set(occurrences.slice(1).map((row) => row[0]));
    for (const row of relationships.slice(1)) {
      expect(ids).toContain(row[0]);
      // REFERENCES.md "Relations Ontology": RO_0002622 "visits flowers of".
      expect(row.slice(2, 5)).toEqual(["http://purl.obolibrary.org/obo/RO_0002622", "visits flowers of", "Salix discolor"]);
    }
    expect(files["eml.xml"]).toContain(`${visitIds.length} occurrences and ${visitIds.length - 1} relationships`);
  });

  it("generalises every sensitive visit for a planner: no exact coordinate or secret site anywhere in the zip or the CSV", async () => {
    const { files } = await archiveOf(planner);
    const csv = await (await download(csvLoader, planner, "/exchange/occurrences.csv")).text();
    for (const text of [...Object.values(files), csv]) {
      expect(text).not.toContain(String(SECRET.decimalLatitude));
      expect(text).not.toContain(String(SECRET.decimalLongitude));
      expect(text).not.toContain(SECRET_SITE);
      // The corrected visit: once B. affinis, so still protected (isSensitiveVisit).
      expect(text).not.toContain("44.35711");
    }
    const rows: Record<string, string>[] = parse(csv, { columns: true });
    expect(rows).toHaveLength(visitIds.length);
    const generalised = rows.filter((row) => row.dataGeneralizations);
    expect(generalised).toHaveLength(3);
    // Chapman 2020, Table 7: 0.1° for highly sensitive species; the cell of 43.07342, −89.40121 has its centre at 43.05, −89.45.
    expect(generalised.filter((row) => row.decimalLatitude === "43.05" && row.decimalLongitude === "-89.45")).toHaveLength(2);
    for (const row of generalised) expect(row.informationWithheld).toMatch(/withheld/);
    const open = rows.find((row) => row.scientificName === "Bombus impatiens")!;
    expect(open).toMatchObject({ locality: "Quarry Ridge Prairie", decimalLatitude: "41.2235", dataGeneralizations: "", countryCode: "US" });
    expect(files["eml.xml"]).toMatch(/generalised to the centre of a 0\.1° grid cell/);
  });

  it("gives a coordinator the exact places and the site", async () => {
    const { files } = await archiveOf(coordinator);
    const csv = await (await download(csvLoader, coordinator, "/exchange/occurrences.csv")).text();
    for (const text of [files["occurrence.txt"]!, csv]) {
      expect(text).toContain(`${SECRET.decimalLatitude}`);
      expect(text).toContain(`${SECRET.decimalLongitude}`);
      expect(text).toContain(SECRET_SITE);
      expect(text).toContain("44.35711");
    }
    const rows: Record<string, string>[] = parse(csv, { columns: true });
    expect(rows.every((row) => row.dataGeneralizations === "")).toBe(true);
    expect(files["eml.xml"]).toMatch(/Coordinates are exact/);
  });

  it("names the bee's latest determination and the plant's, and an unsure bee by its genus", async () => {
    const rows: Record<string, string>[] = parse(await (await download(csvLoader, coordinator, "/exchange/occurrences.csv")).text(), { columns: true });
    const corrected = rows.find((row) => row.occurrenceID === `visitwort:visit:${visitIds[4]}`)!;
    expect(corrected).toMatchObject({ scientificName: "Bombus bimaculatus", identifiedBy: "Tamsin Bracken", identificationVerificationStatus: "corrected", eventDate: "2025-05-03T09:10:00-05:00" });
    const unsure = rows.find((row) => row.occurrenceID === `visitwort:visit:${visitIds[3]}`)!;
    // REFERENCES.md "Darwin Core": scientificName without qualifiers.
    expect(unsure).toMatchObject({ scientificName: "Bombus", taxonRank: "genus", associatedTaxa: "", identifiedBy: "Odile Fenwick" });
    const { files } = await archiveOf(coordinator);
    const relation = tsvRows(files["resourcerelationship.txt"]!).find((row) => row[0] === `visitwort:visit:${visitIds[0]}`)!;
    expect(relation[5]).toBe("Odile Fenwick");
    expect(relation[7]).toMatch(/^Plant determination: proposed/);
  });

  it("exports only the visits the filters choose, and keeps a site's sensitive visits from a planner", async () => {
    const workers: Record<string, string>[] = parse(await (await download(csvLoader, planner, "/exchange/occurrences.csv?caste=worker")).text(), { columns: true });
    expect(workers.map((row) => row.scientificName)).toEqual(["Bombus impatiens"]);
    // A site filter would pin a generalised record to its site (Chapman 2020: nothing else in the record may undo it).
    const atSecret = await (await download(csvLoader, planner, `/exchange/occurrences.csv?site=${siteId}`)).text();
    expect(parse(atSecret, { columns: true })).toHaveLength(0);
    const forCoordinator = await (await download(csvLoader, coordinator, `/exchange/occurrences.csv?site=${siteId}`)).text();
    expect(parse(forCoordinator, { columns: true })).toHaveLength(1);
    const { files } = await archiveOf(planner, "?plant=not_identified");
    expect(tsvRows(files["occurrence.txt"]!)).toHaveLength(2);
    expect(tsvRows(files["resourcerelationship.txt"]!)).toHaveLength(1);
    expect(files["eml.xml"]).toContain("selected by plant: not identified");
    const refused = await download(csvLoader, planner, "/exchange/occurrences.csv?caste=drone").catch((thrown: unknown) => thrown as { init?: { status?: number } });
    expect((refused as { init?: { status?: number } }).init?.status).toBe(400);
  });
});

describe("a large export", () => {
  it("streams 20,000 visits holding a bounded amount of memory", async () => {
    await seedChecklists(orm.em.fork());
    const viewer = await person("planner@example.org", "Ivo Marchetti", ["planner"]);
    const owner = await person("recorder@example.org", "Odile Fenwick", ["recorder"]);
    const connection = orm.em.getConnection();
    const VISITS = 20_000;
    // Generated by PostgreSQL so that the test process never holds the visits itself.
    await connection.execute(
      `INSERT INTO visit (created_at, updated_at, recorder_id, client_submission_id, event_date, event_local_date, event_time_zone,
                          decimal_latitude, decimal_longitude, coordinate_uncertainty_in_meters, behavior, bee_identification_confidence,
                          plant_taxon_id, plant_status, bee_taxon_id, caste, bee_status, version)
       SELECT now(), now(), ?, gen_random_uuid(), timestamptz '2024-04-01 10:00-05' + (g % 180) * interval '1 day', date '2024-04-01' + (g % 180),
              'America/Chicago', 41 + (g % 500) * 0.00731, -89 + (g % 700) * 0.00917, 20, 'pollen_collecting', 'probable',
              (array(SELECT id FROM plant_taxon ORDER BY id))[1 + g % 60], 'proposed',
              (array(SELECT id FROM bee_taxon ORDER BY id))[1 + g % 12], 'worker', 'proposed', 1
         FROM generate_series(1, ?) g`,
      [owner.id, VISITS],
    );
    await connection.execute(
      `INSERT INTO determination (created_at, updated_at, visit_id, subject, plant_taxon_id, bee_taxon_id, caste, identified_by_id, date_identified, status)
       SELECT now(), now(), v.id, s.subject, CASE WHEN s.subject = 'plant' THEN v.plant_taxon_id END, CASE WHEN s.subject = 'bee' THEN v.bee_taxon_id END,
              CASE WHEN s.subject = 'bee' THEN v.caste END, v.recorder_id, v.event_date, 'proposed'
         FROM visit v CROSS JOIN (VALUES ('plant'), ('bee')) s(subject)`,
    );

    // A collector that can be called: heap figures after it are what is really held (V8 flag, as node --expose-gc).
    setFlagsFromString("--expose-gc");
    const gc = runInNewContext("gc") as () => void;
    gc();
    const baseline = process.memoryUsage().heapUsed;
    let peak = 0;
    let bytes = 0;
    let chunks = 0;
    const response = await download(archiveLoader, viewer, "/exchange/archive.zip");
    const reader = response.body!.getReader();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      bytes += value.byteLength;
      // Every 16th chunk: often enough to see growth, rarely enough to finish quickly.
      if (++chunks % 16 === 0) {
        gc();
        peak = Math.max(peak, process.memoryUsage().heapUsed - baseline);
      }
    }
    gc();

    // The rows are all there: the CSV counted line by line as it streams.
    let lines = 0;
    let csvBytes = 0;
    const csvReader = (await download(csvLoader, viewer, "/exchange/occurrences.csv")).body!.getReader();
    for (;;) {
      const { done, value } = await csvReader.read();
      if (done) break;
      csvBytes += value.byteLength;
      for (const byte of value) if (byte === 0x0a) lines++;
    }
    expect(lines).toBe(VISITS + 1);

    const growthMb = peak / 2 ** 20;
    console.info(
      `20,000-visit archive: ${(bytes / 2 ** 20).toFixed(1)} MB zipped in ${chunks} chunks, CSV ${(csvBytes / 2 ** 20).toFixed(1)} MB; ` +
        `peak heap held above baseline ${growthMb.toFixed(1)} MB`,
    );
    expect(bytes).toBeGreaterThan(200_000);
    // A generous bound (common practice, no source), measured on this machine: streaming in
    // batches of 1,000 held about 2 MB; the same archive read as one batch of 20,000 held 34 MB
    // (the 7 MB of CSV text alone is close to the bound).
    expect(growthMb).toBeLessThan(8);

    // A reader that goes away mid-download: the export stops and gives its connection back.
    const pool = (orm.em.getConnection().getKnex().client as { pool: { numUsed(): number } }).pool;
    const abandoned = (await download(archiveLoader, viewer, "/exchange/archive.zip")).body!.getReader();
    await abandoned.read();
    await abandoned.read();
    await abandoned.cancel();
    await expect.poll(() => pool.numUsed(), { timeout: 10_000 }).toBe(0);
  }, 120_000);
});
