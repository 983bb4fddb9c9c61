// What the forage pages show, read from and written to the address bar, so that a view can be
// bookmarked or sent to someone. Pure module.
//
// Reading is forgiving: a value the page does not know is dropped and its default used, because
// a shared link may be old or hand-edited. The API itself answers 400 to what it cannot accept
// (a year range the wrong way round, say), and the pages show that message.

import { SEASON_NAMES, type SeasonName } from "./seasons";
import { CASTES, type Caste } from "~/visits/vocabulary";

export const BAND_CHOICES = ["north", "south", "all"] as const;
export type BandChoice = (typeof BAND_CHOICES)[number];
export const BAND_CHOICE_LABELS: Record<BandChoice, string> = {
  north: "North (≥ 42° N)",
  south: "South (< 42° N)",
  all: "Both bands",
};

/** Which determinations count as evidence: confirmed (or corrected) ones, or every record. */
export const EVIDENCE_CHOICES = ["confirmed", "any"] as const;
export type EvidenceChoice = (typeof EVIDENCE_CHOICES)[number];
export const EVIDENCE_LABELS: Record<EvidenceChoice, string> = {
  confirmed: "Confirmed determinations only",
  any: "All records, proposed ones too",
};

export const MATRIX_VIEWS = ["bee-plant", "plant-month"] as const;
export type MatrixView = (typeof MATRIX_VIEWS)[number];
export const MATRIX_VIEW_LABELS: Record<MatrixView, string> = {
  "bee-plant": "Bees × plants",
  "plant-month": "Plants × months",
};

export const MATRIX_DISPLAYS = ["heatmap", "table"] as const;
export type MatrixDisplay = (typeof MATRIX_DISPLAYS)[number];

/** Filters shared by every forage page. */
export interface CommonFilters {
  /** First and last year, inclusive. */
  from?: number;
  to?: number;
  determination: EvidenceChoice;
}

export interface MatrixParams extends CommonFilters {
  view: MatrixView;
  display: MatrixDisplay;
  /** A bee's scientific name ("Bombus sp." for bumble bees not identified to species). */
  bee?: string;
  caste?: Caste;
  band: BandChoice;
  /** Months 1–12 in calendar order; empty means the whole year. */
  months: number[];
}

export interface RankingParams extends CommonFilters {
  bee?: string;
  /** The API ranks one caste at a time (queens unless told otherwise). */
  caste: Caste;
  band: BandChoice;
  window: SeasonName;
  /** When not empty, these months replace the season window. */
  months: number[];
}

export interface SeasonParams extends CommonFilters {
  /** Workers, males and unknown caste beside the queens. */
  allCastes: boolean;
}

type Params = URLSearchParams | Record<string, string | undefined>;

function get(params: Params, key: string): string | undefined {
  // Months may come as several parameters (a form's checkboxes); everything else is single.
  const value = params instanceof URLSearchParams ? (key === "months" ? params.getAll(key).join(",") : params.get(key)) ?? undefined : params[key];
  const trimmed = value?.trim();
  return trimmed ? trimmed : undefined;
}

function oneOf<T extends string>(choices: readonly T[], value: string | undefined, fallback: T): T;
function oneOf<T extends string>(choices: readonly T[], value: string | undefined): T | undefined;
function oneOf<T extends string>(choices: readonly T[], value: string | undefined, fallback?: T): T | undefined {
  return value !== undefined && (choices as readonly string[]).includes(value) ? (value as T) : fallback;
}

/** A four-digit year, or undefined. */
export function parseYear(value: string | undefined): number | undefined {
  if (value === undefined || !/^\d{4}$/.test(value)) return undefined;
  return Number(value);
}

/**
 * "4,5" (or several `months` parameters, as a form of checkboxes sends them) → [4, 5]: months
 * 1–12, each once, in calendar order; anything else is dropped.
 */
export function parseMonths(value: string | undefined): number[] {
  if (!value) return [];
  const months = new Set<number>();
  for (const part of value.split(",")) {
    const text = part.trim();
    if (!/^\d{1,2}$/.test(text)) continue;
    const month = Number(text);
    if (month >= 1 && month <= 12) months.add(month);
  }
  return [...months].sort((a, b) => a - b);
}

function parseCommon(params: Params): CommonFilters {
  return {
    from: parseYear(get(params, "from")),
    to: parseYear(get(params, "to")),
    determination: oneOf(EVIDENCE_CHOICES, get(params, "determination"), "confirmed"),
  };
}

export function parseMatrixParams(params: Params): MatrixParams {
  return {
    ...parseCommon(params),
    view: oneOf(MATRIX_VIEWS, get(params, "view"), "bee-plant"),
    display: oneOf(MATRIX_DISPLAYS, get(params, "display"), "heatmap"),
    bee: get(params, "bee"),
    caste: oneOf(CASTES, get(params, "caste")),
    band: oneOf(BAND_CHOICES, get(params, "band"), "all"),
    months: parseMonths(get(params, "months")),
  };
}

export function parseRankingParams(params: Params): RankingParams {
  return {
    ...parseCommon(params),
    bee: get(params, "bee"),
    caste: oneOf(CASTES, get(params, "caste"), "queen"),
    band: oneOf(BAND_CHOICES, get(params, "band"), "north"),
    window: oneOf(SEASON_NAMES, get(params, "window"), "early-spring"),
    months: parseMonths(get(params, "months")),
  };
}

export function parseSeasonParams(params: Params): SeasonParams {
  return { ...parseCommon(params), allCastes: get(params, "castes") === "all" };
}

/** Builds search params in a fixed key order, leaving out what is unset. */
function build(entries: [string, string | number | undefined | null | false][]): URLSearchParams {
  const search = new URLSearchParams();
  for (const [key, value] of entries) {
    if (value !== undefined && value !== null && value !== false && value !== "") search.set(key, String(value));
  }
  return search;
}

const monthList = (months: readonly number[]) => (months.length ? months.join(",") : undefined);
const unlessDefault = <T>(value: T, fallback: T) => (value === fallback ? undefined : value);

/** The page's own address: defaults left out, so that the plain page has a plain URL. */
export function matrixSearch(p: MatrixParams): URLSearchParams {
  return build([
    ["view", unlessDefault(p.view, "bee-plant")],
    ["display", unlessDefault(p.display, "heatmap")],
    ["bee", p.bee],
    ["caste", p.caste],
    ["band", unlessDefault(p.band, "all")],
    ["months", monthList(p.months)],
    ["from", p.from],
    ["to", p.to],
    ["determination", unlessDefault(p.determination, "confirmed")],
  ]);
}

/** The API's query for the matrix: the filters only (the view and display are the page's). */
export function matrixApiSearch(p: MatrixParams): URLSearchParams {
  return build([
    ["bee", p.bee],
    ["caste", p.caste],
    ["band", p.band],
    ["from", p.from],
    ["to", p.to],
    ["determination", p.determination],
    ["months", monthList(p.months)],
  ]);
}

export function rankingSearch(p: RankingParams): URLSearchParams {
  return build([
    ["bee", p.bee],
    ["caste", unlessDefault(p.caste, "queen")],
    ["band", unlessDefault(p.band, "north")],
    // Months replace the window; a window left in the address would mislead whoever reads it.
    ["window", p.months.length ? undefined : unlessDefault(p.window, "early-spring")],
    ["months", monthList(p.months)],
    ["from", p.from],
    ["to", p.to],
    ["determination", unlessDefault(p.determination, "confirmed")],
  ]);
}

export function rankingApiSearch(p: RankingParams): URLSearchParams {
  return build([
    ["bee", p.bee],
    ["caste", p.caste],
    ["band", p.band],
    ["window", p.months.length ? undefined : p.window],
    ["months", monthList(p.months)],
    ["from", p.from],
    ["to", p.to],
    ["determination", p.determination],
  ]);
}

export function seasonSearch(p: SeasonParams): URLSearchParams {
  return build([
    ["from", p.from],
    ["to", p.to],
    ["determination", unlessDefault(p.determination, "confirmed")],
    ["castes", p.allCastes ? "all" : undefined],
  ]);
}

export function seasonApiSearch(p: SeasonParams): URLSearchParams {
  return build([
    ["from", p.from],
    ["to", p.to],
    ["determination", p.determination],
  ]);
}

/** "?a=1" or "" for an empty query, for links and fetches. */
export function withQuery(path: string, search: URLSearchParams): string {
  const query = search.toString();
  return query ? `${path}?${query}` : path;
}

const CASTE_PLURALS: Record<Caste, string> = { queen: "queens", worker: "workers", male: "males", unknown: "caste not sure" };

function describeYears(p: CommonFilters): string {
  if (p.from !== undefined && p.to !== undefined) return p.from === p.to ? `${p.from}` : `${p.from}–${p.to}`;
  if (p.from !== undefined) return `${p.from} onwards`;
  if (p.to !== undefined) return `up to ${p.to}`;
  return "all years";
}

const MONTH_SHORT = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];
const describeMonthList = (months: readonly number[]) => months.map((m) => MONTH_SHORT[m - 1]).join(", ");

/** One line saying what the matrix shows, for the top of the page and the table's caption. */
export function describeMatrixFilters(p: MatrixParams): string {
  return [
    p.bee ?? "all bumble bees",
    p.caste ? CASTE_PLURALS[p.caste] : "every caste",
    p.band === "all" ? "both bands" : `${p.band} band`,
    p.months.length ? describeMonthList(p.months) : "whole year",
    describeYears(p),
    p.determination === "confirmed" ? "confirmed determinations" : "all records",
  ].join(" · ");
}

export function describeRankingFilters(p: RankingParams, windowLabel: string): string {
  return [
    p.bee ?? "all bumble bees",
    CASTE_PLURALS[p.caste],
    p.band === "all" ? "both bands" : `${p.band} band`,
    p.months.length ? describeMonthList(p.months) : windowLabel,
    describeYears(p),
    p.determination === "confirmed" ? "confirmed determinations" : "all records",
  ].join(" · ");
}

export function describeSeasonFilters(p: SeasonParams): string {
  return [describeYears(p), p.determination === "confirmed" ? "confirmed determinations" : "all records"].join(" · ");
}
