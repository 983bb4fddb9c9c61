import { describe, expect, it } from "vitest";
import { visitInput } from "./visit-schema";

const valid = {
  clientSubmissionId: "3f1c2b9e-6d2a-4c1e-9b7a-2f4d6e8a0c11",
  eventDate: "2025-04-27T09:41:00-05:00",
  decimalLatitude: 43.0731,
  decimalLongitude: -89.4012,
  coordinateUncertaintyInMeters: 15,
  beeScientificName: "Bombus impatiens",
  caste: "queen",
  beeIdentificationConfidence: "probable",
  behavior: "nectar_foraging",
  plantScientificName: "Salix discolor",
};

/** The messages zod gives for one field when `change` is applied to a valid visit. */
function messagesFor(field: string, change: Record<string, unknown>) {
  const result = visitInput.safeParse({ ...valid, ...change });
  expect(result.success, `expected ${JSON.stringify(change)} to be refused`).toBe(false);
  return result.error!.issues.filter((issue) => issue.path[0] === field).map((issue) => issue.message);
}

describe("the visit schema shared by the form and the API", () => {
  it("accepts a complete visit and keeps the offset of the local time", () => {
    const parsed = visitInput.parse(valid);
    expect(parsed.eventDate).toBe("2025-04-27T09:41:00-05:00");
    expect(parsed.photos).toEqual([]);
  });

  it.each([
    ["clientSubmissionId", { clientSubmissionId: "not-a-uuid" }, "clientSubmissionId must be a UUID made by the client"],
    ["eventDate", { eventDate: "27/04/2025" }, "Enter the date and time as 2025-04-27T09:41-05:00"],
    ["eventDate", { eventDate: "2999-04-27T09:41:00Z" }, "The date cannot be in the future"],
    ["eventDate", { eventDate: "2025-02-30T09:41:00Z" }, "This is not a real date"],
    // WGS84 ranges, Darwin Core decimalLatitude −90…90 and decimalLongitude −180…180 (TDWG term list).
    ["decimalLatitude", { decimalLatitude: 90.5 }, "Latitude runs from -90 to 90"],
    ["decimalLongitude", { decimalLongitude: -181 }, "Longitude runs from -180 to 180"],
    // Darwin Core: coordinateUncertaintyInMeters of zero is not valid (TDWG term list).
    ["coordinateUncertaintyInMeters", { coordinateUncertaintyInMeters: 0 }, "Uncertainty is at least 1 m"],
    ["caste", { caste: "drone" }, "Choose queen, worker, male or not sure"],
    ["beeIdentificationConfidence", { beeIdentificationConfidence: "" }, "Choose how sure you are of the bee"],
    ["behavior", { behavior: "dancing" }, "Choose what the bee was doing"],
    ["occurrenceRemarks", { occurrenceRemarks: "x".repeat(2001) }, "Use at most 2000 characters"],
    ["plantTaxonId", { plantScientificName: undefined }, "Choose the plant, or say you could not identify it"],
    ["plantTaxonId", { plantNotIdentified: true, photos: [{ key: "k", subject: "plant" }] }, "Either choose a plant or say it is not identified, not both"],
    ["photos", { plantScientificName: undefined, plantNotIdentified: true }, "Add at least one photo of the plant, so a botanist can identify it"],
    ["photos", { photos: [{ key: "a", subject: "bee" }, { key: "a", subject: "bee" }] }, "The same photo is attached twice"],
    ["decimalLatitude", { decimalLatitude: undefined, decimalLongitude: undefined }, "Give the place: use your location, a photo's location, or choose a site"],
    ["decimalLongitude", { decimalLongitude: undefined }, "Give both latitude and longitude"],
  ])("refuses a bad %s with its message (%j)", (field, change, message) => {
    expect(messagesFor(field, change)).toContain(message);
  });

  it("reports every problem at once, field checks and cross-field checks together", () => {
    const result = visitInput.safeParse({ ...valid, caste: "", plantScientificName: undefined });
    const fields = result.error!.issues.map((issue) => issue.path[0]);
    expect(fields).toContain("caste");
    expect(fields).toContain("plantTaxonId");
  });

  it("accepts a site in place of coordinates", () => {
    expect(visitInput.safeParse({ ...valid, decimalLatitude: "", decimalLongitude: "", siteId: "3" }).success).toBe(true);
  });
});
