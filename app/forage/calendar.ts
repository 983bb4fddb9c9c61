// Placing season windows ("MM-DD" to "MM-DD") on a calendar drawn as twelve equal month
// columns, and saying them in words. Pure module.

import { monthDayNumber } from "./seasons";
import { MONTH_NAMES } from "~/taxa/bloom";

// February counts 28 days: a window's edge in a drawing does not need leap years.
const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** A stretch of the year as fractions 0..1 of the calendar's width. */
export interface YearSegment {
  from: number;
  to: number;
}

/**
 * Where a day falls across twelve equal month columns: the start of its day for a window's
 * first day, the end of its day for its last. Months are drawn equal, so days are placed within
 * their own month rather than by day of the year, keeping the edges in line with the columns.
 */
export function yearPosition(monthDay: string, edge: "start" | "end"): number {
  if (monthDayNumber(monthDay) === null) throw new RangeError(`not a day of the year: ${monthDay}`);
  const month = Number(monthDay.slice(0, 2));
  const day = Math.min(Number(monthDay.slice(3, 5)), DAYS_IN_MONTH[month - 1]!);
  const within = (edge === "start" ? day - 1 : day) / DAYS_IN_MONTH[month - 1]!;
  return (month - 1 + within) / 12;
}

/** A window as one segment, or two when it runs over New Year (overwintering does). */
export function windowSegments(start: string, end: string): YearSegment[] {
  const from = yearPosition(start, "start");
  const to = yearPosition(end, "end");
  if (from < to) return [{ from, to }];
  return [
    { from, to: 1 },
    { from: 0, to },
  ].filter((segment) => segment.to > segment.from);
}

/** "04-20" → "20 April". */
export function formatMonthDay(monthDay: string): string {
  const month = Number(monthDay.slice(0, 2));
  const day = Number(monthDay.slice(3, 5));
  return `${day} ${MONTH_NAMES[month - 1] ?? "?"}`;
}

/** "20 April to 31 May". */
export function describeDateRange(start: string, end: string): string {
  return `${formatMonthDay(start)} to ${formatMonthDay(end)}`;
}

/** [4, 5] → "April and May"; [10, 11, 12] → "October, November and December". */
export function describeMonths(months: readonly number[]): string {
  const names = months.map((m) => MONTH_NAMES[m - 1] ?? String(m));
  if (names.length <= 1) return names.join("");
  return `${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}`;
}
