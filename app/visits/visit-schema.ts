import { z } from "zod";
import { BEE_CONFIDENCES, BEE_VIEWS, BEHAVIORS, CASTES, PHOTO_SUBJECTS } from "./vocabulary";

/**
 * The visit record as the field form and the JSON API submit it. One schema for both, so a
 * message the API returns is the message the form shows next to the field.
 */

// ISO 8601 with an offset (Darwin Core eventDate): the wall time where the bee was seen and how
// far that is from UTC, e.g. 2025-04-27T09:41:00-05:00.
const ISO_WITH_OFFSET = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.\d{1,3})?)?(Z|[+-]\d{2}:\d{2})$/;
// Phones' clocks drift; a few minutes ahead of the server is not "the future".
const CLOCK_SKEW_MS = 5 * 60 * 1000;

/** Date.parse rolls 30 February over into March; a record must name a day that exists. */
function isRealDateTime(value: string): boolean {
  const match = ISO_WITH_OFFSET.exec(value);
  if (!match) return false;
  const [year, month, day, hour, minute, second] = match.slice(1, 7).map((part) => Number(part ?? 0)) as number[];
  const date = new Date(Date.UTC(year!, month! - 1, day!, hour!, minute!, second!));
  return (
    date.getUTCFullYear() === year && date.getUTCMonth() === month! - 1 && date.getUTCDate() === day &&
    date.getUTCHours() === hour && date.getUTCMinutes() === minute && !Number.isNaN(Date.parse(value))
  );
}

export const eventDate = z
  .string({ message: "Enter the date and time you saw the bee" })
  .trim()
  .regex(ISO_WITH_OFFSET, "Enter the date and time as 2025-04-27T09:41-05:00")
  .refine(isRealDateTime, "This is not a real date")
  .refine((value) => Date.parse(value) <= Date.now() + CLOCK_SKEW_MS, "The date cannot be in the future")
  .refine((value) => Date.parse(value) >= Date.UTC(1900, 0, 1), "The date is before 1900");

const optionalNumber = (schema: z.ZodNumber) =>
  z.preprocess((value) => (value === "" || value === null ? undefined : value), z.coerce.number({ message: "Enter a number" }).pipe(schema).optional());

const optionalId = z.preprocess(
  (value) => (value === "" || value === null || value === "none" ? undefined : value),
  z.coerce.number({ message: "Unknown choice" }).int("Unknown choice").positive("Unknown choice").optional(),
);

const optionalName = z.preprocess((value) => (value === "" || value === null ? undefined : value), z.string().trim().min(2).max(200).optional());

const checkbox = z.preprocess((value) => value === true || value === "true" || value === "on" || value === "1", z.boolean());

export const photoReference = z.object({
  key: z.string().trim().min(1).max(300),
  subject: z.enum(PHOTO_SUBJECTS, { message: "A photo is of the bee or of the plant" }),
  views: z.array(z.enum(BEE_VIEWS, { message: "Unknown view" })).max(BEE_VIEWS.length).default([]),
});
export type PhotoReference = z.output<typeof photoReference>;

export const MAX_PHOTOS = 12;

export const visitInput = z
  .object({
    clientSubmissionId: z.uuid({ message: "clientSubmissionId must be a UUID made by the client" }),
    eventDate,
    eventTimeZone: z.string().trim().max(64, "Use at most 64 characters").default(""),
    siteId: optionalId,
    decimalLatitude: optionalNumber(z.number().min(-90, "Latitude runs from -90 to 90").max(90, "Latitude runs from -90 to 90")),
    decimalLongitude: optionalNumber(z.number().min(-180, "Longitude runs from -180 to 180").max(180, "Longitude runs from -180 to 180")),
    coordinateUncertaintyInMeters: optionalNumber(
      z.number().int("Use whole metres").min(1, "Uncertainty is at least 1 m").max(100_000, "Uncertainty is at most 100 km"),
    ),
    beeTaxonId: optionalId,
    beeScientificName: optionalName,
    caste: z.enum(CASTES, { message: "Choose queen, worker, male or not sure" }),
    beeIdentificationConfidence: z.enum(BEE_CONFIDENCES, { message: "Choose how sure you are of the bee" }),
    behavior: z.enum(BEHAVIORS, { message: "Choose what the bee was doing" }),
    habitatNotes: z.string().trim().max(2000, "Use at most 2000 characters").default(""),
    plantTaxonId: optionalId,
    plantScientificName: optionalName,
    plantNotIdentified: checkbox.default(false),
    occurrenceRemarks: z.string().trim().max(2000, "Use at most 2000 characters").default(""),
    photos: z.array(photoReference).max(MAX_PHOTOS, `At most ${MAX_PHOTOS} photos per visit`).default([]),
  })
  .superRefine((visit, ctx) => {
    // Runs even when single fields failed (see `when` below), so the form shows every problem
    // at once; fields may then hold raw values, hence the defensive reads.
    const photos = Array.isArray(visit.photos) ? visit.photos.filter((p) => p && typeof p === "object") : [];
    const hasPoint = visit.decimalLatitude !== undefined && visit.decimalLongitude !== undefined;
    if (!hasPoint && visit.siteId === undefined) {
      ctx.addIssue({ code: "custom", path: ["decimalLatitude"], message: "Give the place: use your location, a photo's location, or choose a site" });
    }
    if ((visit.decimalLatitude === undefined) !== (visit.decimalLongitude === undefined)) {
      ctx.addIssue({ code: "custom", path: ["decimalLongitude"], message: "Give both latitude and longitude" });
    }
    const namesPlant = visit.plantTaxonId !== undefined || visit.plantScientificName !== undefined;
    if (!namesPlant && !visit.plantNotIdentified) {
      ctx.addIssue({ code: "custom", path: ["plantTaxonId"], message: "Choose the plant, or say you could not identify it" });
    }
    if (namesPlant && visit.plantNotIdentified === true) {
      ctx.addIssue({ code: "custom", path: ["plantTaxonId"], message: "Either choose a plant or say it is not identified, not both" });
    }
    if (visit.plantNotIdentified === true && !photos.some((photo) => photo.subject === "plant")) {
      ctx.addIssue({ code: "custom", path: ["photos"], message: "Add at least one photo of the plant, so a botanist can identify it" });
    }
    const keys = photos.map((photo) => photo.key);
    if (new Set(keys).size !== keys.length) ctx.addIssue({ code: "custom", path: ["photos"], message: "The same photo is attached twice" });
  }, { when: (payload) => typeof payload.value === "object" && payload.value !== null });

export type VisitInput = z.output<typeof visitInput>;

/** What the form sends: the same fields as strings, photos as JSON. */
export function visitFormToInput(form: FormData): Record<string, unknown> {
  const value: Record<string, unknown> = {};
  for (const [key, entry] of form.entries()) if (typeof entry === "string") value[key] = entry;
  try {
    value.photos = form.get("photos") ? JSON.parse(String(form.get("photos"))) : [];
  } catch {
    value.photos = "unreadable";
  }
  return value;
}

/** The date part of an ISO date-time with offset: the local calendar day of the visit. */
export function localDateOf(isoWithOffset: string): string {
  return isoWithOffset.slice(0, 10);
}
