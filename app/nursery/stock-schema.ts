import { z } from "zod";
import { toCsv } from "../forage/csv.ts";
import {
  STOCK_AVAILABILITIES,
  STOCK_AVAILABILITY_LABELS,
  STOCK_FORM_LABELS,
  STOCK_FORMS,
  type StockAvailability,
  type StockForm,
} from "../planting/vocabulary.ts";

/**
 * A nursery's stock entry: one plant of the checklist in one form. One schema for the page's
 * form, the CSV import and the JSON API, so each says the same thing about the same mistake.
 * Pure module, shared by browser and server.
 */

/** The columns of the stock CSV, in the order the export writes them; an import needs all six. */
export const STOCK_CSV_COLUMNS = [
  "scientificName",
  "form",
  "sourceRegion",
  "availability",
  "availabilityNote",
  "grownWithoutSystemicInsecticides",
] as const;
export type StockCsvColumn = (typeof STOCK_CSV_COLUMNS)[number];

/** The varchar widths of stock_item (app/entities/stock-item.entity.ts). */
export const MAX_SOURCE_REGION = 200;
export const MAX_AVAILABILITY_NOTE = 200;
export const MAX_SCIENTIFIC_NAME = 200;

const FORM_MESSAGE = `Choose how the plant is sold: ${STOCK_FORMS.join(", ")}`;
const AVAILABILITY_MESSAGE = "Choose when it can be had: now, or season (later in the season)";

// People type what they see on the page ("Plugs", "Container plants", "Available now"), or
// a plural; each of those means one value and nothing else, so it is taken as that value.
function lookup<T extends string>(values: readonly T[], labels: Record<T, string>) {
  const known = new Map<string, T>();
  for (const value of values) {
    known.set(value, value);
    known.set(`${value}s`, value);
    known.set(labels[value].toLowerCase(), value);
  }
  return (input: unknown) => {
    if (typeof input !== "string") return input;
    const typed = input.trim().toLowerCase().replace(/\s+/g, " ");
    return known.get(typed) ?? typed;
  };
}

const text = (max: number, what: string) =>
  z.preprocess(
    (value) => (value === null || value === undefined ? "" : value),
    z.string({ message: `${what} must be text` }).trim().max(max, `${what}: use at most ${max} characters`),
  );

const stockFields = {
  form: z.preprocess(lookup(STOCK_FORMS, STOCK_FORM_LABELS), z.enum(STOCK_FORMS, { message: FORM_MESSAGE })),
  sourceRegion: text(MAX_SOURCE_REGION, "Source region"),
  availability: z.preprocess(
    lookup(STOCK_AVAILABILITIES, STOCK_AVAILABILITY_LABELS),
    z.enum(STOCK_AVAILABILITIES, { message: AVAILABILITY_MESSAGE }),
  ),
  availabilityNote: text(MAX_AVAILABILITY_NOTE, "Availability note"),
};

const blankToUndefined = (value: unknown) => (value === null || (typeof value === "string" && value.trim() === "") ? undefined : value);

const PLANT_MESSAGE = "Choose the plant from the checklist";

/**
 * The page's form and the JSON API: the plant by its checklist id. A checkbox sends "on" when
 * ticked and nothing otherwise; the API sends true or false.
 */
export const stockEntryInput = z.object({
  plantTaxonId: z.preprocess(blankToUndefined, z.coerce.number({ message: PLANT_MESSAGE }).int(PLANT_MESSAGE).positive(PLANT_MESSAGE)),
  ...stockFields,
  grownWithoutSystemicInsecticides: z.preprocess(
    (value) => {
      if (value === undefined || value === null || value === "" || value === false || value === "false") return false;
      if (value === true || value === "on" || value === "true") return true;
      return value;
    },
    z.boolean({ message: "The declaration is ticked or not (true or false)" }),
  ),
});

export type StockEntryInput = z.output<typeof stockEntryInput>;

/**
 * A row of the stock CSV: the plant by its scientific name (the import finds it on the
 * checklist) and the declaration as yes or no. A blank declaration is read as "no": leaving
 * the cell empty must never claim insecticide-free stock.
 */
export const stockCsvRow = z.object({
  scientificName: z
    .string({ message: "is missing: write the plant's scientific name" })
    .trim()
    .min(1, "is empty: write the plant's scientific name, e.g. Zizia aurea")
    .max(MAX_SCIENTIFIC_NAME, `is longer than ${MAX_SCIENTIFIC_NAME} characters`)
    .transform((name) => name.replace(/\s+/g, " ")),
  ...stockFields,
  grownWithoutSystemicInsecticides: z.preprocess(
    (value) => (typeof value === "string" ? value.trim().toLowerCase() || "no" : value),
    z.enum(["yes", "no"], { message: "Write yes or no" }).transform((answer) => answer === "yes"),
  ),
});

export type StockCsvRow = z.output<typeof stockCsvRow>;

/** Messages per field, keyed by the field's name ("form", "plantTaxonId"). */
export type StockFieldErrors = Record<string, string[]>;

export function stockFieldErrors(error: z.ZodError): StockFieldErrors {
  const fields: StockFieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.map(String).join(".") : "entry";
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

/** What the add form posts; an unticked checkbox is simply absent. */
export function stockFormToInput(form: FormData): Record<string, unknown> {
  const value = (name: string) => {
    const entry = form.get(name);
    return typeof entry === "string" ? entry : undefined;
  };
  return {
    plantTaxonId: value("plantTaxonId"),
    form: value("form"),
    sourceRegion: value("sourceRegion"),
    availability: value("availability"),
    availabilityNote: value("availabilityNote"),
    grownWithoutSystemicInsecticides: value("grownWithoutSystemicInsecticides"),
  };
}

export interface StockCsvRecord {
  scientificName: string;
  form: StockForm;
  sourceRegion: string;
  availability: StockAvailability;
  availabilityNote: string;
  grownWithoutSystemicInsecticides: boolean;
}

/** The stock list as CSV (RFC 4180, every record ending in CRLF), in the columns the import reads. */
export function toStockCsv(records: readonly StockCsvRecord[]): string {
  return toCsv(
    STOCK_CSV_COLUMNS,
    records.map((record) => [
      record.scientificName,
      record.form,
      record.sourceRegion,
      record.availability,
      record.availabilityNote,
      record.grownWithoutSystemicInsecticides ? "yes" : "no",
    ]),
  );
}
