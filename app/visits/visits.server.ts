import { UniqueConstraintViolationException, type EntityManager, type FilterQuery, type QueryOrderMap } from "@mikro-orm/postgresql";
import { BeeTaxon, Determination, Photo, PlantTaxon, Site, User, Visit } from "../entities/index.ts";
import type { CurrentUser } from "../auth/current-user.server.ts";
import { hasAnyRole } from "../auth/roles.ts";
import { localDateOf, type VisitInput } from "./visit-schema.ts";
import { BEE_NOT_SURE_LABEL, type Caste, type DeterminationStatus } from "./vocabulary.ts";

/** A refusal with messages per field, as the form and the API show them. Nothing was written. */
export class VisitRefused extends Error {
  constructor(
    readonly fields: Record<string, string[]>,
    readonly status = 400,
  ) {
    super(Object.values(fields).flat().join(" "));
    this.name = "VisitRefused";
  }
}

/** What the visit code needs of photo storage: is this uploaded object a photo we accept? */
export interface PhotoInspector {
  check(key: string): Promise<{ ok: true; size: number; contentType: string } | { ok: false; reason: string }>;
}

/** Photos are uploaded under the uploader's own prefix; a key outside it is not theirs to attach. */
export const photoKeyPrefix = (userId: number) => `visits/u${userId}/`;

async function resolvePlant(em: EntityManager, input: VisitInput): Promise<PlantTaxon | null> {
  if (input.plantNotIdentified) return null;
  if (input.plantTaxonId !== undefined) {
    const taxon = await em.findOne(PlantTaxon, { id: input.plantTaxonId });
    if (!taxon) throw new VisitRefused({ plantTaxonId: ["No plant on the checklist has this number"] });
    return taxon;
  }
  const name = input.plantScientificName!;
  const taxon =
    (await em.findOne(PlantTaxon, { scientificName: { $ilike: name } })) ??
    (await em.getConnection().execute<{ id: number }[]>(`SELECT id FROM plant_taxon WHERE lower(?) = ANY (SELECT lower(s) FROM unnest(synonyms) s) LIMIT 1`, [name])
      .then((rows) => (rows[0] ? em.findOne(PlantTaxon, { id: rows[0].id }) : null)));
  if (!taxon) throw new VisitRefused({ plantScientificName: [`No plant on the checklist is called “${name}”`] });
  return taxon;
}

async function resolveBee(em: EntityManager, input: VisitInput): Promise<BeeTaxon | null> {
  if (input.beeTaxonId !== undefined) {
    const taxon = await em.findOne(BeeTaxon, { id: input.beeTaxonId });
    if (!taxon) throw new VisitRefused({ beeTaxonId: ["No bee on the checklist has this number"] });
    return taxon;
  }
  if (input.beeScientificName === undefined || /^bombus sp\.?/i.test(input.beeScientificName)) return null;
  const taxon = await em.findOne(BeeTaxon, { scientificName: { $ilike: input.beeScientificName } });
  if (!taxon) throw new VisitRefused({ beeScientificName: [`No bee on the checklist is called “${input.beeScientificName}”`] });
  return taxon;
}

/**
 * Records a visit with its photos and the recorder's proposed determinations, in one
 * transaction. Every check runs before anything is written. The same clientSubmissionId from
 * the same recorder returns the first visit (`created: false`) instead of making a second.
 */
export async function createVisit(
  em: EntityManager,
  recorderId: number,
  input: VisitInput,
  photos: PhotoInspector,
): Promise<{ visit: Visit; created: boolean }> {
  const earlier = await em.findOne(Visit, { recorder: recorderId, clientSubmissionId: input.clientSubmissionId });
  if (earlier) return { visit: earlier, created: false };

  const [plant, bee] = await Promise.all([resolvePlant(em, input), resolveBee(em, input)]);
  const site = input.siteId !== undefined ? await em.findOne(Site, { id: input.siteId }) : null;
  if (input.siteId !== undefined && !site) throw new VisitRefused({ siteId: ["No such site"] });

  const photoProblems: string[] = [];
  const checked: { key: string; size: number; contentType: string; subject: "bee" | "plant"; views: string[] }[] = [];
  for (const [index, photo] of input.photos.entries()) {
    if (!photo.key.startsWith(photoKeyPrefix(recorderId))) {
      photoProblems.push(`Photo ${index + 1} was not uploaded by you.`);
      continue;
    }
    const result = await photos.check(photo.key);
    if (result.ok) checked.push({ ...photo, size: result.size, contentType: result.contentType });
    else photoProblems.push(`Photo ${index + 1}: ${result.reason}`);
  }
  if (photoProblems.length) throw new VisitRefused({ photos: photoProblems });
  if (checked.length && (await em.count(Photo, { storageKey: { $in: checked.map((p) => p.key) } }))) {
    throw new VisitRefused({ photos: ["A photo is already attached to another visit."] }, 409);
  }

  const recorder = em.getReference(User, recorderId);
  const now = new Date();
  try {
    const visit = await em.transactional(async (tx) => {
      const visit = tx.create(Visit, {
        recorder,
        clientSubmissionId: input.clientSubmissionId,
        eventDate: new Date(input.eventDate),
        eventLocalDate: localDateOf(input.eventDate),
        eventTimeZone: input.eventTimeZone,
        decimalLatitude: input.decimalLatitude ?? site!.decimalLatitude,
        decimalLongitude: input.decimalLongitude ?? site!.decimalLongitude,
        coordinateUncertaintyInMeters:
          input.decimalLatitude !== undefined ? (input.coordinateUncertaintyInMeters ?? null) : site!.coordinateUncertaintyInMeters,
        site,
        behavior: input.behavior,
        habitatNotes: input.habitatNotes,
        occurrenceRemarks: input.occurrenceRemarks,
        beeIdentificationConfidence: input.beeIdentificationConfidence,
        plantTaxon: plant,
        plantStatus: "proposed",
        beeTaxon: bee,
        caste: input.caste,
        beeStatus: "proposed",
      });
      tx.create(Determination, {
        visit, subject: "plant", plantTaxon: plant, beeTaxon: null, caste: null, identifiedBy: recorder, dateIdentified: now, status: "proposed",
        remarks: input.plantNotIdentified ? "Plant not identified by the recorder" : "",
      });
      tx.create(Determination, {
        visit, subject: "bee", plantTaxon: null, beeTaxon: bee, caste: input.caste, identifiedBy: recorder, dateIdentified: now, status: "proposed",
        identificationQualifier: bee ? "" : "sp.", remarks: `Recorder's confidence: ${input.beeIdentificationConfidence}`,
      });
      for (const photo of checked) {
        tx.create(Photo, { visit, subject: photo.subject, storageKey: photo.key, contentType: photo.contentType, byteSize: photo.size, views: photo.subject === "bee" ? (photo.views as Photo["views"]) : [] });
      }
      return visit;
    });
    return { visit, created: true };
  } catch (error) {
    // Two submissions of the same visit at once: the second finds the first.
    if (error instanceof UniqueConstraintViolationException) {
      const first = await em.fork().findOne(Visit, { recorder: recorderId, clientSubmissionId: input.clientSubmissionId });
      if (first) return { visit: first, created: false };
    }
    throw error;
  }
}

/** Who may see a visit: its recorder, the people who verify it, and coordinators. */
export function canSeeVisit(viewer: CurrentUser, visit: { recorderId: number }): boolean {
  return visit.recorderId === viewer.id || hasAnyRole(viewer.roles, ["botanist", "bee_verifier"]);
}

/** Coordinators see every visit in lists; everyone else their own. */
const seesAllVisits = (viewer: CurrentUser) => viewer.roles.includes("coordinator");

export const VISIT_SORTS = ["eventDate", "plant", "bee", "site", "plantStatus"] as const;
export type VisitSort = (typeof VISIT_SORTS)[number];

export interface VisitFilters {
  bee?: number | "unsure";
  caste?: Caste;
  plant?: number | "not_identified";
  status?: DeterminationStatus;
  month?: number;
  site?: number;
}

export interface VisitListRow {
  id: number;
  eventDate: string;
  eventLocalDate: string;
  recorderName: string;
  siteName: string | null;
  beeName: string;
  caste: Caste;
  beeStatus: DeterminationStatus;
  plantName: string | null;
  plantVernacular: string | null;
  plantStatus: DeterminationStatus;
  photoCount: number;
  firstPhotoId: number | null;
}

export async function listVisits(
  em: EntityManager,
  viewer: CurrentUser,
  options: { filters: VisitFilters; sort: VisitSort; descending: boolean; page: number; pageSize: number },
): Promise<{ rows: VisitListRow[]; total: number }> {
  const where: FilterQuery<Visit> = {};
  if (!seesAllVisits(viewer)) where.recorder = viewer.id;
  const { filters } = options;
  if (filters.bee === "unsure") where.beeTaxon = null;
  else if (filters.bee !== undefined) where.beeTaxon = filters.bee;
  if (filters.plant === "not_identified") where.plantTaxon = null;
  else if (filters.plant !== undefined) where.plantTaxon = filters.plant;
  if (filters.caste) where.caste = filters.caste;
  if (filters.status) where.plantStatus = filters.status;
  if (filters.site !== undefined) where.site = filters.site;
  const direction = options.descending ? "desc" : "asc";
  const orderBy: QueryOrderMap<Visit> = {
    eventDate: { eventDate: direction },
    plant: { plantTaxon: { scientificName: `${direction} nulls last` } },
    bee: { beeTaxon: { scientificName: `${direction} nulls last` } },
    site: { site: { name: `${direction} nulls last` } },
    plantStatus: { plantStatus: direction },
  }[options.sort] as QueryOrderMap<Visit>;

  const query = em
    .createQueryBuilder(Visit, "v")
    .select("v.*")
    .leftJoinAndSelect("v.plantTaxon", "pt")
    .leftJoinAndSelect("v.beeTaxon", "bt")
    .leftJoinAndSelect("v.site", "s")
    .leftJoinAndSelect("v.recorder", "r")
    .where(where);
  if (filters.month !== undefined) query.andWhere("extract(month from v.event_local_date) = ?", [filters.month]);
  const total = await query.clone().getCount();
  const visits = await query
    .orderBy([orderBy, { id: "desc" }] as QueryOrderMap<Visit>[])
    .limit(options.pageSize)
    .offset((options.page - 1) * options.pageSize)
    .getResult();

  const ids = visits.map((v) => v.id);
  const photoRows = ids.length
    ? await em.getConnection().execute<{ visit_id: number; count: number; first_id: number }[]>(
        `SELECT visit_id, count(*)::int AS count, min(id) AS first_id FROM photo WHERE visit_id IN (?) GROUP BY visit_id`,
        [ids],
      )
    : [];
  const photoCounts = new Map(photoRows.map((row) => [row.visit_id, row]));
  return {
    total,
    rows: visits.map((v) => ({
      id: v.id,
      eventDate: v.eventDate.toISOString(),
      eventLocalDate: String(v.eventLocalDate),
      recorderName: v.recorder.name,
      siteName: v.site?.name ?? null,
      beeName: v.beeTaxon?.scientificName ?? BEE_NOT_SURE_LABEL,
      caste: v.caste,
      beeStatus: v.beeStatus,
      plantName: v.plantTaxon?.scientificName ?? null,
      plantVernacular: v.plantTaxon?.vernacularNames[0] ?? null,
      plantStatus: v.plantStatus,
      photoCount: photoCounts.get(v.id)?.count ?? 0,
      firstPhotoId: photoCounts.get(v.id)?.first_id ?? null,
    })),
  };
}

/** One visit with everything its page shows, or null when it does not exist or may not be seen. */
export async function findVisitForViewer(em: EntityManager, viewer: CurrentUser, id: number) {
  const visit = await em.findOne(Visit, { id }, { populate: ["plantTaxon", "beeTaxon", "site", "recorder"] });
  if (!visit) return null;
  if (!canSeeVisit(viewer, { recorderId: visit.recorder.id })) return "forbidden" as const;
  const [photos, determinations] = await Promise.all([
    em.find(Photo, { visit: visit.id }, { orderBy: { id: "asc" } }),
    em.find(Determination, { visit: visit.id }, { orderBy: { dateIdentified: "asc", id: "asc" }, populate: ["plantTaxon", "beeTaxon", "identifiedBy"] }),
  ]);
  return { visit, photos, determinations };
}
