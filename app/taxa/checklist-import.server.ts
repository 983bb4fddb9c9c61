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

interface Parsed<T> {
  rows: { line: number; value: T }[];
  problems: ChecklistProblem[];
}

/** Reads a CSV checklist and validates every row; collects every problem rather than the first. */
export function readChecklistCsv<S extends z.ZodType>(file: string, schema: S): Parsed<z.output<S>> {
  const name = path.basename(file);
  const text = readFileSync(file, "utf8");
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

/** Checks that span rows: one accepted name per taxon, and no name both accepted and a synonym. */
export function crossCheckPlants(file: string, rows: Parsed<PlantChecklistRow>["rows"]): ChecklistProblem[] {
  const name = path.basename(file);
  const problems: ChecklistProblem[] = [];
  const accepted = new Map<string, number>();
  for (const { line, value } of rows) {
    const key = value.scientificName.toLowerCase();
    const first = accepted.get(key);
    if (first !== undefined) problems.push({ file: name, line, reason: `scientificName "${value.scientificName}" repeats line ${first}` });
    else accepted.set(key, line);
  }
  const synonyms = new Map<string, number>();
  for (const { line, value } of rows) {
    for (const synonym of value.synonyms) {
      const key = synonym.toLowerCase();
      if (accepted.has(key)) {
        problems.push({ file: name, line, reason: `synonym "${synonym}" is also an accepted name (line ${accepted.get(key)})` });
      }
      const first = synonyms.get(key);
      if (first !== undefined) problems.push({ file: name, line, reason: `synonym "${synonym}" is already a synonym on line ${first}` });
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
