import { z } from "zod";

/**
 * A floral survey: the flowering units of each plant counted at one site on one day. One schema
 * for the field form and the server, so the message the server returns is the one the form
 * shows beside the field. Pure module, shared by browser and server.
 */

export const MAX_SURVEY_ROWS = 200;
export const MAX_FLOWERING_UNITS = 1_000_000;
export const MAX_REMARKS = 2000;

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** "2025-02-30" matches the pattern but names no day; a count must name one that exists. */
function isRealDate(value: string): boolean {
  const match = ISO_DATE.exec(value);
  if (!match) return false;
  const [year, month, day] = match.slice(1, 4).map(Number) as [number, number, number];
  const date = new Date(Date.UTC(year, month - 1, day));
  return date.getUTCFullYear() === year && date.getUTCMonth() === month - 1 && date.getUTCDate() === day;
}

/**
 * The latest calendar date anywhere on Earth at `now`. A recorder's "today" can be a day ahead
 * of the server's; the first time zone to reach a new date is UTC+14, so a date up to that one
 * is not in the future for somebody.
 */
export function latestCalendarDate(now: number = Date.now()): string {
  return new Date(now + 14 * 3600_000).toISOString().slice(0, 10);
}

const blankToUndefined = (value: unknown) => (value === "" || value === null ? undefined : typeof value === "string" ? value.trim() || undefined : value);

const requiredId = (message: string) =>
  z.preprocess(blankToUndefined, z.coerce.number({ message }).int(message).positive(message));

export const surveyDate = z
  .string({ message: "Enter the date of the count" })
  .trim()
  .min(1, { message: "Enter the date of the count", abort: true })
  .regex(ISO_DATE, { message: "Enter the date as 2025-04-27", abort: true })
  .refine(isRealDate, { message: "This is not a real date", abort: true })
  .refine((value) => value <= latestCalendarDate(), "The date cannot be in the future")
  .refine((value) => value >= "1900-01-01", "The date is before 1900");

const WHOLE_NUMBER = /^\d+$/;

export const floweringUnits = z.preprocess(
  (value) => {
    if (typeof value !== "string") return value;
    const typed = value.trim();
    if (typed === "") return undefined;
    return WHOLE_NUMBER.test(typed) ? Number(typed) : typed;
  },
  z
    .number({
      error: (issue) =>
        issue.input === undefined
          ? "Enter how many flowering units you counted (0 if none were open)"
          : "Enter a whole number of flowering units, e.g. 120",
    })
    .int("Enter a whole number of flowering units, e.g. 120")
    .min(0, "Flowering units cannot be fewer than 0")
    .max(MAX_FLOWERING_UNITS, "At most 1,000,000 flowering units per plant; for more, estimate per square metre and say so in the remarks"),
);

export const floralCountRow = z.object({
  plantTaxonId: requiredId("Choose the plant from the checklist"),
  floweringUnits,
});

export const floralSurveyInput = z
  .object({
    siteId: requiredId("Choose the site you counted at"),
    surveyDate,
    rows: z
      .array(floralCountRow, { message: "Add at least one plant" })
      .min(1, "Add at least one plant")
      .max(MAX_SURVEY_ROWS, `At most ${MAX_SURVEY_ROWS} plants in one survey`),
    remarks: z.preprocess((value) => (value === null || value === undefined ? "" : value), z.string().trim().max(MAX_REMARKS, `Use at most ${MAX_REMARKS} characters`)),
  })
  .superRefine(
    (survey, ctx) => {
      // Runs even when single rows failed (see `when`), so a duplicate is reported with the
      // other problems; rows may then hold raw values, hence the defensive reads.
      const firstRowOf = new Map<number, number>();
      survey.rows.forEach((row, index) => {
        const id = Number((row as { plantTaxonId?: unknown } | null)?.plantTaxonId);
        if (!Number.isInteger(id) || id <= 0) return;
        const first = firstRowOf.get(id);
        if (first === undefined) firstRowOf.set(id, index);
        else ctx.addIssue({ code: "custom", path: ["rows", index, "plantTaxonId"], message: `This plant is already plant ${first + 1}; count each plant once per survey` });
      });
    },
    { when: (payload) => Array.isArray((payload.value as { rows?: unknown } | null)?.rows) },
  );

export type FloralSurveyInput = z.output<typeof floralSurveyInput>;

/** Messages per field, keyed by the field's path: "siteId", "rows", "rows.2.floweringUnits". */
export type SurveyFieldErrors = Record<string, string[]>;

export function surveyFieldErrors(error: z.ZodError): SurveyFieldErrors {
  const fields: SurveyFieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.map(String).join(".") : "survey";
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

/** What the form posts: one `plantTaxonId` and one `floweringUnits` per row, in row order. */
export function floralSurveyFormToInput(form: FormData): Record<string, unknown> {
  const text = (value: FormDataEntryValue | null | undefined) => (typeof value === "string" ? value : undefined);
  const plants = form.getAll("plantTaxonId").map(text);
  const units = form.getAll("floweringUnits").map(text);
  const rows = Array.from({ length: Math.max(plants.length, units.length) }, (_, i) => ({ plantTaxonId: plants[i], floweringUnits: units[i] }));
  return { siteId: text(form.get("siteId")), surveyDate: text(form.get("surveyDate")), remarks: text(form.get("remarks")), rows };
}

const lenientDate = z.string().regex(ISO_DATE).refine(isRealDate).optional().catch(undefined);
const lenientCount = z.coerce.number().int().min(0).optional().catch(undefined);

/**
 * Filters of the surveys list, read leniently from the address: a bad value is ignored. After a
 * survey is saved the form sends the recorder here with `saved` (its date), `new` and `replaced`.
 */
export const floralCountListQuery = z.object({
  site: z.coerce.number().int().positive().optional().catch(undefined),
  from: lenientDate,
  to: lenientDate,
  page: z.coerce.number().int().min(1).max(10_000).catch(1).default(1),
  saved: lenientDate,
  new: lenientCount,
  replaced: lenientCount,
});

export type FloralCountListQuery = z.output<typeof floralCountListQuery>;
