// Bands and season windows of the bumble-bee year. Pure module, shared by browser and server.
//
// The PostgreSQL functions `forage_band` and `forage_season` (migrations) apply the same rules
// inside the rollup trigger; tests/integration/forage-rollup.test.ts holds the two to each other.

import { z } from "zod";

export const BANDS = ["north", "south"] as const;
export type Band = (typeof BANDS)[number];
export const BAND_LABELS: Record<Band, string> = { north: "North (42° N and above)", south: "South (below 42° N)" };

/** The latitude where the north band starts (common practice, no published source). */
export const NORTH_BAND_FROM_LATITUDE = 42.0;

export function bandOf(decimalLatitude: number): Band {
  return decimalLatitude >= NORTH_BAND_FROM_LATITUDE ? "north" : "south";
}

export const SEASON_NAMES = ["early-spring", "second-wave", "overwinter"] as const;
export type SeasonName = (typeof SEASON_NAMES)[number];
export const SEASON_LABELS: Record<SeasonName, string> = {
  "early-spring": "Early spring (queens emerge)",
  "second-wave": "Second wave (new queens)",
  overwinter: "Overwintering (queens hidden)",
};

/** A day of the year without a year: "04-20" is 20 April. */
export type MonthDay = `${number}-${number}`;

export interface SeasonWindow {
  band: Band;
  name: SeasonName;
  /** First day, inclusive, "MM-DD". */
  start: string;
  /** Last day, inclusive, "MM-DD"; before `start` when the window runs over New Year. */
  end: string;
}

/**
 * The defaults a programme starts with, per band (facts of the trade as practitioners state
 * them, no single published source): spring queens from early April in the south and late
 * April into May in the north; new queens in August–September; queens overwinter
 * October–March. "Late April" is read as 20 April. A coordinator can change every date.
 */
export const DEFAULT_SEASON_WINDOWS: readonly SeasonWindow[] = [
  { band: "south", name: "early-spring", start: "04-01", end: "05-31" },
  { band: "south", name: "second-wave", start: "08-01", end: "09-30" },
  { band: "south", name: "overwinter", start: "10-01", end: "03-31" },
  { band: "north", name: "early-spring", start: "04-20", end: "05-31" },
  { band: "north", name: "second-wave", start: "08-01", end: "09-30" },
  { band: "north", name: "overwinter", start: "10-01", end: "03-31" },
];

const DAYS_IN_MONTH = [31, 29, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** "MM-DD" → month*100 + day, or null when it is not a day of the year (29 February is). */
export function monthDayNumber(value: string): number | null {
  const match = /^(\d{2})-(\d{2})$/.exec(value);
  if (!match) return null;
  const month = Number(match[1]);
  const day = Number(match[2]);
  if (month < 1 || month > 12 || day < 1 || day > DAYS_IN_MONTH[month - 1]!) return null;
  return month * 100 + day;
}

/** Whether a month-day number falls in [start, end], wrapping over New Year when end < start. */
function withinWindow(day: number, start: number, end: number): boolean {
  return start <= end ? day >= start && day <= end : day >= start || day <= end;
}

/** The season a local date ("YYYY-MM-DD") falls in for a band, or null between seasons. */
export function seasonOf(localDate: string, band: Band, windows: readonly SeasonWindow[]): SeasonName | null {
  const day = Number(localDate.slice(5, 7)) * 100 + Number(localDate.slice(8, 10));
  for (const window of windows) {
    if (window.band !== band) continue;
    const start = monthDayNumber(window.start);
    const end = monthDayNumber(window.end);
    if (start !== null && end !== null && withinWindow(day, start, end)) return window.name;
  }
  return null;
}

/** The months (1–12) a window touches, in calendar order of the window. */
export function monthsOfWindow(window: Pick<SeasonWindow, "start" | "end">): number[] {
  const first = Number(window.start.slice(0, 2));
  const last = Number(window.end.slice(0, 2));
  const months: number[] = [];
  for (let month = first; ; month = (month % 12) + 1) {
    months.push(month);
    if (month === last || months.length === 12) break;
  }
  return months;
}

const monthDay = z
  .string()
  .trim()
  .refine((value) => monthDayNumber(value) !== null, "must be a day of the year written MM-DD, e.g. 04-20");

export const seasonWindowSchema = z.object({
  band: z.enum(BANDS),
  name: z.enum(SEASON_NAMES),
  start: monthDay,
  end: monthDay,
});

/** Every band × season exactly once, and no two seasons of a band sharing a day. */
export const seasonWindowsSchema = z.array(seasonWindowSchema).superRefine((windows, ctx) => {
  for (const band of BANDS) {
    for (const name of SEASON_NAMES) {
      const count = windows.filter((w) => w.band === band && w.name === name).length;
      if (count !== 1) ctx.addIssue({ code: "custom", message: `${band} band needs exactly one ${name} window`, path: [] });
    }
    // A window with an unreadable date has its own message from seasonWindowSchema already.
    const ofBand = windows.filter((w) => w.band === band && monthDayNumber(w.start) !== null && monthDayNumber(w.end) !== null);
    for (let i = 0; i < ofBand.length; i++) {
      for (let j = i + 1; j < ofBand.length; j++) {
        const a = ofBand[i]!;
        const b = ofBand[j]!;
        if (windowsOverlap(a, b)) {
          ctx.addIssue({
            code: "custom",
            message: `In the ${band} band, ${a.name} (${a.start} to ${a.end}) and ${b.name} (${b.start} to ${b.end}) share days: a day can belong to one season only`,
            path: [windows.indexOf(b), "start"],
          });
        }
      }
    }
  }
});

function windowsOverlap(a: Pick<SeasonWindow, "start" | "end">, b: Pick<SeasonWindow, "start" | "end">): boolean {
  const [as, ae, bs, be] = [a.start, a.end, b.start, b.end].map((v) => monthDayNumber(v)!);
  // Two arcs on the year's circle overlap when either one's start lies within the other.
  return withinWindow(bs!, as!, ae!) || withinWindow(as!, bs!, be!);
}
