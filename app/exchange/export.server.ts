// Darwin Core exports of visits: the CSV download and the Darwin Core Archive (zip), streamed.
//
// Visits are read in batches by keyset on id (never OFFSET, never all at once), turned into rows
// by the pure app/exchange/darwin-core.ts, and written out as the reader takes them, so an export
// of a million visits holds about one batch in memory. Every batch of one download reads the same
// snapshot of the database (one read-only REPEATABLE READ transaction), so the archive's two
// files agree with each other and no visit is missed or repeated by edits made meanwhile.

import { Readable } from "node:stream";
import { IsolationLevel } from "@mikro-orm/core";
import type { EntityManager } from "@mikro-orm/postgresql";
import { ZipFile } from "yazl";
import { mayViewExactLocation, type LocationViewer } from "./generalise.ts";
import {
  ARCHIVE_FILES,
  csvLine,
  emlXml,
  metaXml,
  OCCURRENCE_TERMS,
  occurrenceRow,
  RELATIONSHIP_TERMS,
  relationshipRow,
  tsvLine,
  valuesOf,
  type ExportVisit,
  type LatestDetermination,
} from "./darwin-core.ts";
import type { VisitFilters } from "../visits/visits.server.ts";
import { CASTE_LABELS, DETERMINATION_STATUS_LABELS, type Behavior, type Caste, type DeterminationStatus } from "../visits/vocabulary.ts";
import { MONTH_NAMES } from "../taxa/bloom.ts";
import { visitListQuery } from "../visits/list-query.ts";

/** Visits read per query: large enough that round trips do not dominate, small enough to hold. */
export const EXPORT_BATCH_SIZE = 1000;

/**
 * The publishing programme's name for the archive's metadata. There is no programme setting for
 * it yet; VISITWORT_PROGRAMME_NAME names it on a deployment.
 */
export function programmeName(): string {
  return process.env.VISITWORT_PROGRAMME_NAME?.trim() || "Visitwort bumble-bee monitoring programme";
}

const coordinatorView = (viewer: LocationViewer) => mayViewExactLocation(viewer, { recorderId: Number.NaN, sensitive: true });

// A visit is sensitive when its bee, or any bee it was ever determined as, is flagged sensitive
// (the rule of isSensitiveVisit in app/visits/visit-record.server.ts, here per row in SQL).
const SENSITIVE_SQL = `(coalesce(bt.sensitive, false) OR EXISTS (
  SELECT 1 FROM determination sd JOIN bee_taxon sb ON sb.id = sd.bee_taxon_id
  WHERE sd.visit_id = v.id AND sd.subject = 'bee' AND sb.sensitive))`;

/**
 * The WHERE clause of the filters, as /visits applies them. A viewer who gets generalised places
 * and asks for one site gets no sensitive visit but their own: the site would give away the
 * place that generalising hides (Chapman 2020: nothing else in a record may undo it).
 */
function whereOf(filters: VisitFilters, viewer: LocationViewer): { sql: string; params: unknown[] } {
  const clauses: string[] = [];
  const params: unknown[] = [];
  const add = (clause: string, ...values: unknown[]) => {
    clauses.push(clause);
    params.push(...values);
  };
  if (filters.bee === "unsure") add("v.bee_taxon_id IS NULL");
  else if (filters.bee !== undefined) add("v.bee_taxon_id = ?", filters.bee);
  if (filters.plant === "not_identified") add("v.plant_taxon_id IS NULL");
  else if (filters.plant !== undefined) add("v.plant_taxon_id = ?", filters.plant);
  if (filters.caste) add("v.caste = ?", filters.caste);
  if (filters.status) add("v.plant_status = ?", filters.status);
  if (filters.month !== undefined) add("extract(month from v.event_local_date) = ?", filters.month);
  if (filters.site !== undefined) {
    add("v.site_id = ?", filters.site);
    if (!coordinatorView(viewer)) add(`(NOT ${SENSITIVE_SQL} OR v.recorder_id = ?)`, viewer.id);
  }
  return { sql: clauses.length ? clauses.join(" AND ") : "true", params };
}

const FROM_SQL = `FROM visit v
  LEFT JOIN bee_taxon bt ON bt.id = v.bee_taxon_id`;

/** How many visits an export with these filters holds, and how many of them are sensitive. */
export async function countExport(em: EntityManager, viewer: LocationViewer, filters: VisitFilters): Promise<{ visits: number; sensitive: number; generalised: number }> {
  const where = whereOf(filters, viewer);
  const [row] = await em.execute<{ visits: number; sensitive: number; generalised: number }[]>(
    `SELECT count(*)::int AS visits,
            count(*) FILTER (WHERE s.sensitive)::int AS sensitive,
            count(*) FILTER (WHERE s.sensitive AND s.recorder_id <> ?)::int AS generalised
       FROM (SELECT v.recorder_id, ${SENSITIVE_SQL} AS sensitive ${FROM_SQL} WHERE ${where.sql}) s`,
    [viewer.id, ...where.params],
  );
  const counts = row ?? { visits: 0, sensitive: 0, generalised: 0 };
  return { ...counts, generalised: coordinatorView(viewer) ? 0 : counts.generalised };
}

interface VisitRow {
  id: number;
  recorder_id: number;
  recorder_name: string;
  event_date: Date;
  event_time_zone: string;
  decimal_latitude: number;
  decimal_longitude: number;
  coordinate_uncertainty_in_meters: number | null;
  site_name: string | null;
  site_region: string | null;
  bee_name: string | null;
  bee_authorship: string | null;
  caste: Caste;
  behavior: Behavior;
  bee_status: DeterminationStatus;
  plant_taxon_id: number | null;
  plant_name: string | null;
  plant_status: DeterminationStatus;
  sensitive: boolean;
  bee_by: string | null;
  bee_on: Date | null;
  bee_det_status: DeterminationStatus | null;
  bee_qualifier: string | null;
  plant_by: string | null;
  plant_on: Date | null;
  plant_det_status: DeterminationStatus | null;
  plant_qualifier: string | null;
}

// The latest determination of one subject, in the order the visit page lists them.
const latestDetermination = (subject: "bee" | "plant", alias: string) => `LEFT JOIN LATERAL (
    SELECT u.name AS by, d.date_identified AS on, d.status, d.identification_qualifier AS qualifier
      FROM determination d JOIN app_user u ON u.id = d.identified_by_id
     WHERE d.visit_id = v.id AND d.subject = '${subject}'
     ORDER BY d.date_identified DESC, d.id DESC LIMIT 1) ${alias} ON true`;

const BATCH_SQL = (where: string) => `SELECT v.id, v.recorder_id, r.name AS recorder_name, v.event_date, v.event_time_zone,
       v.decimal_latitude, v.decimal_longitude, v.coordinate_uncertainty_in_meters,
       s.name AS site_name, nullif(s.iso_region_code, '') AS site_region,
       bt.scientific_name AS bee_name, bt.scientific_name_authorship AS bee_authorship,
       v.caste, v.behavior, v.bee_status, v.plant_taxon_id, pt.scientific_name AS plant_name, v.plant_status,
       ${SENSITIVE_SQL} AS sensitive,
       bd.by AS bee_by, bd.on AS bee_on, bd.status AS bee_det_status, bd.qualifier AS bee_qualifier,
       pd.by AS plant_by, pd.on AS plant_on, pd.status AS plant_det_status, pd.qualifier AS plant_qualifier
  ${FROM_SQL}
  JOIN app_user r ON r.id = v.recorder_id
  LEFT JOIN site s ON s.id = v.site_id
  LEFT JOIN plant_taxon pt ON pt.id = v.plant_taxon_id
  ${latestDetermination("bee", "bd")}
  ${latestDetermination("plant", "pd")}
 WHERE v.id > ? AND ${where}
 ORDER BY v.id
 LIMIT ?`;

const determinationOf = (by: string | null, on: Date | null, status: DeterminationStatus | null, qualifier: string | null): LatestDetermination | null =>
  by && on && status ? { identifiedBy: by, dateIdentified: new Date(on), status, identificationQualifier: qualifier ?? "" } : null;

function toExportVisit(row: VisitRow): ExportVisit {
  return {
    id: row.id,
    recorderId: row.recorder_id,
    recorderName: row.recorder_name,
    eventDate: new Date(row.event_date),
    eventTimeZone: row.event_time_zone,
    decimalLatitude: Number(row.decimal_latitude),
    decimalLongitude: Number(row.decimal_longitude),
    coordinateUncertaintyInMeters: row.coordinate_uncertainty_in_meters,
    siteName: row.site_name,
    siteRegionCode: row.site_region,
    beeScientificName: row.bee_name,
    beeScientificNameAuthorship: row.bee_authorship,
    caste: row.caste,
    behavior: row.behavior,
    beeStatus: row.bee_status,
    plantTaxonId: row.plant_taxon_id,
    plantScientificName: row.plant_name,
    plantStatus: row.plant_status,
    beeDetermination: determinationOf(row.bee_by, row.bee_on, row.bee_det_status, row.bee_qualifier),
    plantDetermination: determinationOf(row.plant_by, row.plant_on, row.plant_det_status, row.plant_qualifier),
    sensitive: row.sensitive,
  };
}

/** The visits matching the filters, a batch at a time, in id order (keyset: `id > last`). */
export async function* visitBatches(
  em: EntityManager,
  viewer: LocationViewer,
  filters: VisitFilters,
  batchSize = EXPORT_BATCH_SIZE,
): AsyncGenerator<ExportVisit[]> {
  const where = whereOf(filters, viewer);
  const sql = BATCH_SQL(where.sql);
  let after = 0;
  for (;;) {
    const rows = await em.execute<VisitRow[]>(sql, [after, ...where.params, batchSize]);
    if (!rows.length) return;
    yield rows.map(toExportVisit);
    if (rows.length < batchSize) return;
    after = rows[rows.length - 1]!.id;
  }
}

/**
 * One read-only REPEATABLE READ transaction for a whole download, opened on first use and closed
 * once (when the download ends, fails, or the reader goes away), so a pool connection is never
 * left behind.
 */
class Snapshot {
  private tx: Promise<EntityManager> | undefined;
  private closed = false;

  constructor(private readonly em: EntityManager) {}

  open(): Promise<EntityManager> {
    if (this.closed) return Promise.reject(new Error("The export's snapshot is closed"));
    this.tx ??= (async () => {
      const tx = this.em.fork();
      await tx.begin({ isolationLevel: IsolationLevel.REPEATABLE_READ, readOnly: true });
      return tx;
    })();
    return this.tx;
  }

  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    const pending = this.tx;
    if (!pending) return;
    try {
      // Nothing was written: rolling back ends the read-only transaction as well as committing.
      await (await pending).rollback();
    } catch {
      // The connection failed already; the pool discards it.
    }
  }
}

const utf8 = (text: string) => Buffer.from(text, "utf8");

/** A byte stream of the generator's chunks that reads ahead by at most one chunk. */
const byteStream = (chunks: AsyncIterable<Buffer> | Iterable<Buffer>) => Readable.from(chunks, { objectMode: false, highWaterMark: 1 });

export interface ExportOptions {
  /** The programme, as datasetName and in the archive's metadata. */
  programmeName: string;
  /** When the export was made (the metadata's date). */
  now: Date;
  batchSize?: number;
}

/**
 * The occurrences as CSV (RFC 4180, UTF-8, Darwin Core term names as the header): one row per
 * visit, places generalised for this viewer as `locationFor` says.
 */
export function occurrenceCsv(em: EntityManager, viewer: LocationViewer, filters: VisitFilters, options: ExportOptions): Readable {
  const snapshot = new Snapshot(em);
  async function* chunks() {
    try {
      const tx = await snapshot.open();
      yield utf8(csvLine(OCCURRENCE_TERMS));
      for await (const batch of visitBatches(tx, viewer, filters, options.batchSize)) {
        yield utf8(batch.map((visit) => csvLine(valuesOf(OCCURRENCE_TERMS, occurrenceRow(visit, viewer, options.programmeName)))).join(""));
      }
    } finally {
      await snapshot.close();
    }
  }
  return byteStream(chunks());
}

/** The filters in words, for the archive's abstract. */
export async function describeSelection(em: EntityManager, filters: VisitFilters): Promise<string> {
  const nameOf = async (table: "bee_taxon" | "plant_taxon" | "site", column: "scientific_name" | "name", id: number) => {
    const [row] = await em.execute<{ name: string }[]>(`SELECT ${column} AS name FROM ${table} WHERE id = ?`, [id]);
    return row?.name ?? `#${id}`;
  };
  const parts: string[] = [];
  if (filters.bee === "unsure") parts.push("bee: Bombus sp. (not sure)");
  else if (filters.bee !== undefined) parts.push(`bee: ${await nameOf("bee_taxon", "scientific_name", filters.bee)}`);
  if (filters.caste) parts.push(`caste: ${CASTE_LABELS[filters.caste].toLowerCase()}`);
  if (filters.plant === "not_identified") parts.push("plant: not identified");
  else if (filters.plant !== undefined) parts.push(`plant: ${await nameOf("plant_taxon", "scientific_name", filters.plant)}`);
  if (filters.status) parts.push(`plant status: ${DETERMINATION_STATUS_LABELS[filters.status].toLowerCase()}`);
  if (filters.month !== undefined) parts.push(`month: ${MONTH_NAMES[filters.month - 1]}`);
  if (filters.site !== undefined) parts.push(`site: ${await nameOf("site", "name", filters.site)}`);
  return parts.join("; ");
}

/**
 * The Darwin Core Archive as a zip stream: meta.xml, occurrence.txt, resourcerelationship.txt
 * and eml.xml (written last, so it can say how many rows the files hold). Tab-separated text,
 * UTF-8, one header line each, as meta.xml declares.
 */
export async function darwinCoreArchive(em: EntityManager, viewer: LocationViewer, filters: VisitFilters, options: ExportOptions): Promise<Readable> {
  const selection = await describeSelection(em, filters);
  const snapshot = new Snapshot(em);
  const counts = { occurrences: 0, relationships: 0 };
  const zip = new ZipFile();
  const output = zip.outputStream as unknown as Readable;
  const sources: Readable[] = [];
  const source = (chunks: AsyncIterable<Buffer> | Iterable<Buffer>) => {
    const stream = byteStream(chunks);
    // yazl pipes a lazy entry's stream without listening for its errors: a failed query
    // must end the download with an error, not the process, nor a zip that looks whole.
    stream.once("error", (error) => output.destroy(error));
    sources.push(stream);
    return stream;
  };

  async function* occurrences() {
    const tx = await snapshot.open();
    yield utf8(tsvLine(OCCURRENCE_TERMS));
    for await (const batch of visitBatches(tx, viewer, filters, options.batchSize)) {
      counts.occurrences += batch.length;
      yield utf8(batch.map((visit) => tsvLine(valuesOf(OCCURRENCE_TERMS, occurrenceRow(visit, viewer, options.programmeName)))).join(""));
    }
  }

  async function* relationships() {
    try {
      const tx = await snapshot.open();
      yield utf8(tsvLine(RELATIONSHIP_TERMS));
      for await (const batch of visitBatches(tx, viewer, filters, options.batchSize)) {
        const rows = batch.flatMap((visit) => {
          const row = relationshipRow(visit);
          return row ? [tsvLine(valuesOf(RELATIONSHIP_TERMS, row))] : [];
        });
        counts.relationships += rows.length;
        if (rows.length) yield utf8(rows.join(""));
      }
    } finally {
      await snapshot.close();
    }
  }

  const mtime = options.now;
  zip.addBuffer(utf8(metaXml()), ARCHIVE_FILES.meta, { mtime });
  // Lazy: each file's query starts when the zip reaches it, not before.
  zip.addReadStreamLazy(ARCHIVE_FILES.occurrence, { mtime }, (done) => done(null, source(occurrences())));
  zip.addReadStreamLazy(ARCHIVE_FILES.relationship, { mtime }, (done) => done(null, source(relationships())));
  zip.addReadStreamLazy(ARCHIVE_FILES.eml, { mtime }, (done) =>
    done(
      null,
      source([
        utf8(
          emlXml({
            programmeName: options.programmeName,
            publishedAt: options.now,
            selection,
            occurrences: counts.occurrences,
            relationships: counts.relationships,
            generalised: !coordinatorView(viewer),
          }),
        ),
      ]),
    ),
  );
  zip.end();
  zip.on("error", (error: Error) => output.destroy(error));
  // The reader went away (or the zip is done): stop reading visits and give the connection back.
  output.once("close", () => {
    for (const stream of sources) stream.destroy();
    void snapshot.close();
  });
  return output;
}

/** The download's date for file names, e.g. 2026-12-05. */
export const exportDay = (now: Date) => now.toISOString().slice(0, 10);

/** The filters of an export, from a query string: those of /visits, without paging or sorting. */
export const exportFilters = visitListQuery.pick({ bee: true, plant: true, caste: true, status: true, month: true, site: true });

/** The filters of a download request, or null when the query string is not one we make. */
export function exportFiltersOf(request: Request): VisitFilters | null {
  const parsed = exportFilters.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  return parsed.success ? parsed.data : null;
}

/**
 * A download of a stream the reader pulls at its own pace. no-store: a coordinator's copy holds
 * exact places of sensitive species, which no cache should keep.
 */
export function downloadResponse(stream: Readable, contentType: string, fileName: string): Response {
  return new Response(Readable.toWeb(stream) as unknown as ReadableStream<Uint8Array>, {
    headers: {
      "Content-Type": contentType,
      "Content-Disposition": `attachment; filename="${fileName}"`,
      "Cache-Control": "private, no-store",
    },
  });
}
