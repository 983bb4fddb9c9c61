import { describe, expect, it } from "vitest";
import { floralCountListQuery, floralSurveyFormToInput, floralSurveyInput, latestCalendarDate, surveyFieldErrors } from "./floral-count-schema";

const valid = {
  siteId: "3",
  surveyDate: "2025-04-27",
  rows: [
    { plantTaxonId: "12", floweringUnits: "140" },
    { plantTaxonId: "40", floweringUnits: "0" },
  ],
  remarks: "",
};

/** The messages for one field path when `change` is applied to a valid survey. */
function messagesFor(path: string, change: Record<string, unknown>) {
  const result = floralSurveyInput.safeParse({ ...valid, ...change });
  expect(result.success, `expected ${JSON.stringify(change)} to be refused`).toBe(false);
  return surveyFieldErrors(result.error!)[path] ?? [];
}

const rows = (count: number) => Array.from({ length: count }, (_, i) => ({ plantTaxonId: String(i + 1), floweringUnits: "5" }));

describe("the floral survey schema shared by the form and the server", () => {
  it("accepts a survey typed into the form and turns the numbers into numbers", () => {
    expect(floralSurveyInput.parse(valid)).toEqual({
      siteId: 3,
      surveyDate: "2025-04-27",
      rows: [
        { plantTaxonId: 12, floweringUnits: 140 },
        { plantTaxonId: 40, floweringUnits: 0 },
      ],
      remarks: "",
    });
  });

  it.each([
    // The brief's limits: 1..200 rows, units 0..1,000,000, remarks ≤ 2000 characters.
    ["siteId", { siteId: "" }, "Choose the site you counted at"],
    ["siteId", { siteId: "nowhere" }, "Choose the site you counted at"],
    ["surveyDate", { surveyDate: undefined }, "Enter the date of the count"],
    ["surveyDate", { surveyDate: "" }, "Enter the date of the count"],
    ["surveyDate", { surveyDate: "27/04/2025" }, "Enter the date as 2025-04-27"],
    // 2025 is not a leap year (Gregorian calendar rule), so 29 February 2025 does not exist.
    ["surveyDate", { surveyDate: "2025-02-29" }, "This is not a real date"],
    ["surveyDate", { surveyDate: "2999-04-27" }, "The date cannot be in the future"],
    ["surveyDate", { surveyDate: "1899-12-31" }, "The date is before 1900"],
    ["rows", { rows: [] }, "Add at least one plant"],
    ["rows", { rows: undefined }, "Add at least one plant"],
    ["rows", { rows: rows(201) }, "At most 200 plants in one survey"],
    ["rows.1.plantTaxonId", { rows: [{ plantTaxonId: "4", floweringUnits: "3" }, { plantTaxonId: "", floweringUnits: "3" }] }, "Choose the plant from the checklist"],
    ["rows.0.floweringUnits", { rows: [{ plantTaxonId: "4", floweringUnits: "" }] }, "Enter how many flowering units you counted (0 if none were open)"],
    ["rows.0.floweringUnits", { rows: [{ plantTaxonId: "4", floweringUnits: "12.5" }] }, "Enter a whole number of flowering units, e.g. 120"],
    ["rows.0.floweringUnits", { rows: [{ plantTaxonId: "4", floweringUnits: "lots" }] }, "Enter a whole number of flowering units, e.g. 120"],
    ["rows.0.floweringUnits", { rows: [{ plantTaxonId: "4", floweringUnits: -1 }] }, "Flowering units cannot be fewer than 0"],
    ["rows.0.floweringUnits", { rows: [{ plantTaxonId: "4", floweringUnits: "1000001" }] }, "At most 1,000,000 flowering units per plant; for more, estimate per square metre and say so in the remarks"],
    ["rows.2.plantTaxonId", { rows: [{ plantTaxonId: "4", floweringUnits: "3" }, { plantTaxonId: "5", floweringUnits: "3" }, { plantTaxonId: "4", floweringUnits: "9" }] }, "This plant is already plant 1; count each plant once per survey"],
    ["remarks", { remarks: "x".repeat(2001) }, "Use at most 2000 characters"],
  ])("refuses a bad %s with its message (%j)", (path, change, message) => {
    expect(messagesFor(path, change)).toContain(message);
  });

  it("accepts the limits themselves: 200 rows, 0 and 1,000,000 units, 2000 characters of remarks", () => {
    // Edges of the brief's ranges (inclusive).
    expect(floralSurveyInput.safeParse({ ...valid, rows: rows(200), remarks: "x".repeat(2000) }).success).toBe(true);
    expect(floralSurveyInput.safeParse({ ...valid, rows: [{ plantTaxonId: 1, floweringUnits: 0 }, { plantTaxonId: 2, floweringUnits: 1_000_000 }] }).success).toBe(true);
  });

  it("reports every problem at once, a duplicate plant beside a missing number", () => {
    const result = floralSurveyInput.safeParse({ ...valid, siteId: "", rows: [{ plantTaxonId: "4", floweringUnits: "" }, { plantTaxonId: "4", floweringUnits: "2" }] });
    const fields = surveyFieldErrors(result.error!);
    expect(Object.keys(fields).sort()).toEqual(["rows.0.floweringUnits", "rows.1.plantTaxonId", "siteId"]);
  });

  it("says a refused date only once, not also as a future or too-early one", () => {
    expect(messagesFor("surveyDate", { surveyDate: "27/04/2025" })).toEqual(["Enter the date as 2025-04-27"]);
  });

  it("takes today anywhere on Earth as not in the future", () => {
    // UTC+14 is the earliest zone (Line Islands, Kiribati; IANA tz database Pacific/Kiritimati).
    expect(latestCalendarDate(Date.UTC(2025, 3, 27, 9, 59))).toBe("2025-04-27");
    expect(latestCalendarDate(Date.UTC(2025, 3, 27, 10, 0))).toBe("2025-04-28");
  });

  it("reads the posted form row by row, keeping rows whose plant is missing", () => {
    const form = new FormData();
    form.set("siteId", "3");
    form.set("surveyDate", "2025-04-27");
    form.append("plantTaxonId", "12");
    form.append("floweringUnits", "140");
    form.append("plantTaxonId", "");
    form.append("floweringUnits", "7");
    expect(floralSurveyFormToInput(form)).toEqual({
      siteId: "3",
      surveyDate: "2025-04-27",
      remarks: undefined,
      rows: [
        { plantTaxonId: "12", floweringUnits: "140" },
        { plantTaxonId: "", floweringUnits: "7" },
      ],
    });
  });

  it("ignores bad list filters instead of failing the page (common practice, no source)", () => {
    expect(floralCountListQuery.parse({ site: "x", from: "2025-13-01", to: "2025-05-31", page: "-2" })).toEqual({ site: undefined, from: undefined, to: "2025-05-31", page: 1 });
  });
});
