import { z } from "zod";

/** Values and row shapes of the checklists in data/, shared by the seeder, API and forms. */
export const REGIONAL_STATUSES = ["native", "introduced", "invasive"] as const;
export const GROWTH_FORMS = ["tree", "shrub", "forb", "graminoid", "vine"] as const;
export const TAXON_RANKS = ["species", "subspecies", "variety"] as const;

export type RegionalStatus = (typeof REGIONAL_STATUSES)[number];
export type GrowthForm = (typeof GROWTH_FORMS)[number];
export type TaxonRank = (typeof TAXON_RANKS)[number];

/** "a | b | c" in a CSV cell → ["a", "b", "c"]; an empty cell → []. */
const nameList = z
  .string()
  .transform((cell) => cell.split("|").map((name) => name.trim()).filter(Boolean));

const month = z.coerce
  .number({ message: "must be a month number" })
  .int("must be a whole month number")
  .min(1, "months run 1–12")
  .max(12, "months run 1–12");

const scientificName = z
  .string()
  .trim()
  .min(3, "is required")
  .regex(/^[A-Z][a-z-]+ (×\s?)?[a-z-]+( (var\.|subsp\.) [a-z-]+)?$/, "is not a binomial or trinomial without authorship");

export const plantChecklistRow = z
  .object({
    scientificName,
    scientificNameAuthorship: z.string().trim().default(""),
    family: z.string().trim().regex(/^[A-Z][a-z]+aceae$/, "is not a family name (…aceae)"),
    genus: z.string().trim().min(2, "is required"),
    taxonRank: z.enum(TAXON_RANKS, { message: `must be one of ${TAXON_RANKS.join(", ")}` }),
    vernacularNames: nameList.refine((names) => names.length > 0, "needs at least one common name"),
    synonyms: nameList,
    regionalStatus: z.enum(REGIONAL_STATUSES, { message: `must be one of ${REGIONAL_STATUSES.join(", ")}` }),
    growthForm: z.enum(GROWTH_FORMS, { message: `must be one of ${GROWTH_FORMS.join(", ")}` }),
    bloomStart: month,
    bloomEnd: month,
    sourceNote: z.string().trim().min(1, "is required: say where the facts come from"),
  })
  .superRefine((row, ctx) => {
    if (row.scientificName.split(" ")[0] !== row.genus) {
      ctx.addIssue({ code: "custom", path: ["genus"], message: `must be the first word of the scientific name (${row.scientificName})` });
    }
    if (row.bloomStart > row.bloomEnd) {
      ctx.addIssue({ code: "custom", path: ["bloomEnd"], message: "bloom ends before it starts" });
    }
  });

export type PlantChecklistRow = z.output<typeof plantChecklistRow>;

export const beeChecklistRow = z.object({
  scientificName: scientificName.refine((name) => name.startsWith("Bombus "), "is not a Bombus species"),
  scientificNameAuthorship: z.string().trim().default(""),
  subgenus: z.string().trim().min(2, "is required"),
  vernacularNames: nameList.refine((names) => names.length > 0, "needs at least one common name"),
  sensitive: z.enum(["true", "false"], { message: "must be true or false" }).transform((v) => v === "true"),
  sensitivityNote: z.string().trim().default(""),
});

export type BeeChecklistRow = z.output<typeof beeChecklistRow>;
