import { ForeignKeyConstraintViolationException, type EntityManager } from "@mikro-orm/postgresql";
import { createHash } from "node:crypto";
import { PlantTaxon, StockItem } from "../entities/index.ts";
import { BANDS } from "../forage/seasons.ts";
import { recommendFromChecklist } from "../planting/planting.server.ts";
import { recommendationInput } from "../planting/recommend.ts";
import { STOCK_FORMS, type StockAvailability, type StockForm } from "../planting/vocabulary.ts";
import type { RegionalStatus } from "../taxa/checklist-schema.ts";
import { taxonIndexFor } from "../taxa/search-cache.server.ts";
import { readStockCsv } from "./stock-csv.server.ts";
import type {
  PlantSuggestion,
  StockChangeField,
  StockImportPreview,
  StockImportProblem,
  StockImportRow,
  StockListEntry,
  StockTaxon,
  WhatToGrowBand,
} from "./stock-record.ts";
import { stockEntryInput, stockFieldErrors, toStockCsv, type StockCsvRow, type StockFieldErrors } from "./stock-schema.ts";

/**
 * A nursery's stock list: the plants it offers, each in one form. Every read and write is
 * scoped to one nursery (the signed-in account): a nursery never sees or changes another's
 * rows. Invasive taxa are refused everywhere: Visitwort never offers them, since planting
 * them spreads them.
 */

/** A refused stock write; nothing was written. `fields` points the form at the inputs to fix. */
export class StockRefused extends Error {
  constructor(
    message: string,
    readonly fields: StockFieldErrors = {},
    readonly status: 400 | 404 = 400,
  ) {
    super(message);
    this.name = "StockRefused";
  }
}

const toStockTaxon = (taxon: PlantTaxon): StockTaxon => ({
  id: taxon.id,
  scientificName: taxon.scientificName,
  vernacularName: taxon.vernacularNames[0] ?? null,
  family: taxon.family,
  regionalStatus: taxon.regionalStatus,
  bloomStart: taxon.bloomStart,
  bloomEnd: taxon.bloomEnd,
});

const toEntry = (item: StockItem): StockListEntry => ({
  id: item.id,
  taxon: toStockTaxon(item.plantTaxon),
  form: item.form,
  sourceRegion: item.sourceRegion,
  availability: item.availability,
  availabilityNote: item.availabilityNote,
  grownWithoutSystemicInsecticides: item.grownWithoutSystemicInsecticides,
  updatedAt: item.updatedAt.toISOString(),
});

export type { StockImportPreview, StockImportProblem, StockListEntry, WhatToGrowBand };

const formOrder = (form: StockForm) => STOCK_FORMS.indexOf(form);

/** The nursery's stock, by scientific name and then form (plugs, containers, seed). */
export async function listStock(em: EntityManager, nurseryId: number): Promise<StockListEntry[]> {
  const items = await em.find(StockItem, { nursery: nurseryId }, { populate: ["plantTaxon"] });
  return items
    .map(toEntry)
    .sort((a, b) => (a.taxon.scientificName < b.taxon.scientificName ? -1 : a.taxon.scientificName > b.taxon.scientificName ? 1 : formOrder(a.form) - formOrder(b.form)));
}

export function invasiveRefusal(scientificName: string): string {
  return `${scientificName} is listed as invasive in the region. Visitwort never offers invasive plants: planting them spreads them.`;
}

interface UpsertRow {
  taxonId: number;
  form: StockForm;
  sourceRegion: string;
  availability: StockAvailability;
  availabilityNote: string;
  grownWithoutSystemicInsecticides: boolean;
}

/**
 * Inserts or updates the nursery's rows in one statement. The unique key (nursery, taxon,
 * form) decides which: a second entry for the same plant in the same form replaces the first,
 * so no retry or race can make two. Returns the ids, with whether each row was new.
 */
async function upsertStock(tx: EntityManager, nurseryId: number, rows: readonly UpsertRow[]): Promise<{ id: number; inserted: boolean }[]> {
  if (rows.length === 0) return [];
  const values = rows.map(() => "(?::int, ?::text, ?::text, ?::text, ?::text, ?::boolean)").join(", ");
  const params = rows.flatMap((row) => [row.taxonId, row.form, row.sourceRegion, row.availability, row.availabilityNote, row.grownWithoutSystemicInsecticides]);
  // xmax is 0 on a row the statement inserted and set on one it updated (PostgreSQL's row
  // versioning; common practice, no source): that tells new entries from changed ones.
  return tx.getConnection().execute<{ id: number; inserted: boolean }[]>(
    `insert into stock_item (created_at, updated_at, nursery_id, plant_taxon_id, form, source_region, availability, availability_note, grown_without_systemic_insecticides)
     select now(), now(), ?::int, offered.taxon, offered.form, offered.source_region, offered.availability, offered.note, offered.declared
     from (values ${values}) as offered (taxon, form, source_region, availability, note, declared)
     on conflict on constraint stock_item_nursery_taxon_form_unique do update
       set source_region = excluded.source_region, availability = excluded.availability,
           availability_note = excluded.availability_note,
           grown_without_systemic_insecticides = excluded.grown_without_systemic_insecticides,
           updated_at = excluded.updated_at
     returning id, (xmax = 0) as inserted`,
    [nurseryId, ...params],
    "all",
    tx.getTransactionContext(),
  );
}

/**
 * Adds a plant to the nursery's stock, or updates the entry it already has for the same plant
 * in the same form. `input` is the shared entry schema's input (form or API). Refused, with
 * nothing written, when a field is wrong, the plant is not on the checklist, or it is invasive.
 */
export async function saveStockEntry(em: EntityManager, nurseryId: number, input: unknown): Promise<{ entry: StockListEntry; created: boolean }> {
  const parsed = stockEntryInput.safeParse(input);
  if (!parsed.success) throw new StockRefused("Nothing was saved: some fields need attention.", stockFieldErrors(parsed.error));
  const entry = parsed.data;
  const taxon = await em.findOne(PlantTaxon, { id: entry.plantTaxonId });
  if (!taxon) throw new StockRefused("Nothing was saved.", { plantTaxonId: ["No plant on the checklist has this number; choose it again"] });
  if (taxon.regionalStatus === "invasive") throw new StockRefused("Nothing was saved.", { plantTaxonId: [invasiveRefusal(taxon.scientificName)] });
  try {
    const [written] = await em.transactional((tx) => upsertStock(tx, nurseryId, [{ ...entry, taxonId: taxon.id }]));
    const item = await em.fork().findOneOrFail(StockItem, { id: written!.id }, { populate: ["plantTaxon"] });
    return { entry: toEntry(item), created: written!.inserted };
  } catch (error) {
    // The plant was merged into another between the check and the write.
    if (error instanceof ForeignKeyConstraintViolationException) {
      throw new StockRefused("Nothing was saved: the checklist changed meanwhile.", { plantTaxonId: ["Choose the plant again"] });
    }
    throw error;
  }
}

/** Removes one entry of the nursery's own stock; another nursery's entry is "not found". */
export async function removeStockEntry(em: EntityManager, nurseryId: number, id: number): Promise<{ scientificName: string; form: StockForm }> {
  const item = await em.findOne(StockItem, { id, nursery: nurseryId }, { populate: ["plantTaxon"] });
  if (!item) throw new StockRefused("This entry is not on your stock list; it may have been removed already.", {}, 404);
  const removed = { scientificName: item.plantTaxon.scientificName, form: item.form };
  await em.nativeDelete(StockItem, { id, nursery: nurseryId });
  return removed;
}

/** The nursery's stock as CSV in the import's columns, so an export can be edited and imported again. */
export async function exportStockCsv(em: EntityManager, nurseryId: number): Promise<string> {
  const entries = await listStock(em, nurseryId);
  return toStockCsv(entries.map((entry) => ({ ...entry, scientificName: entry.taxon.scientificName })));
}

// ---------------------------------------------------------------------------- CSV import

/** An import refused because the file has problems; nothing was written. */
export class StockImportRefused extends Error {
  constructor(readonly problems: StockImportProblem[]) {
    super(`The stock import was refused; nothing was written (${problems.length} problem${problems.length === 1 ? "" : "s"}).`);
    this.name = "StockImportRefused";
  }
}

const SUGGESTIONS = 3;
const CHANGE_FIELDS: StockChangeField[] = ["sourceRegion", "availability", "availabilityNote", "grownWithoutSystemicInsecticides"];

interface Classified extends StockImportPreview {
  writes: UpsertRow[];
}

/** Scientific names compared as the checklist spells them, ignoring case and runs of spaces. */
const nameKey = (name: string) => name.trim().replace(/\s+/g, " ").toLowerCase();

/** A checklist taxon as the import matches names against it. */
interface KnownTaxon {
  id: number;
  scientificName: string;
  synonyms: string[];
  regionalStatus: RegionalStatus;
}

async function suggestionsFor(em: EntityManager, name: string, known: ReadonlyMap<number, KnownTaxon>): Promise<PlantSuggestion[]> {
  const index = await taxonIndexFor(em, "plants");
  // A slip in the epithet often leaves one close name; the rest of its genus is the next best
  // guess (the grower may have the species wrong, not the spelling). A few more than shown are
  // asked for: invasive taxa are left out, never suggested as stock.
  const genus = name.split(" ")[0] ?? "";
  const sameGenus = genus.length >= 3 && genus !== name
    ? index.search(genus, SUGGESTIONS + 5).filter((hit) => nameKey(hit.taxon.scientificName).startsWith(`${nameKey(genus)} `))
    : [];
  const hits = [...index.search(name, SUGGESTIONS + 5), ...sameGenus];
  const seen = new Set<number>();
  const suggestions: PlantSuggestion[] = [];
  for (const { taxon } of hits) {
    if (seen.has(taxon.id) || known.get(taxon.id)?.regionalStatus === "invasive") continue;
    seen.add(taxon.id);
    suggestions.push({ scientificName: taxon.scientificName, vernacularName: taxon.vernacularNames[0] ?? null });
    if (suggestions.length === SUGGESTIONS) break;
  }
  return suggestions;
}

async function classify(em: EntityManager, nurseryId: number, csvText: string): Promise<Classified> {
  const read = await readStockCsv(csvText);
  const problems: StockImportProblem[] = [...read.problems];
  const preview: Classified = { rows: [], problems, counts: { new: 0, changed: 0, unchanged: 0, problems: 0 }, writes: [] };

  if (read.rows.length > 0) {
    const taxa: KnownTaxon[] = (await em.find(PlantTaxon, {})).map(({ id, scientificName, synonyms, regionalStatus }) => ({ id, scientificName, synonyms, regionalStatus }));
    const byId = new Map(taxa.map((taxon) => [taxon.id, taxon]));
    const accepted = new Map(taxa.map((taxon) => [nameKey(taxon.scientificName), taxon]));
    const bySynonym = new Map<string, KnownTaxon>();
    for (const taxon of taxa) for (const synonym of taxon.synonyms) bySynonym.set(nameKey(synonym), taxon);
    const existing = new Map(
      (await em.find(StockItem, { nursery: nurseryId })).map((item) => [`${item.plantTaxon.id}:${item.form}`, item]),
    );
    const firstLine = new Map<string, number>();

    for (const { line, row } of read.rows) {
      const taxon = accepted.get(nameKey(row.scientificName)) ?? bySynonym.get(nameKey(row.scientificName));
      if (!taxon) {
        problems.push({
          line,
          column: "scientificName",
          reason: `scientificName: “${row.scientificName}” is not on the plant checklist`,
          suggestions: await suggestionsFor(em, row.scientificName, byId),
        });
        continue;
      }
      if (taxon.regionalStatus === "invasive") {
        problems.push({ line, column: "scientificName", reason: invasiveRefusal(taxon.scientificName) + " Remove this row." });
        continue;
      }
      const key = `${taxon.id}:${row.form}`;
      const first = firstLine.get(key);
      if (first !== undefined) {
        const sameAs = row.scientificName === taxon.scientificName ? "" : ` (${row.scientificName} is a synonym of ${taxon.scientificName})`;
        problems.push({ line, reason: `${taxon.scientificName} as ${row.form} is already on line ${first}${sameAs}; list each plant and form once` });
        continue;
      }
      firstLine.set(key, line);
      preview.rows.push(classifyRow(line, row, taxon, existing.get(key)));
      if (preview.rows.at(-1)!.status !== "unchanged") preview.writes.push({ ...row, taxonId: taxon.id });
    }
  }
  problems.sort((a, b) => a.line - b.line);
  for (const row of preview.rows) preview.counts[row.status]++;
  preview.counts.problems = problems.length;
  return preview;
}

function classifyRow(line: number, row: StockCsvRow, taxon: KnownTaxon, current: StockItem | undefined): StockImportRow {
  const changes = current ? CHANGE_FIELDS.filter((field) => current[field] !== row[field]) : [];
  return {
    line,
    taxonId: taxon.id,
    scientificName: taxon.scientificName,
    givenName: row.scientificName,
    form: row.form,
    availability: row.availability,
    grownWithoutSystemicInsecticides: row.grownWithoutSystemicInsecticides,
    status: !current ? "new" : changes.length ? "changed" : "unchanged",
    changes,
  };
}

/**
 * What importing this CSV into the nursery's stock would do, row by row, and every problem
 * with its line (names not on the checklist come with the closest names that are). Writes
 * nothing.
 */
export async function previewStockImport(em: EntityManager, nurseryId: number, csvText: string): Promise<StockImportPreview> {
  const { writes: _writes, ...preview } = await classify(em.fork(), nurseryId, csvText);
  return preview;
}

export interface StockImportSummary {
  created: number;
  updated: number;
  unchanged: number;
}

// Serialises imports of one nursery (pg_advisory_xact_lock, released at commit or rollback):
// two imports at once would each count the other's rows as new.
const STOCK_IMPORT_LOCK = 727_104_101;

/**
 * Writes an import: all rows or none. The file is checked again inside the transaction, so
 * what is checked is what is written. A plant and form already stocked is updated, never
 * duplicated; entries missing from the file stay on the list.
 */
export async function applyStockImport(em: EntityManager, nurseryId: number, csvText: string): Promise<StockImportSummary> {
  try {
    return await em.transactional(async (tx) => {
      await tx.execute("SELECT pg_advisory_xact_lock(?, ?)", [STOCK_IMPORT_LOCK, nurseryId]);
      const preview = await classify(tx, nurseryId, csvText);
      if (preview.problems.length > 0) throw new StockImportRefused(preview.problems);
      await upsertStock(tx, nurseryId, preview.writes);
      return { created: preview.counts.new, updated: preview.counts.changed, unchanged: preview.counts.unchanged };
    });
  } catch (error) {
    if (error instanceof ForeignKeyConstraintViolationException) {
      throw new StockImportRefused([{ line: 0, reason: "The plant checklist changed while the file was written; check the file again" }]);
    }
    throw error;
  }
}

/** Ties a confirmation to the file that was previewed: a different file must be checked first. */
export function stockFileDigest(csvText: string): string {
  return createHash("sha256").update(csvText, "utf8").digest("hex");
}

// ---------------------------------------------------------------------------- what to grow

/**
 * For each band, the default planting recommendation (what a planner sees first) with each
 * species marked as stocked or not by this nursery: what to grow next.
 */
export async function recommendedWithStock(em: EntityManager, nurseryId: number): Promise<WhatToGrowBand[]> {
  const items = await em.find(StockItem, { nursery: nurseryId }, { fields: ["plantTaxon", "form"] });
  const formsOf = new Map<number, Set<StockForm>>();
  for (const item of items) {
    const forms = formsOf.get(item.plantTaxon.id) ?? new Set<StockForm>();
    forms.add(item.form);
    formsOf.set(item.plantTaxon.id, forms);
  }
  const result: WhatToGrowBand[] = [];
  for (const band of BANDS) {
    const recommendation = await recommendFromChecklist(em.fork(), recommendationInput.parse({ band }));
    const species = recommendation.species.map(({ taxon, reason }) => {
      const forms = STOCK_FORMS.filter((form) => formsOf.get(taxon.id)?.has(form));
      return {
        id: taxon.id,
        scientificName: taxon.scientificName,
        vernacularName: taxon.vernacularName,
        family: taxon.family,
        regionalStatus: taxon.regionalStatus,
        bloomStart: taxon.bloomStart,
        bloomEnd: taxon.bloomEnd,
        reason,
        stocked: forms.length > 0,
        forms,
      };
    });
    result.push({
      band,
      earlySpringMonths: recommendation.earlySpringMonths,
      species,
      stockedCount: species.filter((s) => s.stocked).length,
      unmet: recommendation.unmet.map(({ month, why }) => ({ month, why })),
    });
  }
  return result;
}
