// Planting recommendation: which plants of the regional checklist to sow so that bumble bees
// find enough species in flower in every month of the season. Pure module (no database, no
// request), shared by the form and `GET /api/planting/recommendation`.
//
// Why a minimum per month. The USDA NRCS Pollinator Habitat (CP42) job sheet (Indiana, 2012)
// asks for at least 3 species in flower in each of three bloom periods (early, mid, late). We
// apply the count to every month of the season instead, which is stricter: a bloom period
// of two or three months can meet the job sheet and still leave one month bare, and bees need
// food in every month, not on average (our reading, no source for the per-month rule).
//
// Why greedy. The choice is a covering problem (every month needs k species, each species
// covers the months it flowers in). We pick one species at a time by a fixed order of
// preference, so each pick can be explained to a coordinator in one sentence and the result is
// the same on the server and in the browser. Greedy can pick a species early that later picks
// make unnecessary, so a second pass drops such species (the weakest first), and the freed
// places, if a size limit binds, go back to the greedy step. The result is irredundant: no
// listed species can be dropped without some season month falling below the minimum. It is not
// always the shortest possible list; a shortest list would trade away the order of preference,
// which is the point of the tool.
//
// The order of preference, and why:
// 1. A species that fills a place still open in an early-spring month comes first. Queens leave
//    hibernation then and found their colonies alone on what is in flower; woodland and
//    woody-edge plants feed them in spring (Mola et al. 2021, BioScience 71:1234–1248, from the
//    project's reference list, not re-read here). A queen that finds no food founds no colony
//    (common practice, no source), so when the list size is limited, spring is filled first.
// 2. Then forage evidence from the programme's own records: plants ranked by the Wilson lower
//    limit of their share of early-spring visits (~/forage/ranking), higher first, because it
//    is the share we can be fairly sure of. Plants without records come after those with them;
//    absence of records is not evidence of poor forage, but we cannot say more. Evidence comes
//    before how many open months a species fills: a well-supported plant is worth a longer
//    list, and the second pass drops what later picks made unnecessary.
// 3. Then bloom length, longer first: a longer bloom reaches into the edges of the months and
//    fills more of them.
// 4. Then scientific name and id, compared by code units, so the order is the same in every
//    locale and does not depend on the order the candidates arrive in.
// Among species that fill no open place at all, none is picked.
//
// Invasive taxa are never recommended, whatever the options: planting them spreads them.
// Introduced taxa only when the caller lifts `nativeOnly` (the default keeps to natives; the
// CP42 job sheet asks for at least 7 of 9 species native, we ask for all unless told).

import { z } from "zod";
import { BANDS, DEFAULT_SEASON_WINDOWS, monthsOfWindow, type Band, type SeasonWindow } from "~/forage/seasons";
import { MONTH_NAMES, bloomMonths } from "~/taxa/bloom";
import { GROWTH_FORMS, type GrowthForm, type RegionalStatus } from "~/taxa/checklist-schema";

/** At least 3 species per bloom period: USDA NRCS CP42 job sheet (Indiana, 2012); applied per month. */
export const DEFAULT_MIN_PER_MONTH = 3;
export const MAX_MIN_PER_MONTH = 10;
/** The longest list a request may ask for; longer lists are not a planting plan anyone sows. */
export const MAX_LIST_SIZE = 60;
/** April–September: the months bumble-bee colonies are active in the region (common practice, no source). */
export const DEFAULT_SEASON = { start: 4, end: 9 } as const;

/** The forage ranking of a plant for the band's early-spring window (see rankForage). */
export interface ForageEvidence {
  rank: number;
  visits: number;
  /** Wilson 95 % lower and upper limits of the plant's share of visits. */
  wilsonLow: number;
  wilsonHigh: number;
  fewRecords: boolean;
}

/** A checklist taxon the recommendation may choose; extra fields pass through to the result. */
export interface PlantingCandidate {
  id: number | string;
  scientificName: string;
  family: string;
  growthForm: GrowthForm;
  regionalStatus: RegionalStatus;
  /** Months 1–12; a range that runs over New Year (start > end) is read as bloomMonths does. */
  bloomStart: number;
  bloomEnd: number;
  evidence?: ForageEvidence | null;
}

export interface RecommendedSpecies<T extends PlantingCandidate = PlantingCandidate> {
  taxon: T;
  /** Why it is on the list, in plain words. */
  reason: string;
  /** The season months it flowers in, ascending. */
  monthsCovered: number[];
}

export interface MonthCoverage {
  month: number;
  /** Listed species in flower that month. */
  count: number;
  met: boolean;
}

export interface UnmetMonth {
  month: number;
  count: number;
  needed: number;
  why: string;
}

export interface PlantingRecommendation<T extends PlantingCandidate = PlantingCandidate> {
  /** In the order they were chosen: the most wanted first. */
  species: RecommendedSpecies<T>[];
  /** Every season month, in calendar order. */
  perMonth: MonthCoverage[];
  /** The season months below the minimum, each with the reason. */
  unmet: UnmetMonth[];
  /** The months given priority (the band's early-spring window unless the caller gave others). */
  earlySpringMonths: number[];
}

// Query strings and forms send "" for a field left empty; that means "use the default".
const blankToUndefined = (value: unknown) =>
  value === null || (typeof value === "string" && value.trim() === "") ? undefined : value;

const SEASON_MESSAGE = "Write the season as first and last month, e.g. 4-9 for April to September";

const seasonMonths = z.preprocess(
  blankToUndefined,
  z
    .string({ message: SEASON_MESSAGE })
    .default(`${DEFAULT_SEASON.start}-${DEFAULT_SEASON.end}`)
    .transform((value, ctx) => {
      const match = /^\s*(\d{1,2})\s*(?:-\s*(\d{1,2})\s*)?$/.exec(value);
      const start = match ? Number(match[1]) : NaN;
      const end = match ? Number(match[2] ?? match[1]) : NaN;
      if (!(start >= 1 && start <= 12 && end >= 1 && end <= 12)) {
        ctx.issues.push({ code: "custom", message: `${SEASON_MESSAGE}; months run 1–12`, input: value });
        return z.NEVER;
      }
      if (start > end) {
        // A season over New Year has no bumble bees flying in this region; refusing it keeps
        // "11-2" from being read as a typo for "2-11".
        ctx.issues.push({ code: "custom", message: `${SEASON_MESSAGE}; the first month cannot come after the last`, input: value });
        return z.NEVER;
      }
      return { start, end };
    }),
);

const minPerMonth = z.preprocess(
  blankToUndefined,
  z.coerce
    .number({ message: "Give the number of species wanted in flower each month" })
    .int("Give a whole number of species per month")
    .min(1, "At least 1 species per month")
    .max(MAX_MIN_PER_MONTH, `At most ${MAX_MIN_PER_MONTH} species per month`)
    .default(DEFAULT_MIN_PER_MONTH),
);

const listSize = z.preprocess(
  blankToUndefined,
  z.coerce
    .number({ message: "Give the list size as a number" })
    .int("Give a whole number for the list size")
    .min(1, "The list needs room for at least 1 species")
    .max(MAX_LIST_SIZE, `At most ${MAX_LIST_SIZE} species in one list`)
    .optional(),
);

const growthForms = z
  .preprocess(
    (value) => {
      const given = blankToUndefined(value);
      // "forb,shrub" from a query string; an array from repeated parameters or a form.
      return typeof given === "string" ? given.split(",").map((part) => part.trim()).filter(Boolean) : given;
    },
    z.array(z.enum(GROWTH_FORMS, { message: `Growth forms are ${GROWTH_FORMS.join(", ")}` })).optional(),
  )
  // None chosen means no restriction: a form with no box ticked asks for every form.
  .transform((forms): GrowthForm[] => (forms && forms.length > 0 ? GROWTH_FORMS.filter((form) => forms.includes(form)) : [...GROWTH_FORMS]));

const nativeOnly = z.preprocess(
  (value) => {
    const given = blankToUndefined(value);
    if (given === "true") return true;
    if (given === "false") return false;
    return given;
  },
  z.boolean({ message: "nativeOnly is true or false" }).default(true),
);

const month = z.number().int().min(1).max(12);

/**
 * The request, as the form and `GET /api/planting/recommendation?band=&months=4-9&minPerMonth=3
 * &size=&forms=&nativeOnly=` send it (strings are read; empty means the default).
 * `earlySpringMonths` is not a query parameter: the server passes the programme's own
 * early-spring window (monthsOfWindow); without it the band's default window is used.
 */
export const recommendationInput = z.object({
  band: z.enum(BANDS, { message: `Choose a band: ${BANDS.join(" or ")}` }),
  months: seasonMonths,
  minPerMonth,
  size: listSize,
  forms: growthForms,
  nativeOnly,
  earlySpringMonths: z.array(month).optional(),
});

export type RecommendationRequest = z.input<typeof recommendationInput>;
export type RecommendationOptions = z.output<typeof recommendationInput>;

/** The months of a band's early-spring window (the defaults unless the programme's are given). */
export function earlySpringMonthsOf(band: Band, windows: readonly SeasonWindow[] = DEFAULT_SEASON_WINDOWS): number[] {
  const window = windows.find((w) => w.band === band && w.name === "early-spring");
  return window ? monthsOfWindow(window) : [];
}

const byCodeUnits = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

function compareIds(a: number | string, b: number | string): number {
  return typeof a === "number" && typeof b === "number" ? a - b : byCodeUnits(String(a), String(b));
}

/** Preferences 3–5 of the header, which do not change while the list grows. */
function compareStanding(a: Candidate<PlantingCandidate>, b: Candidate<PlantingCandidate>): number {
  const ea = a.taxon.evidence ?? null;
  const eb = b.taxon.evidence ?? null;
  if (ea && !eb) return -1;
  if (!ea && eb) return 1;
  if (ea && eb) {
    const byEvidence = eb.wilsonLow - ea.wilsonLow || ea.rank - eb.rank;
    if (byEvidence !== 0) return byEvidence;
  }
  return (
    b.bloomLength - a.bloomLength ||
    byCodeUnits(a.taxon.scientificName, b.taxon.scientificName) ||
    compareIds(a.taxon.id, b.taxon.id)
  );
}

interface Candidate<T extends PlantingCandidate> {
  taxon: T;
  /** Season months in flower, ascending. */
  months: number[];
  bloomLength: number;
  /** 0 for the most preferred by standing (compareStanding). */
  standing: number;
}

const monthName = (m: number): string => MONTH_NAMES[m - 1]!;
const monthShort = (m: number): string => monthName(m).slice(0, 3);

const FORM_PLURALS: Record<GrowthForm, string> = {
  tree: "trees",
  shrub: "shrubs",
  forb: "forbs",
  graminoid: "graminoids",
  vine: "vines",
};

function joinWords(words: readonly string[], last: string): string {
  return words.length <= 1 ? (words[0] ?? "") : `${words.slice(0, -1).join(", ")} ${last} ${words[words.length - 1]}`;
}

/** "native species", "native or introduced shrubs or vines": what the options allow, in words. */
function allowedPlants(options: Pick<RecommendationOptions, "forms" | "nativeOnly">, howMany: number): string {
  const status = options.nativeOnly ? "native" : "native or introduced";
  const allForms = GROWTH_FORMS.every((form) => options.forms.includes(form));
  const kinds = allForms ? "species" : joinWords(options.forms.map((form) => (howMany === 1 ? form : FORM_PLURALS[form])), "or");
  return `${status} ${kinds}`;
}

function describeBloomShort(start: number, end: number): string {
  return start === end ? `in ${monthName(start)}` : `${monthShort(start)}–${monthShort(end)}`;
}

function reasonFor(candidate: Candidate<PlantingCandidate>, earlySpring: ReadonlySet<number>): string {
  const { evidence, bloomStart, bloomEnd, regionalStatus } = candidate.taxon;
  const visits = (n: number) => `${n} ${n === 1 ? "visit" : "visits"}`;
  const parts: string[] = [];
  if (!evidence) parts.push("No early-spring forage records yet");
  else if (evidence.fewRecords) parts.push(`Rank ${evidence.rank} in early-spring forage records, from few records (${visits(evidence.visits)})`);
  else parts.push(`Rank ${evidence.rank} in early-spring forage records (${visits(evidence.visits)})`);
  const flowersForQueens = [...bloomMonths(bloomStart, bloomEnd)].some((m) => earlySpring.has(m));
  parts.push(`blooms ${describeBloomShort(bloomStart, bloomEnd)}${flowersForQueens ? ", when queens emerge" : ""}`);
  if (regionalStatus === "introduced") parts.push("introduced, not native");
  return parts.join("; ");
}

/**
 * Chooses plants so that every month of the season has `minPerMonth` listed species in flower,
 * following the order of preference in this module's header. `size`, when given, caps the list;
 * without it the list is as long as coverage needs and no longer (irredundant: every listed
 * species flowers in some season month that would fall below the minimum without it).
 * Months that cannot reach the minimum are reported in `unmet`, with the reason, and the best
 * list is still returned. Candidate ids must be distinct (a RangeError otherwise).
 */
export function recommendPlanting<T extends PlantingCandidate>(
  options: RecommendationOptions,
  candidates: readonly T[],
): PlantingRecommendation<T> {
  const seen = new Set<number | string>();
  for (const candidate of candidates) {
    if (seen.has(candidate.id)) throw new RangeError(`recommendPlanting: candidate id ${candidate.id} appears twice`);
    seen.add(candidate.id);
  }

  const { minPerMonth: needed, size } = options;
  const seasonMonths: number[] = [];
  for (let m = options.months.start; m <= options.months.end; m++) seasonMonths.push(m);
  const inSeason = new Set(seasonMonths);
  const earlySpringMonths = [...new Set(options.earlySpringMonths ?? earlySpringMonthsOf(options.band))];
  const earlySpring = new Set(earlySpringMonths);

  const allowed = candidates.filter(
    (c) =>
      c.regionalStatus !== "invasive" &&
      (c.regionalStatus === "native" || !options.nativeOnly) &&
      options.forms.includes(c.growthForm),
  );
  const pool: Candidate<T>[] = allowed
    .map((taxon) => {
      const bloom = bloomMonths(taxon.bloomStart, taxon.bloomEnd);
      return {
        taxon,
        months: [...bloom].filter((m) => inSeason.has(m)).sort((a, b) => a - b),
        bloomLength: bloom.size,
        standing: 0,
      };
    })
    .sort(compareStanding);
  pool.forEach((candidate, index) => (candidate.standing = index));

  const count = new Map(seasonMonths.map((m) => [m, 0]));
  const listed: Candidate<T>[] = [];
  const isListed = new Set<Candidate<T>>();

  const add = (candidate: Candidate<T>) => {
    listed.push(candidate);
    isListed.add(candidate);
    for (const m of candidate.months) count.set(m, count.get(m)! + 1);
  };
  const remove = (candidate: Candidate<T>) => {
    listed.splice(listed.indexOf(candidate), 1);
    isListed.delete(candidate);
    for (const m of candidate.months) count.set(m, count.get(m)! - 1);
  };

  // Preference 1 changes as the list grows; the pool is sorted by 2–4, so among equals on 1 the
  // first one met is the one wanted.
  const fillGreedily = () => {
    while (size === undefined || listed.length < size) {
      let best: Candidate<T> | undefined;
      let bestOpensSpring = false;
      for (const candidate of pool) {
        if (isListed.has(candidate)) continue;
        let gain = 0;
        let opensSpring = false;
        for (const m of candidate.months) {
          if (count.get(m)! < needed) {
            gain++;
            if (earlySpring.has(m)) opensSpring = true;
          }
        }
        if (gain === 0) continue;
        if (!best || (opensSpring && !bestOpensSpring)) {
          best = candidate;
          bestOpensSpring = opensSpring;
        }
      }
      if (!best) return;
      add(best);
    }
  };

  // A species is redundant when every season month it flowers in has more than the minimum.
  // Dropping one can make another needed again, so drop one at a time, the weakest standing
  // first, and look again.
  const dropRedundant = (): number => {
    let dropped = 0;
    for (;;) {
      let weakest: Candidate<T> | undefined;
      for (const candidate of listed) {
        if (candidate.months.every((m) => count.get(m)! > needed) && (!weakest || candidate.standing > weakest.standing)) {
          weakest = candidate;
        }
      }
      if (!weakest) return dropped;
      remove(weakest);
      dropped++;
    }
  };

  // Ends: each added species fills at least one open month place, dropping never opens one,
  // and the places are finite; a round that drops nothing has nothing new to fill.
  for (;;) {
    fillGreedily();
    if (dropRedundant() === 0) break;
  }

  const perMonth: MonthCoverage[] = seasonMonths.map((m) => ({ month: m, count: count.get(m)!, met: count.get(m)! >= needed }));
  const unmet: UnmetMonth[] = perMonth
    .filter((entry) => !entry.met)
    .map(({ month: m, count: have }) => {
      const available = pool.filter((candidate) => candidate.months.includes(m)).length;
      let why: string;
      if (available < needed) {
        why =
          available === 0
            ? `No ${allowedPlants(options, 0)} bloom in ${monthName(m)} in the checklist; ${needed} needed`
            : `Only ${available} ${allowedPlants(options, available)} ${available === 1 ? "blooms" : "bloom"} in ${monthName(m)} in the checklist; ${needed} needed`;
      } else {
        // The greedy step stops short of a month with enough species only at the size limit.
        why = `The list size limit of ${size} was reached before ${monthName(m)} had ${needed} species (it has ${have})`;
      }
      return { month: m, count: have, needed, why };
    });

  return {
    species: listed.map((candidate) => ({
      taxon: candidate.taxon,
      reason: reasonFor(candidate, earlySpring),
      monthsCovered: [...candidate.months],
    })),
    perMonth,
    unmet,
    earlySpringMonths,
  };
}
