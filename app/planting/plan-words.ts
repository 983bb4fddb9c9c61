// The planting pages' sentences about a list's settings, evidence and swaps. Pure module.

import { formatPercentInterval } from "~/forage/chart-scale";
import { BAND_LABELS } from "~/forage/seasons";
import { MONTH_NAMES } from "~/taxa/bloom";
import { GROWTH_FORMS } from "~/taxa/checklist-schema";
import type { PlanSettings } from "./plan";
import type { ForageEvidence } from "./recommend";
import type { MonthChange } from "./swap";

export const monthShort = (m: number) => MONTH_NAMES[m - 1]!.slice(0, 3);

/** "April to September", "June". */
export function describeSeason(months: { start: number; end: number }): string {
  return months.start === months.end ? MONTH_NAMES[months.start - 1]! : `${MONTH_NAMES[months.start - 1]} to ${MONTH_NAMES[months.end - 1]}`;
}

/** The settings as one line of words, in the order the form asks for them. */
export function describeSettings(settings: PlanSettings): string {
  const forms = GROWTH_FORMS.every((f) => settings.forms.includes(f)) ? "every growth form" : settings.forms.join(", ");
  return [
    BAND_LABELS[settings.band].replace(/ \(.*\)$/, "") + " band",
    describeSeason(settings.months),
    `at least ${settings.minPerMonth} in flower each month`,
    forms,
    settings.nativeOnly ? "native species only" : "native and introduced species",
    settings.size === null ? "no size limit" : `at most ${settings.size} species`,
  ].join(" · ");
}

/** "rank 2 · 5 visits · 3.4–17 % of early-spring queen visits (95 % interval)". */
export function describeEvidenceShort(evidence: ForageEvidence | null): string {
  if (!evidence) return "No early-spring forage records yet";
  const visits = `${evidence.visits} ${evidence.visits === 1 ? "visit" : "visits"}`;
  return `Rank ${evidence.rank} · ${visits} · ${formatPercentInterval(evidence.wilsonLow, evidence.wilsonHigh)} of early-spring queen visits (95 % interval)`;
}

/** What a swap does to the counts: "June 3 → 4; May 4 → 3", or that nothing moves. */
export function describeChanges(changes: readonly MonthChange[]): string {
  if (changes.length === 0) return "no month’s count changes";
  return changes.map((c) => `${monthShort(c.month)} ${c.before} → ${c.after}`).join("; ");
}

/** The months as a short list: "Apr, May and Jun". */
export function joinMonths(months: readonly number[]): string {
  const names = months.map(monthShort);
  return names.length <= 1 ? (names[0] ?? "") : `${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}`;
}
