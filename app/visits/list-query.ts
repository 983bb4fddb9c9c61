import { z } from "zod";
import { CASTES, DETERMINATION_STATUSES } from "./vocabulary";

export const VISIT_SORT_KEYS = ["eventDate", "plant", "bee", "site", "plantStatus"] as const;

const optionalPositive = z.preprocess((v) => (v === "" || v === null ? undefined : v), z.coerce.number().int().positive().optional());

/** The query string of /visits and GET /api/visits: paging, sorting and filters. */
export const visitListQuery = z.object({
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(VISIT_SORT_KEYS).default("eventDate"),
  order: z.enum(["asc", "desc"]).default("desc"),
  bee: z.preprocess((v) => (v === "" || v === null ? undefined : v), z.union([z.literal("unsure"), z.coerce.number().int().positive()]).optional()),
  plant: z.preprocess((v) => (v === "" || v === null ? undefined : v), z.union([z.literal("not_identified"), z.coerce.number().int().positive()]).optional()),
  caste: z.preprocess((v) => (v === "" ? undefined : v), z.enum(CASTES).optional()),
  status: z.preprocess((v) => (v === "" ? undefined : v), z.enum(DETERMINATION_STATUSES).optional()),
  month: z.preprocess((v) => (v === "" || v === null ? undefined : v), z.coerce.number().int().min(1).max(12).optional()),
  site: optionalPositive,
});

export type VisitListQuery = z.output<typeof visitListQuery>;
