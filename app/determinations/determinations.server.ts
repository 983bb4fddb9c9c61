import { LockMode, OptimisticLockError, type EntityManager } from "@mikro-orm/postgresql";
import { z } from "zod";
import { BeeTaxon, Determination, Photo, PlantTaxon, User, Visit } from "../entities/index.ts";
import type { CurrentUser } from "../auth/current-user.server.ts";
import { hasAnyRole, type Role } from "../auth/roles.ts";
import { queueMail } from "../mail/outbox.server.ts";
import { dailyDigestMail, determinationNoticeMail, type DeterminationNotice } from "../mail/templates.ts";
import { CASTE_LABELS, CASTES, PHOTO_SUBJECTS, type Caste, type PhotoSubject } from "../visits/vocabulary.ts";

/** Who determines what: botanists the plant, bee verifiers the bee (coordinators either). */
export const DETERMINER_ROLE: Record<PhotoSubject, Role> = { plant: "botanist", bee: "bee_verifier" };

export const DETERMINATION_ACTIONS = ["confirm", "correct", "cannot_be_determined"] as const;

/** A determination as the queue page and POST /api/visits/:id/determinations submit it. */
export const determinationInput = z
  .object({
    subject: z.enum(PHOTO_SUBJECTS, { message: "Say whether this is about the plant or the bee" }),
    action: z.enum(DETERMINATION_ACTIONS, { message: "Choose confirm, correct or cannot be determined" }),
    // The visit's version the determiner was looking at; a newer one means somebody acted first.
    version: z.coerce.number({ message: "version is required" }).int().min(1),
    plantTaxonId: z.preprocess((v) => (v === "" || v === null ? undefined : v), z.coerce.number().int().positive().optional()),
    beeTaxonId: z.preprocess((v) => (v === "" || v === null || v === "unsure" ? undefined : v), z.coerce.number().int().positive().optional()),
    caste: z.preprocess((v) => (v === "" ? undefined : v), z.enum(CASTES, { message: "Choose queen, worker, male or not sure" }).optional()),
    identificationQualifier: z.enum(["", "cf.", "aff.", "sp."], { message: "Qualifier is cf., aff. or sp." }).default(""),
    remarks: z.string().trim().max(1000, "Use at most 1000 characters").default(""),
  })
  .superRefine((input, ctx) => {
    if (input.action === "cannot_be_determined" && !input.remarks) {
      ctx.addIssue({ code: "custom", path: ["remarks"], message: "Say why it cannot be determined (e.g. the photo does not show the flowers)" });
    }
    if (input.action === "correct" && input.subject === "plant" && input.plantTaxonId === undefined) {
      ctx.addIssue({ code: "custom", path: ["plantTaxonId"], message: "Choose the plant it really is" });
    }
    if (input.action === "correct" && input.subject === "bee" && input.caste === undefined) {
      ctx.addIssue({ code: "custom", path: ["caste"], message: "Choose the caste" });
    }
  });
export type DeterminationInput = z.output<typeof determinationInput>;

export class DeterminationRefused extends Error {
  constructor(
    message: string,
    readonly status: 400 | 403 | 404 | 409,
    readonly fields: Record<string, string[]> = {},
  ) {
    super(message);
    this.name = "DeterminationRefused";
  }
}

/** The visit page for a recorder; links in notices point here. */
const visitPath = (visitId: number) => `/visits/${visitId}`;

function noticeOf(visit: Visit, determination: Determination, identifiedBy: string): DeterminationNotice {
  const name =
    determination.subject === "plant"
      ? (determination.plantTaxon?.scientificName ?? null)
      : determination.beeTaxon
        ? `${determination.beeTaxon.scientificName}${determination.caste ? ` (${CASTE_LABELS[determination.caste as Caste].toLowerCase()})` : ""}`
        : null;
  return {
    visitDate: String(visit.eventLocalDate),
    subject: determination.subject,
    outcome: determination.status as DeterminationNotice["outcome"],
    name,
    identifiedBy,
    remarks: determination.remarks,
  };
}

/**
 * Appends a determination of a visit's plant or bee and moves the visit's current state to it,
 * in one transaction with the recorder's notice. The visit's version must be the one the
 * determiner saw: if somebody acted in between, nothing is written and the caller gets 409
 * with the latest state to look at.
 */
export async function determine(
  em: EntityManager,
  actor: CurrentUser,
  visitId: number,
  input: DeterminationInput,
  origin: string,
): Promise<Determination> {
  if (!hasAnyRole(actor.roles, [DETERMINER_ROLE[input.subject]])) {
    throw new DeterminationRefused(
      input.subject === "plant" ? "Only botanists determine plants." : "Only bee verifiers determine bees.",
      403,
    );
  }
  try {
    return await em.transactional(async (tx) => {
      const visit = await tx.findOne(Visit, { id: visitId }, { populate: ["plantTaxon", "beeTaxon", "recorder"] });
      if (!visit) throw new DeterminationRefused("There is no such visit.", 404);
      // Checks the version now and again in the UPDATE's WHERE clause at flush.
      await tx.lock(visit, LockMode.OPTIMISTIC, input.version);

      const actorRef = tx.getReference(User, actor.id);
      const now = new Date();
      let determination: Determination;
      if (input.subject === "plant") {
        let taxon: PlantTaxon | null = null;
        if (input.action === "confirm") {
          if (!visit.plantTaxon) throw new DeterminationRefused("There is no plant name to confirm: correct it to the plant it is.", 400, { plantTaxonId: ["Choose the plant it really is"] });
          taxon = visit.plantTaxon;
        } else if (input.action === "correct") {
          taxon = await tx.findOne(PlantTaxon, { id: input.plantTaxonId! });
          if (!taxon) throw new DeterminationRefused("No plant on the checklist has this number.", 400, { plantTaxonId: ["Unknown plant"] });
        }
        determination = tx.create(Determination, {
          visit, subject: "plant", plantTaxon: taxon, beeTaxon: null, caste: null, identificationQualifier: input.identificationQualifier,
          identifiedBy: actorRef, dateIdentified: now, status: statusOf(input.action), remarks: input.remarks,
        });
        if (input.action !== "cannot_be_determined") visit.plantTaxon = taxon;
        visit.plantStatus = statusOf(input.action);
      } else {
        let taxon: BeeTaxon | null = visit.beeTaxon ?? null;
        let caste: Caste | null = visit.caste;
        if (input.action === "confirm" && !visit.beeTaxon) {
          throw new DeterminationRefused("The recorder was not sure of the species: correct it to the species it is.", 400, { beeTaxonId: ["Choose the species"] });
        }
        if (input.action === "correct") {
          taxon = input.beeTaxonId !== undefined ? await tx.findOne(BeeTaxon, { id: input.beeTaxonId }) : null;
          if (input.beeTaxonId !== undefined && !taxon) throw new DeterminationRefused("No bee on the checklist has this number.", 400, { beeTaxonId: ["Unknown bee"] });
          caste = input.caste!;
        }
        if (input.action === "cannot_be_determined") caste = null;
        determination = tx.create(Determination, {
          visit, subject: "bee", plantTaxon: null, beeTaxon: input.action === "cannot_be_determined" ? null : taxon, caste,
          identificationQualifier: input.action === "correct" && !taxon ? "sp." : input.identificationQualifier,
          identifiedBy: actorRef, dateIdentified: now, status: statusOf(input.action), remarks: input.remarks,
        });
        if (input.action !== "cannot_be_determined") {
          visit.beeTaxon = taxon;
          visit.caste = caste!;
        }
        visit.beeStatus = statusOf(input.action);
      }

      if (visit.recorder.noticePreference === "each" && visit.recorder.id !== actor.id) {
        queueMail(tx, {
          to: visit.recorder.email,
          ...determinationNoticeMail({ visitUrl: `${origin}${visitPath(visit.id)}`, notice: noticeOf(visit, determination, actor.name) }),
          template: "determination_notice",
        });
      }
      return determination;
    });
  } catch (error) {
    if (error instanceof OptimisticLockError) {
      throw new DeterminationRefused(
        "Somebody determined this visit while you were looking at it. Here is its latest state; decide again if you still disagree.",
        409,
      );
    }
    throw error;
  }
}

function statusOf(action: (typeof DETERMINATION_ACTIONS)[number]) {
  return action === "confirm" ? ("confirmed" as const) : action === "correct" ? ("corrected" as const) : ("cannot_be_determined" as const);
}

export interface QueueFilters {
  site?: number;
  month?: number;
  family?: string;
  recorder?: number;
}

/**
 * The visits waiting for a determiner, oldest first. For bees, records of sensitive species
 * come first: they count only once verified.
 */
export async function listQueue(em: EntityManager, subject: PhotoSubject, filters: QueueFilters, limit = 50, include?: number) {
  const qb = em
    .createQueryBuilder(Visit, "v")
    .select("v.*")
    .leftJoinAndSelect("v.plantTaxon", "pt")
    .leftJoinAndSelect("v.beeTaxon", "bt")
    .leftJoinAndSelect("v.site", "s")
    .leftJoinAndSelect("v.recorder", "r")
    .where(subject === "plant" ? { plantStatus: "proposed" } : { beeStatus: "proposed" });
  if (filters.site) qb.andWhere({ site: filters.site });
  if (filters.recorder) qb.andWhere({ recorder: filters.recorder });
  if (filters.month) qb.andWhere("extract(month from v.event_local_date) = ?", [filters.month]);
  if (filters.family) qb.andWhere({ plantTaxon: { family: filters.family } });
  const orderBy = subject === "bee" ? [{ beeTaxon: { sensitive: "desc nulls last" } }, { createdAt: "asc" }, { id: "asc" }] : [{ createdAt: "asc" }, { id: "asc" }];
  const [total, visits] = await Promise.all([qb.clone().getCount(), qb.clone().orderBy(orderBy as never).limit(limit).getResult()]);
  // A visit asked for by id joins the list even when it is further back in the queue.
  if (include !== undefined && !visits.some((v) => v.id === include)) {
    const wanted = await qb.clone().andWhere({ id: include }).getResult();
    visits.unshift(...wanted);
  }
  const photos = visits.length ? await em.find(Photo, { visit: { $in: visits.map((v) => v.id) } }, { orderBy: { id: "asc" } }) : [];
  return {
    total,
    items: visits.map((v) => ({
      id: v.id,
      version: v.version,
      eventLocalDate: String(v.eventLocalDate),
      recorderName: v.recorder.name,
      siteName: v.site?.name ?? null,
      plant: v.plantTaxon ? { id: v.plantTaxon.id, scientificName: v.plantTaxon.scientificName, vernacular: v.plantTaxon.vernacularNames[0] ?? "", family: v.plantTaxon.family } : null,
      bee: v.beeTaxon ? { id: v.beeTaxon.id, scientificName: v.beeTaxon.scientificName, sensitive: v.beeTaxon.sensitive } : null,
      caste: v.caste,
      beeIdentificationConfidence: v.beeIdentificationConfidence,
      behavior: v.behavior,
      occurrenceRemarks: v.occurrenceRemarks,
      photos: photos.filter((p) => p.visit.id === v.id).map((p) => ({ id: p.id, subject: p.subject, views: p.views })),
    })),
  };
}

export type QueueItem = Awaited<ReturnType<typeof listQueue>>["items"][number];

/**
 * Sends each recorder who chose a daily digest one e-mail with what was decided about their
 * visits since the last one. Run every few minutes; sends at most once per 24 hours per person.
 */
export async function sendDailyDigests(em: EntityManager, origin: string, now = new Date()): Promise<number> {
  const dayAgo = new Date(now.getTime() - 24 * 3600 * 1000);
  const recorders = await em.find(User, { noticePreference: "daily_digest", status: "active", $or: [{ lastDigestAt: null }, { lastDigestAt: { $lte: dayAgo } }] });
  let sent = 0;
  for (const recorder of recorders) {
    await em.transactional(async (tx) => {
      const since = recorder.lastDigestAt ?? dayAgo;
      const rows = await tx.find(
        Determination,
        { visit: { recorder: recorder.id }, status: { $ne: "proposed" }, dateIdentified: { $gt: since, $lte: now }, identifiedBy: { $ne: recorder.id } },
        { populate: ["visit", "plantTaxon", "beeTaxon", "identifiedBy"], orderBy: { dateIdentified: "asc" } },
      );
      const fresh = tx.merge(recorder);
      fresh.lastDigestAt = now;
      if (rows.length === 0) return;
      queueMail(tx, {
        to: recorder.email,
        ...dailyDigestMail({ visitsUrl: `${origin}/visits`, notices: rows.map((d) => noticeOf(d.visit, d, d.identifiedBy.name)) }),
        template: "daily_digest",
      });
      sent++;
    });
  }
  return sent;
}
