// The query parameters of the forage API, shared by the API routes and anything that builds
// their URLs. Pure module.

import { z } from "zod";
import { CASTES } from "../visits/vocabulary.ts";
import { SEASON_NAMES } from "./seasons.ts";

/** The name under which the matrix shows visits whose bee was left at genus level. */
export const UNIDENTIFIED_BEE_NAME = "Bombus sp.";

const emptyAsUndefined = (value: unknown) => (value === "" || value === null ? undefined : value);

const year = z.preprocess(
  emptyAsUndefined,
  z.coerce.number({ error: "must be a year" }).int("must be a whole year").min(1900, "must be 1900 or later").max(2100, "must be 2100 or earlier").optional(),
);

const monthList = z.preprocess(
  emptyAsUndefined,
  z
    .string()
    .regex(/^\s*\d{1,2}(\s*,\s*\d{1,2})*\s*$/, "must be months 1–12 separated by commas, e.g. 4,5")
    .transform((value) => [...new Set(value.split(",").map((m) => Number(m.trim())))].sort((a, b) => a - b))
    .refine((months) => months.every((m) => m >= 1 && m <= 12), "must be months 1–12 separated by commas, e.g. 4,5")
    .optional(),
);

const common = {
  bee: z.preprocess(emptyAsUndefined, z.string().trim().min(1).max(200, "is longer than 200 characters").optional()),
  band: z.preprocess(emptyAsUndefined, z.enum(["north", "south", "all"], { error: "must be north, south or all" }).default("all")),
  from: year,
  to: year,
  determination: z.preprocess(emptyAsUndefined, z.enum(["confirmed", "any"], { error: "must be confirmed or any" }).default("confirmed")),
  months: monthList,
};

const yearsInOrder = (query: { from?: number; to?: number }) => query.from === undefined || query.to === undefined || query.from <= query.to;
const yearsMessage = { message: "must not be after to", path: ["from"] };

export const matrixQuery = z
  .object({
    ...common,
    caste: z.preprocess(emptyAsUndefined, z.enum(CASTES, { error: `must be one of ${CASTES.join(", ")}` }).optional()),
  })
  .refine(yearsInOrder, yearsMessage);
export type MatrixQuery = z.output<typeof matrixQuery>;

export const rankingQuery = z
  .object({
    ...common,
    caste: z.preprocess(emptyAsUndefined, z.enum(CASTES, { error: `must be one of ${CASTES.join(", ")}` }).default("queen")),
    window: z.preprocess(emptyAsUndefined, z.enum(SEASON_NAMES, { error: `must be one of ${SEASON_NAMES.join(", ")}` }).optional()),
  })
  .refine(yearsInOrder, yearsMessage)
  .refine((query) => !(query.window && query.months), { message: "give a window or months, not both", path: ["window"] })
  // A ranking is always of a part of the year: the early-spring window unless told otherwise.
  .transform((query) => ({ ...query, window: query.months ? undefined : (query.window ?? "early-spring") }));
export type RankingQuery = z.output<typeof rankingQuery>;

export const seasonQuery = z
  .object({ from: common.from, to: common.to, determination: common.determination })
  .refine(yearsInOrder, yearsMessage);
export type SeasonQuery = z.output<typeof seasonQuery>;
