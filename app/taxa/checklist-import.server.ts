import { parse } from "csv-parse/sync";
import { readFileSync } from "node:fs";
import path from "node:path";
import type { z } from "zod";
import { beeChecklistRow, plantChecklistRow, type BeeChecklistRow, type PlantChecklistRow } from "./checklist-schema.ts";

/** One reason a checklist file was refused, pointing at the file and line a person can fix. */
export interface ChecklistProblem {
  file: string;
  line: number;
  reason: string;
  /** The column at fault, when a check that spans rows can name it (a form shows it there). */
  field?: "scientificName" | "synonyms";
}

export class ChecklistError extends Error {
  constructor(readonly problems: ChecklistProblem[]) {
    super(
      `The checklist was refused; nothing was written.\n` +
        problems.map((p) => `  ${p.file}:${p.line}: ${p.reason}`).join("\n"),
    );
    this.name = "ChecklistError";
  }
}

export interface Parsed<T> {
  rows: { line: number; value: T }[];
  problems: ChecklistProblem[];
}

/** Reads a CSV checklist file and validates every row; collects every problem rather than the first. */
export function readChecklistCsv<S extends z.ZodType>(file: string, schema: S): Parsed<z.output<S>> {
  return parseChecklistCsv(readFileSync(file, "utf8"), schema, path.basename(file));
}

/** As readChecklistCsv, for CSV text that did not come from a file on disk (an upload). */
export function parseChecklistCsv<S extends z.ZodType>(text: string, schema: S, name: string): Parsed<z.output<S>> {
  let records: { record: Record<string, string>; info: { lines: number } }[];
  try {
    records = parse(text, { columns: true, info: true, skip_empty_lines: true, trim: true, bom: true });
  } catch (error) {
    const line = (error as { lines?: number }).lines ?? 0;
    return { rows: [], problems: [{ file: name, line, reason: (error as Error).message }] };
  }
  const rows: Parsed<z.output<S>>["rows"] = [];
  const problems: ChecklistProblem[] = [];
  for (const { record, info } of records) {
    const result = schema.safeParse(record);
    if (result.success) rows.push({ line: info.lines, value: result.data });
    else {
      for (const issue of result.error.issues) {
        problems.push({ file: name, line: info.lines, reason: `${issue.path.join(".") || "row"} ${issue.message}` });
      }
    }
  }
  return { rows, problems };
}

/** A plant taxon already on the checklist, as the cross-checks need it. */
export interface KnownPlantNames {
  scientificName: string;
  synonyms: readonly string[];
}

/**
 * Checks that span rows: one accepted name per taxon, and no name both accepted and a synonym
 * nor the synonym of two taxa. `others` are taxa already on the checklist that these rows do not
 * replace (the database's taxa missing from an uploaded file, or every other taxon when one is
 * edited): the rows must not clash with them either.
 */
export function crossCheckPlants(
  file: string,
  rows: Parsed<PlantChecklistRow>["rows"],
  others: readonly KnownPlantNames[] = [],
): ChecklistProblem[] {
  const name = path.basename(file);
  const problems: ChecklistProblem[] = [];
  const otherAccepted = new Map(others.map((taxon) => [taxon.scientificName.toLowerCase(), taxon.scientificName]));
  const otherSynonyms = new Map<string, string>();
  for (const taxon of others) for (const synonym of taxon.synonyms) otherSynonyms.set(synonym.toLowerCase(), taxon.scientificName);

  const accepted = new Map<string, number>();
  for (const { line, value } of rows) {
    const key = value.scientificName.toLowerCase();
    const first = accepted.get(key);
    if (first !== undefined) problems.push({ file: name, line, field: "scientificName", reason: `scientificName "${value.scientificName}" repeats line ${first}` });
    else accepted.set(key, line);
    if (otherAccepted.has(key)) {
      problems.push({ file: name, line, field: "scientificName", reason: `scientificName "${value.scientificName}" is already on the checklist` });
    }
    if (otherSynonyms.has(key)) {
      problems.push({ file: name, line, field: "scientificName", reason: `scientificName "${value.scientificName}" is a synonym of ${otherSynonyms.get(key)} on the checklist` });
    }
  }
  const synonyms = new Map<string, number>();
  for (const { line, value } of rows) {
    for (const synonym of value.synonyms) {
      const key = synonym.toLowerCase();
      const acceptedOn = accepted.get(key);
      if (acceptedOn === line) {
        problems.push({ file: name, line, field: "synonyms", reason: `synonym "${synonym}" is the taxon's own accepted name` });
      } else if (acceptedOn !== undefined) {
        problems.push({ file: name, line, field: "synonyms", reason: `synonym "${synonym}" is also an accepted name (line ${acceptedOn})` });
      }
      if (otherAccepted.has(key)) {
        problems.push({ file: name, line, field: "synonyms", reason: `synonym "${synonym}" is an accepted name on the checklist` });
      }
      if (otherSynonyms.has(key)) {
        problems.push({ file: name, line, field: "synonyms", reason: `synonym "${synonym}" is already a synonym of ${otherSynonyms.get(key)} on the checklist` });
      }
      const first = synonyms.get(key);
      if (first === line) problems.push({ file: name, line, field: "synonyms", reason: `synonym "${synonym}" is listed twice` });
      else if (first !== undefined) problems.push({ file: name, line, field: "synonyms", reason: `synonym "${synonym}" is already a synonym on line ${first}` });
      else synonyms.set(key, line);
    }
  }
  return problems;
}

export function crossCheckBees(file: string, rows: Parsed<BeeChecklistRow>["rows"]): ChecklistProblem[] {
  const name = path.basename(file);
  const seen = new Map<string, number>();
  const problems: ChecklistProblem[] = [];
  for (const { line, value } of rows) {
    const first = seen.get(value.scientificName);
    if (first !== undefined) problems.push({ file: name, line, reason: `scientificName "${value.scientificName}" repeats line ${first}` });
    else seen.set(value.scientificName, line);
  }
  return problems;
}

export interface Checklists {
  plants: PlantChecklistRow[];
  bees: BeeChecklistRow[];
}

/** Reads both checklists; throws a ChecklistError naming every bad line. */
export function loadChecklists(files: { plants: string; bees: string }): Checklists {
  const plants = readChecklistCsv(files.plants, plantChecklistRow);
  const bees = readChecklistCsv(files.bees, beeChecklistRow);
  const problems = [
    ...plants.problems,
    ...crossCheckPlants(files.plants, plants.rows),
    ...bees.problems,
    ...crossCheckBees(files.bees, bees.rows),
  ];
  if (problems.length > 0) throw new ChecklistError(problems);
  return { plants: plants.rows.map((r) => r.value), bees: bees.rows.map((r) => r.value) };
}
