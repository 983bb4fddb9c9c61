import type { EntityManager } from "@mikro-orm/postgresql";
import { PlantTaxon, Site } from "../entities/index.ts";
import type { CurrentUser } from "../auth/current-user.server.ts";
import { floralSurveyInput, surveyFieldErrors, type SurveyFieldErrors } from "./floral-count-schema.ts";

/** A refused survey, with messages per field as the form shows them. Nothing was written. */
export class FloralSurveyRefused extends Error {
  constructor(
    readonly fields: SurveyFieldErrors,
    readonly status = 400,
  ) {
    super(Object.values(fields).flat().join(" "));
    this.name = "FloralSurveyRefused";
  }
}

export interface FloralSurveySummary {
  siteId: number;
  siteName: string;
  surveyDate: string;
  plants: number;
  totalUnits: number;
  /** Counts of plants not counted before at this site on this day. */
  created: number;
  /** Counts that replaced an earlier one for the same site, day and plant. */
  updated: number;
}

/**
 * Records a floral survey: every row in one statement inside one transaction, after every check
 * has passed, so a refused survey leaves nothing behind. Counting a site again on the same day
 * replaces the earlier count of each plant listed (the latest count is the one that stands);
 * plants not listed keep theirs.
 */
export async function recordFloralSurvey(em: EntityManager, user: Pick<CurrentUser, "id">, input: unknown): Promise<FloralSurveySummary> {
  const parsed = floralSurveyInput.safeParse(input);
  if (!parsed.success) throw new FloralSurveyRefused(surveyFieldErrors(parsed.error));
  const survey = parsed.data;

  const fields: SurveyFieldErrors = {};
  const site = await em.findOne(Site, { id: survey.siteId });
  if (!site) fields.siteId = ["No such site; choose one from the list"];
  const known = new Set(
    (await em.find(PlantTaxon, { id: { $in: survey.rows.map((row) => row.plantTaxonId) } }, { fields: ["id"] })).map((taxon) => taxon.id),
  );
  survey.rows.forEach((row, index) => {
    if (!known.has(row.plantTaxonId)) fields[`rows.${index}.plantTaxonId`] = ["No plant on the checklist has this number"];
  });
  if (!site || Object.keys(fields).length) throw new FloralSurveyRefused(fields);

  const values = survey.rows.map(() => "(?::int, ?::int)").join(", ");
  const params = survey.rows.flatMap((row) => [row.plantTaxonId, row.floweringUnits]);
  // xmax is 0 on a row the statement inserted and set on one it updated (PostgreSQL's row
  // versioning; common practice, no source): that tells new counts from replaced ones.
  const written = await em.transactional((tx) =>
    tx.getConnection().execute<{ inserted: boolean }[]>(
      `insert into floral_count (created_at, updated_at, site_id, survey_date, plant_taxon_id, flowering_units, recorded_by_id, remarks)
       select now(), now(), ?::int, ?::date, counted.plant, counted.units, ?::int, ?::text
       from (values ${values}) as counted (plant, units)
       on conflict on constraint floral_count_site_date_taxon_unique do update
         set flowering_units = excluded.flowering_units, recorded_by_id = excluded.recorded_by_id,
             remarks = excluded.remarks, updated_at = excluded.updated_at
       returning (xmax = 0) as inserted`,
      [site.id, survey.surveyDate, user.id, survey.remarks, ...params],
      "all",
      tx.getTransactionContext(),
    ),
  );
  const created = written.filter((row) => row.inserted).length;
  return {
    siteId: site.id,
    siteName: site.name,
    surveyDate: survey.surveyDate,
    plants: survey.rows.length,
    totalUnits: survey.rows.reduce((sum, row) => sum + row.floweringUnits, 0),
    created,
    updated: written.length - created,
  };
}

export interface FloralCountFilter {
  siteId?: number;
  /** First survey date, inclusive, "YYYY-MM-DD". */
  from?: string;
  /** Last survey date, inclusive, "YYYY-MM-DD". */
  to?: string;
}

export interface FloralCountRow {
  id: number;
  siteId: number;
  siteName: string;
  surveyDate: string;
  plantTaxonId: number;
  scientificName: string;
  vernacularName: string | null;
  floweringUnits: number;
  recorderName: string;
  remarks: string;
}

function whereOf(filter: FloralCountFilter): { sql: string; params: unknown[] } {
  const clauses: string[] = [];
  const params: unknown[] = [];
  if (filter.siteId !== undefined) (clauses.push("f.site_id = ?"), params.push(filter.siteId));
  if (filter.from !== undefined) (clauses.push("f.survey_date >= ?::date"), params.push(filter.from));
  if (filter.to !== undefined) (clauses.push("f.survey_date <= ?::date"), params.push(filter.to));
  return { sql: clauses.length ? `where ${clauses.join(" and ")}` : "", params };
}

/** Every count matching the filter, newest survey first, then by site and scientific name. */
export async function listFloralCounts(em: EntityManager, filter: FloralCountFilter = {}): Promise<FloralCountRow[]> {
  const where = whereOf(filter);
  return em.getConnection().execute<FloralCountRow[]>(
    `select f.id, f.site_id as "siteId", s.name as "siteName", to_char(f.survey_date, 'YYYY-MM-DD') as "surveyDate",
            f.plant_taxon_id as "plantTaxonId", t.scientific_name as "scientificName", t.vernacular_names[1] as "vernacularName",
            f.flowering_units as "floweringUnits", u.name as "recorderName", f.remarks
     from floral_count f
     join site s on s.id = f.site_id
     join plant_taxon t on t.id = f.plant_taxon_id
     join app_user u on u.id = f.recorded_by_id
     ${where.sql}
     order by f.survey_date desc, s.name, t.scientific_name`,
    where.params,
  );
}

export interface FloralSurveyRow {
  siteId: number;
  siteName: string;
  surveyDate: string;
  plants: number;
  totalUnits: number;
  /** Everyone whose count stands in this survey, by name. */
  recorders: string[];
}

/**
 * Surveys (one per site and day) matching the filter, newest first, a page at a time, with how
 * many surveys match in all.
 */
export async function listFloralSurveys(
  em: EntityManager,
  filter: FloralCountFilter = {},
  page: { limit: number; offset: number } = { limit: 1000, offset: 0 },
): Promise<{ surveys: FloralSurveyRow[]; total: number }> {
  const where = whereOf(filter);
  const [surveys, totals] = await Promise.all([
    em.getConnection().execute<FloralSurveyRow[]>(
      `select f.site_id as "siteId", s.name as "siteName", to_char(f.survey_date, 'YYYY-MM-DD') as "surveyDate",
              count(*)::int as plants, sum(f.flowering_units)::int as "totalUnits",
              array_agg(distinct u.name order by u.name) as recorders
       from floral_count f
       join site s on s.id = f.site_id
       join app_user u on u.id = f.recorded_by_id
       ${where.sql}
       group by f.site_id, s.name, f.survey_date
       order by f.survey_date desc, s.name
       limit ? offset ?`,
      [...where.params, page.limit, page.offset],
    ),
    em.getConnection().execute<{ total: number }[]>(
      `select count(*)::int as total from (select 1 from floral_count f ${where.sql} group by f.site_id, f.survey_date) surveys`,
      where.params,
    ),
  ]);
  return { surveys, total: totals[0]?.total ?? 0 };
}
