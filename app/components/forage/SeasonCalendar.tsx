import type { CSSProperties } from "react";
import { describeDateRange, windowSegments } from "~/forage/calendar";
import type { SeasonResponse } from "~/forage/forage-api";
import { BAND_LABELS, SEASON_LABELS, SEASON_NAMES, type SeasonName } from "~/forage/seasons";
import { MONTH_INITIALS, MONTH_NAMES } from "~/taxa/bloom";
import { CASTES, CASTE_LABELS, type Caste } from "~/visits/vocabulary";

type BandCalendar = SeasonResponse["bands"][number];

/**
 * Each window has its own pattern as well as its own colour (stripes, dots, lines), and its
 * own lane with its name written in it, so that none is told apart by colour alone.
 */
const WINDOW_STYLE: Record<SeasonName, CSSProperties> = {
  "early-spring": { background: "repeating-linear-gradient(45deg, rgb(224 165 38 / 0.75) 0 3px, rgb(224 165 38 / 0.2) 3px 7px)", borderColor: "#a8771a" },
  "second-wave": {
    background: "radial-gradient(circle, rgb(123 92 142 / 0.8) 1.6px, transparent 1.8px) 0 0 / 6px 6px, rgb(123 92 142 / 0.14)",
    borderColor: "#7b5c8e",
  },
  overwinter: { background: "repeating-linear-gradient(0deg, rgb(79 115 150 / 0.6) 0 2px, rgb(79 115 150 / 0.12) 2px 6px)", borderColor: "#4f7396" },
};

const WINDOW_SHORT: Record<SeasonName, string> = { "early-spring": "Early spring", "second-wave": "Second wave", overwinter: "Overwintering" };

/** Queens solid and darkest; other castes lighter and patterned, so the stack reads in greyscale. */
const CASTE_STYLE: Record<Caste, CSSProperties> = {
  queen: { background: "#2f472b" },
  worker: { background: "repeating-linear-gradient(135deg, #7b5c8e 0 3px, #d8cce1 3px 6px)" },
  male: { background: "radial-gradient(circle, #8a6a12 1.2px, transparent 1.4px) 0 0 / 5px 5px, #f1e2b8" },
  unknown: { background: "#ffffff", boxShadow: "inset 0 0 0 1px rgb(36 35 31 / 0.45)" },
};

const BAR_AREA = 112;

const shownCastes = (allCastes: boolean): readonly Caste[] => (allCastes ? CASTES : ["queen"]);
const totalOf = (month: BandCalendar["months"][number], castes: readonly Caste[]) => castes.reduce((sum, caste) => sum + month[caste], 0);

/** The largest monthly bar over every band, so the bands share one scale. */
export function seasonMax(bands: readonly BandCalendar[], allCastes: boolean): number {
  return Math.max(1, ...bands.flatMap((band) => band.months.map((month) => totalOf(month, shownCastes(allCastes)))));
}

/** One band's year: visits per month as bars, the season windows as labelled lanes beneath. */
export function BandCalendarView({ band, allCastes, max }: { band: BandCalendar; allCastes: boolean; max: number }) {
  const castes = shownCastes(allCastes);
  const windows = SEASON_NAMES.map((name) => band.windows.find((w) => w.name === name)).filter((w): w is NonNullable<typeof w> => Boolean(w));
  const yearTotal = band.months.reduce((sum, month) => sum + totalOf(month, castes), 0);
  return (
    <section aria-labelledby={`band-${band.band}`} className="space-y-3 rounded-lg border border-ink/10 bg-white/60 p-3 sm:p-4" data-testid={`season-band-${band.band}`}>
      <div className="flex flex-wrap items-baseline justify-between gap-x-3">
        <h2 id={`band-${band.band}`} className="text-xl">
          {BAND_LABELS[band.band]}
        </h2>
        <p className="text-sm text-ink-soft">
          {yearTotal} {allCastes ? (yearTotal === 1 ? "visit" : "visits") : yearTotal === 1 ? "queen visit" : "queen visits"} in the year
        </p>
      </div>

      {/* The bars and lanes repeat the table and the window list below, which screen readers get. */}
      <div aria-hidden="true">
        <div className="grid grid-cols-12 gap-px" style={{ height: BAR_AREA + 18 }}>
          {band.months.map((month) => {
            const total = totalOf(month, castes);
            return (
              <div key={month.month} className="flex flex-col items-stretch justify-end">
                <span className="mb-0.5 text-center text-[0.7rem] leading-none tabular-nums text-ink-soft">{total > 0 ? total : ""}</span>
                <div className="mx-auto flex w-[70%] max-w-8 flex-col-reverse overflow-hidden rounded-t-[3px]" style={{ height: (total / max) * BAR_AREA }}>
                  {castes.map((caste) =>
                    month[caste] > 0 ? <span key={caste} className="block w-full flex-none" style={{ ...CASTE_STYLE[caste], height: `${(month[caste] / total) * 100}%` }} /> : null,
                  )}
                </div>
              </div>
            );
          })}
        </div>
        <div className="grid grid-cols-12 gap-px border-t border-ink/30 pt-0.5 text-center text-xs text-ink-soft">
          {MONTH_NAMES.map((name, index) => (
            <span key={name}>
              <span className="sm:hidden">{MONTH_INITIALS[index]}</span>
              <span className="hidden sm:inline">{name.slice(0, 3)}</span>
            </span>
          ))}
        </div>
        <div className="relative mt-2 space-y-1">
          {/* Faint month columns behind the lanes, so a window's edges can be read against the months. */}
          <div className="pointer-events-none absolute inset-0 grid grid-cols-12">
            {MONTH_NAMES.map((name) => (
              <span key={name} className="border-l border-ink/10 first:border-l-0" />
            ))}
          </div>
          {windows.map((window) => (
            <div key={window.name} className="relative h-6" data-testid="season-window">
              {windowSegments(window.start, window.end).map((segment, index) => (
                <span
                  key={index}
                  className="absolute inset-y-0 rounded-sm border"
                  style={{ ...WINDOW_STYLE[window.name], left: `${segment.from * 100}%`, width: `${(segment.to - segment.from) * 100}%` }}
                />
              ))}
              <span
                className="absolute top-1/2 -translate-y-1/2 whitespace-nowrap rounded bg-paper/90 px-1 text-[0.7rem] font-semibold leading-tight text-ink"
                style={labelPosition(window.start, window.end)}
              >
                {WINDOW_SHORT[window.name]}
              </span>
            </div>
          ))}
        </div>
      </div>

      <ul className="grid gap-1 text-sm sm:grid-cols-3" aria-label={`Season windows, ${BAND_LABELS[band.band]}`}>
        {windows.map((window) => (
          <li key={window.name} className="flex items-start gap-2">
            <span className="mt-0.5 inline-block h-4 w-6 flex-none rounded-sm border" style={WINDOW_STYLE[window.name]} aria-hidden="true" />
            <span>
              <span className="font-semibold">{SEASON_LABELS[window.name]}</span>
              <span className="block text-ink-soft">{describeDateRange(window.start, window.end)}</span>
            </span>
          </li>
        ))}
      </ul>

      <details className="text-sm">
        <summary className="min-h-11 cursor-pointer py-2 font-medium">Numbers by month</summary>
        <div className="overflow-x-auto">
          <table className="min-w-full text-left">
            <caption className="sr-only">Visits per month by caste, {BAND_LABELS[band.band]}</caption>
            <thead>
              <tr className="border-b border-ink/20">
                <th scope="col" className="py-1 pr-3">Month</th>
                {castes.map((caste) => (
                  <th key={caste} scope="col" className="px-2 py-1 text-right">
                    {CASTE_LABELS[caste]}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className="divide-y divide-ink/10">
              {band.months.map((month) => (
                <tr key={month.month}>
                  <th scope="row" className="py-1 pr-3 font-normal">
                    {MONTH_NAMES[month.month - 1]}
                  </th>
                  {castes.map((caste) => (
                    <td key={caste} className="px-2 py-1 text-right">
                      {month[caste]}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </details>
    </section>
  );
}

/**
 * Where a window's name goes in its lane: at the start of its (first) stretch, or, when the
 * window ends too late in the year for the name to fit after its start, right-aligned to its end.
 */
function labelPosition(start: string, end: string): CSSProperties {
  const segments = windowSegments(start, end);
  // A window over New Year: name it in its January part, where the year starts reading.
  const segment = segments.length > 1 ? segments[1]! : segments[0]!;
  if (segment.from > 0.75) return { right: `${(1 - segment.to) * 100}%` };
  return { left: `calc(${segment.from * 100}% + 2px)` };
}

/** The key to the caste patterns, shown when other castes join the queens. */
export function CasteKey({ allCastes }: { allCastes: boolean }) {
  return (
    <ul className="flex flex-wrap gap-x-4 gap-y-1 text-sm" aria-label="Bar key">
      {shownCastes(allCastes).map((caste) => (
        <li key={caste} className="flex items-center gap-1.5">
          <span className="inline-block h-4 w-4 rounded-sm" style={CASTE_STYLE[caste]} aria-hidden="true" />
          {allCastes ? CASTE_LABELS[caste] : "Queen visits per month"}
        </li>
      ))}
    </ul>
  );
}
