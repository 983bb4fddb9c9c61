import { UniqueConstraintViolationException, type EntityManager } from "@mikro-orm/postgresql";
import { parse } from "csv-parse/sync";
import { createHash } from "node:crypto";
import { z } from "zod";
import { Determination, PlantTaxon, User, Visit } from "../entities/index.ts";
import { hasAnyRole } from "../auth/roles.ts";
import { plantChecklistRow, type PlantChecklistRow } from "./checklist-schema.ts";
import { crossCheckPlants, parseChecklistCsv, type ChecklistProblem, type KnownPlantNames } from "./checklist-import.server.ts";
import { toPlantTaxonRecord } from "./taxa.server.ts";
import type { PlantTaxonRecord } from "./taxon-record.ts";

/**
 * Checklist stewardship: botanists add, correct and merge plant taxa, and exchange the whole
 * checklist as CSV. Every write re-checks the names against the rest of the checklist under one
 * lock, so two botanists saving at once cannot both claim the same name.
 */

/** The columns of data/plants.csv, in its order; an export has exactly these and an import must too. */
export const PLANT_CSV_COLUMNS = Object.keys(plantChecklistRow.shape) as (keyof PlantChecklistRow)[];

// The varchar widths of plant_taxon: the file format has no limits, the table does, and a value
// the table refuses must be a message, not a failed insert.
const COLUMN_WIDTHS = { scientificName: 200, scientificNameAuthorship: 200, family: 100, genus: 100 } as const;

/** A checklist row as it may be stored: the file's row checks plus the table's column widths. */
export const storablePlantRow = plantChecklistRow.superRefine((row, ctx) => {
  for (const [field, width] of Object.entries(COLUMN_WIDTHS)) {
    if (row[field as keyof typeof COLUMN_WIDTHS].length > width) {
      ctx.addIssue({ code: "custom", path: [field], message: `is longer than ${width} characters` });
    }
  }
});

/** A refusal of a stewardship write; nothing was written. `fields` points a form at the inputs to fix. */
export class StewardshipRefused extends Error {
  constructor(
    message: string,
    readonly fields: Record<string, string[]> = {},
    readonly status: 400 | 403 | 404 = 400,
  ) {
    super(message);
    this.name = "StewardshipRefused";
  }
}

/** An import refused because the file has problems; nothing was written. */
export class ChecklistImportRefused extends Error {
  constructor(readonly problems: ImportProblem[]) {
    super(`The checklist import was refused; nothing was written (${problems.length} problem${problems.length === 1 ? "" : "s"}).`);
    this.name = "ChecklistImportRefused";
  }
}

export interface ImportProblem {
  line: number;
  reason: string;
}

// Serialises writes to the plant checklist (pg_advisory_xact_lock, released at commit or
// rollback). The name checks read the whole checklist; without the lock two concurrent saves
// could each pass them and together break them.
const CHECKLIST_LOCK_KEY = 727_104_001;

async function lockChecklist(tx: EntityManager) {
  await tx.execute("SELECT pg_advisory_xact_lock(?)", [CHECKLIST_LOCK_KEY]);
}

/**
 * What a form or a script may hand in: the row of the checklist file, where the name lists may
 * also be arrays and the months numbers. Everything is checked by `storablePlantRow`.
 */
export type PlantTaxonInput = { [K in keyof PlantChecklistRow]?: unknown };

const LIST_FIELDS = ["vernacularNames", "synonyms"] as const;

/** Validates a taxon for writing; throws StewardshipRefused with a message per field. */
export function validatePlantTaxon(input: PlantTaxonInput): PlantChecklistRow {
  const fields: Record<string, string[]> = {};
  const raw: Record<string, unknown> = { ...input };
  for (const field of LIST_FIELDS) {
    const value = input[field];
    if (!Array.isArray(value)) continue;
    // "|" separates names in the file's cell; inside one name it would split it in two on the next import.
    if (value.some((name) => String(name).includes("|"))) {
      fields[field] = ["a name may not contain “|”"];
    }
    raw[field] = value.map(String).join(" | ");
  }
  const parsed = storablePlantRow.safeParse(raw);
  if (!parsed.success) {
    for (const [field, messages] of Object.entries(z.flattenError(parsed.error).fieldErrors as Record<string, string[]>)) {
      fields[field] = [...(fields[field] ?? []), ...messages];
    }
  }
  if (!parsed.success || Object.keys(fields).length > 0) {
    throw new StewardshipRefused("The taxon was not saved: some fields need attention.", fields);
  }
  return parsed.data;
}

function refuseOnProblems(problems: ChecklistProblem[]) {
  if (problems.length === 0) return;
  const fields: Record<string, string[]> = {};
  for (const problem of problems) (fields[problem.field ?? "scientificName"] ??= []).push(problem.reason);
  throw new StewardshipRefused("The taxon was not saved: its names clash with the checklist.", fields);
}

async function namesOfOthers(tx: EntityManager, exceptIds: number[]): Promise<KnownPlantNames[]> {
  const taxa = await tx.find(PlantTaxon, exceptIds.length ? { id: { $nin: exceptIds } } : {}, { fields: ["scientificName", "synonyms"] });
  return taxa.map((t) => ({ scientificName: t.scientificName, synonyms: t.synonyms }));
}

/** A race the lock does not cover (a seed running at the same moment) still ends as a refusal. */
function refuseDuplicateName(error: unknown, name: string): never {
  if (error instanceof UniqueConstraintViolationException) {
    throw new StewardshipRefused("The taxon was not saved.", { scientificName: [`scientificName "${name}" is already on the checklist`] });
  }
  throw error;
}

/** Adds a taxon to the checklist. Refused (nothing written) when a field is wrong or a name clashes. */
export async function createPlantTaxon(em: EntityManager, input: PlantTaxonInput): Promise<PlantTaxonRecord> {
  const row = validatePlantTaxon(input);
  try {
    return await em.transactional(async (tx) => {
      await lockChecklist(tx);
      refuseOnProblems(crossCheckPlants("form", [{ line: 1, value: row }], await namesOfOthers(tx, [])));
      const taxon = tx.create(PlantTaxon, row);
      await tx.flush();
      return toPlantTaxonRecord(taxon);
    });
  } catch (error) {
    refuseDuplicateName(error, row.scientificName);
  }
}

/** Corrects a taxon. Its visits and determinations keep pointing at it, whatever its name becomes. */
export async function updatePlantTaxon(em: EntityManager, id: number, input: PlantTaxonInput): Promise<PlantTaxonRecord> {
  const row = validatePlantTaxon(input);
  try {
    return await em.transactional(async (tx) => {
      await lockChecklist(tx);
      const taxon = await tx.findOne(PlantTaxon, { id });
      if (!taxon) throw new StewardshipRefused("There is no plant with this number on the checklist.", {}, 404);
      refuseOnProblems(crossCheckPlants("form", [{ line: 1, value: row }], await namesOfOthers(tx, [id])));
      tx.assign(taxon, row);
      await tx.flush();
      return toPlantTaxonRecord(taxon);
    });
  } catch (error) {
    refuseDuplicateName(error, row.scientificName);
  }
}

/** How many visits and determinations name a taxon: what a merge would move. */
export async function countTaxonUse(em: EntityManager, id: number): Promise<{ visits: number; determinations: number }> {
  const [visits, determinations] = await Promise.all([
    em.count(Visit, { plantTaxon: id }),
    em.count(Determination, { plantTaxon: id }),
  ]);
  return { visits, determinations };
}

export interface MergeSummary {
  keptId: number;
  keptScientificName: string;
  mergedScientificName: string;
  visitsMoved: number;
  determinationsMoved: number;
}

/** Appends the names not there yet, comparing without case; `exclude` are names that must not be added. */
function unionNames(current: readonly string[], added: readonly string[], exclude: readonly string[] = []): string[] {
  const seen = new Set([...current, ...exclude].map((n) => n.toLowerCase()));
  const result = [...current];
  for (const name of added) {
    if (seen.has(name.toLowerCase())) continue;
    seen.add(name.toLowerCase());
    result.push(name);
  }
  return result;
}

/**
 * Merges a duplicate taxon into the one kept, in one transaction: every visit and determination
 * that names the duplicate names the kept taxon instead, the duplicate's accepted name and
 * synonyms become synonyms of the kept taxon, the common names are joined, and the duplicate is
 * deleted. Determinations are otherwise never rewritten; here the duplicate was the same plant
 * under a second record, and the foreign keys forbid deleting a taxon still named.
 */
export async function mergePlantTaxa(
  em: EntityManager,
  { duplicateId, keepId, actingUserId }: { duplicateId: number; keepId: number; actingUserId: number },
): Promise<MergeSummary> {
  if (duplicateId === keepId) {
    throw new StewardshipRefused("A taxon cannot be merged into itself: choose the taxon to keep.", { keepId: ["choose a different taxon to keep"] });
  }
  return em.transactional(async (tx) => {
    // The route checks the role too; this keeps scripts and future callers to the same rule.
    const actor = await tx.findOne(User, { id: actingUserId, status: "active" });
    if (!actor || !hasAnyRole(actor.roles, ["botanist"])) {
      throw new StewardshipRefused("Merging taxa needs the Botanist role.", {}, 403);
    }
    await lockChecklist(tx);
    const duplicate = await tx.findOne(PlantTaxon, { id: duplicateId });
    const kept = await tx.findOne(PlantTaxon, { id: keepId });
    if (!duplicate) throw new StewardshipRefused("The taxon to merge is no longer on the checklist.", {}, 404);
    if (!kept) throw new StewardshipRefused("The taxon to keep is not on the checklist.", { keepId: ["this taxon is not on the checklist"] });

    kept.synonyms = unionNames(kept.synonyms, [duplicate.scientificName, ...duplicate.synonyms], [kept.scientificName]);
    kept.vernacularNames = unionNames(kept.vernacularNames, duplicate.vernacularNames);
    const others = await namesOfOthers(tx, [duplicateId, keepId]);
    const clashes = crossCheckPlants("merge", [{ line: 1, value: kept }], others);
    if (clashes.length > 0) {
      throw new StewardshipRefused(`The taxa were not merged: ${clashes.map((c) => c.reason).join("; ")}.`);
    }

    // The visit's version moves too: a verifier holding the visit open must reload before saving.
    const visits = await tx.execute<{ affectedRows: number }>(
      "UPDATE visit SET plant_taxon_id = ?, version = version + 1, updated_at = now() WHERE plant_taxon_id = ?",
      [keepId, duplicateId],
      "run",
    );
    const determinations = await tx.execute<{ affectedRows: number }>(
      "UPDATE determination SET plant_taxon_id = ?, updated_at = now() WHERE plant_taxon_id = ?",
      [keepId, duplicateId],
      "run",
    );
    await moveOtherReferences(tx, duplicateId, keepId);
    tx.remove(duplicate);
    await tx.flush();
    return {
      keptId: kept.id,
      keptScientificName: kept.scientificName,
      mergedScientificName: duplicate.scientificName,
      visitsMoved: visits.affectedRows,
      determinationsMoved: determinations.affectedRows,
    };
  });
}

/**
 * Flower counts, nursery stock and planting lists that name the duplicate name the kept taxon.
 * Where both taxa already have a row under the same key, the rows become one: flower counts of
 * the same site and day add up (the same plant counted under two names), and the kept taxon's
 * stock entry and list place stay.
 */
async function moveOtherReferences(tx: EntityManager, duplicateId: number, keepId: number) {
  const run = (sql: string) => tx.execute(sql, [duplicateId, keepId], "run");
  await run(`UPDATE floral_count k SET flowering_units = k.flowering_units + d.flowering_units, updated_at = now()
             FROM floral_count d WHERE d.plant_taxon_id = ? AND k.plant_taxon_id = ? AND k.site_id = d.site_id AND k.survey_date = d.survey_date`);
  await run(`DELETE FROM floral_count d USING floral_count k
             WHERE d.plant_taxon_id = ? AND k.plant_taxon_id = ? AND k.site_id = d.site_id AND k.survey_date = d.survey_date`);
  await run(`DELETE FROM stock_item d USING stock_item k
             WHERE d.plant_taxon_id = ? AND k.plant_taxon_id = ? AND k.nursery_id = d.nursery_id AND k.form = d.form`);
  await run(`DELETE FROM planting_list_item d USING planting_list_item k
             WHERE d.plant_taxon_id = ? AND k.plant_taxon_id = ? AND k.list_id = d.list_id`);
  for (const table of ["floral_count", "stock_item", "planting_list_item"]) {
    await tx.execute(`UPDATE ${table} SET plant_taxon_id = ? WHERE plant_taxon_id = ?`, [keepId, duplicateId], "run");
  }
}

/** RFC 4180 §2.6–2.7: a field with a comma, quote, CR or LF is quoted, and its quotes doubled. */
export function csvField(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replaceAll('"', '""')}"` : value;
}

function toCsvCells(taxon: PlantChecklistRow): string[] {
  return PLANT_CSV_COLUMNS.map((column) => {
    const value = taxon[column];
    // The file's list cells separate names with " | ", as data/plants.csv does.
    return Array.isArray(value) ? value.join(" | ") : String(value);
  });
}

/**
 * The plant checklist as CSV, in the columns and list notation of data/plants.csv, so that an
 * export can be edited and imported again. Lines end in CRLF (RFC 4180 §2.1); the reader takes either.
 */
export async function exportChecklistCsv(em: EntityManager): Promise<string> {
  const taxa = await em.find(PlantTaxon, {}, { orderBy: { scientificName: "asc" } });
  const lines = [PLANT_CSV_COLUMNS.join(","), ...taxa.map((taxon) => toCsvCells(taxon).map(csvField).join(","))];
  return lines.join("\r\n") + "\r\n";
}

export interface FieldChange {
  field: keyof PlantChecklistRow;
  before: string;
  after: string;
}

export interface ImportPreview {
  newTaxa: { line: number; row: PlantChecklistRow }[];
  changed: { line: number; id: number; row: PlantChecklistRow; changes: FieldChange[] }[];
  unchanged: { line: number; id: number; scientificName: string }[];
  problems: ImportProblem[];
}

const display = (value: unknown) => (Array.isArray(value) ? value.join(" | ") : String(value));

function changesOf(taxon: PlantTaxon, row: PlantChecklistRow): FieldChange[] {
  const changes: FieldChange[] = [];
  for (const field of PLANT_CSV_COLUMNS) {
    const before = taxon[field];
    const after = row[field];
    // Order counts in the name lists: the first common name is the one pickers show.
    const same = Array.isArray(before) && Array.isArray(after)
      ? before.length === after.length && before.every((name, i) => name === after[i])
      : before === after;
    if (!same) changes.push({ field, before: display(before), after: display(after) });
  }
  return changes;
}

/** The header must name exactly the checklist's columns: a misspelt column would silently drop its values. */
function headerProblems(text: string): ImportProblem[] {
  let header: string[] | undefined;
  try {
    header = (parse(text, { to_line: 1, bom: true, trim: true, relax_column_count: true }) as string[][])[0];
  } catch {
    // The full parse reports where the file is malformed.
    return [];
  }
  if (!header || header.every((cell) => cell === "")) {
    return [{ line: 1, reason: `the file is empty; the first line must name the columns: ${PLANT_CSV_COLUMNS.join(",")}` }];
  }
  const expected = new Set<string>(PLANT_CSV_COLUMNS);
  const missing = PLANT_CSV_COLUMNS.filter((column) => !header.includes(column));
  const unknown = header.filter((column) => !expected.has(column));
  const problems: ImportProblem[] = [];
  if (missing.length) problems.push({ line: 1, reason: `missing column${missing.length > 1 ? "s" : ""}: ${missing.join(", ")}` });
  if (unknown.length) problems.push({ line: 1, reason: `unknown column${unknown.length > 1 ? "s" : ""}: ${unknown.join(", ")} (the columns are ${PLANT_CSV_COLUMNS.join(", ")})` });
  return problems;
}

interface Classified extends ImportPreview {
  entities: Map<string, PlantTaxon>;
}

async function classify(em: EntityManager, csvText: string): Promise<Classified> {
  const entities = new Map<string, PlantTaxon>();
  const fromHeader = headerProblems(csvText);
  if (fromHeader.length > 0) return { newTaxa: [], changed: [], unchanged: [], problems: fromHeader, entities };

  const parsed = parseChecklistCsv(csvText, storablePlantRow, "upload");
  for (const taxon of await em.find(PlantTaxon, {})) entities.set(taxon.scientificName, taxon);
  const inFile = new Set(parsed.rows.map((r) => r.value.scientificName));
  const others = [...entities.values()].filter((t) => !inFile.has(t.scientificName));
  const problems = [...parsed.problems, ...crossCheckPlants("upload", parsed.rows, others)]
    .map(({ line, reason }) => ({ line, reason }))
    .sort((a, b) => a.line - b.line);

  const preview: Classified = { newTaxa: [], changed: [], unchanged: [], problems, entities };
  for (const { line, value } of parsed.rows) {
    const existing = entities.get(value.scientificName);
    if (!existing) preview.newTaxa.push({ line, row: value });
    else {
      const changes = changesOf(existing, value);
      if (changes.length) preview.changed.push({ line, id: existing.id, row: value, changes });
      else preview.unchanged.push({ line, id: existing.id, scientificName: value.scientificName });
    }
  }
  return preview;
}

/**
 * What importing this CSV would do: rows matched to the checklist by scientificName, each new,
 * changed (with the fields) or unchanged, and every problem with its line. Writes nothing.
 */
export async function previewChecklistImport(em: EntityManager, csvText: string): Promise<ImportPreview> {
  const { entities: _entities, ...preview } = await classify(em.fork(), csvText);
  return preview;
}

export interface ImportSummary {
  created: number;
  updated: number;
  unchanged: number;
}

/**
 * Writes an import: all rows or none. The preview is computed again inside the transaction, so
 * what is checked is what is written; any problem refuses the whole file. Taxa missing from the
 * file stay on the checklist (a partial file is a normal thing to upload).
 */
export async function applyChecklistImport(em: EntityManager, csvText: string): Promise<ImportSummary> {
  try {
    return await em.transactional(async (tx) => {
      await lockChecklist(tx);
      const preview = await classify(tx, csvText);
      if (preview.problems.length > 0) throw new ChecklistImportRefused(preview.problems);
      for (const { row } of preview.newTaxa) tx.create(PlantTaxon, row);
      for (const { row } of preview.changed) tx.assign(preview.entities.get(row.scientificName)!, row);
      await tx.flush();
      return { created: preview.newTaxa.length, updated: preview.changed.length, unchanged: preview.unchanged.length };
    });
  } catch (error) {
    if (error instanceof UniqueConstraintViolationException) {
      throw new ChecklistImportRefused([{ line: 0, reason: "another change to the checklist was saved at the same moment; check the file again" }]);
    }
    throw error;
  }
}

/** Ties a confirmation to the file that was previewed: a different file must be checked first. */
export function checklistDigest(csvText: string): string {
  return createHash("sha256").update(csvText, "utf8").digest("hex");
}
