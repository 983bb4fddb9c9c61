import { MONTH_INITIALS, MONTH_NAMES } from "~/taxa/bloom";

/**
 * Twelve small bars, January to December, the same width as the bloom strip's cells so the two
 * line up: visits in a month, verified ones filled, the rest outlined.
 */
export function MonthBars({ months }: { months: { all: number; verified: number }[] }) {
  const highest = Math.max(1, ...months.map((m) => m.all));
  const label = months.map((m, i) => (m.all ? `${MONTH_NAMES[i]}: ${m.all} (${m.verified} verified)` : null)).filter(Boolean).join("; ");
  return (
    <div role="img" aria-label={label ? `Visits by month — ${label}` : "No visits yet"} className="inline-flex items-end gap-px">
      {months.map((m, i) => (
        <span key={i} className="flex w-6 flex-col items-center gap-0.5">
          <span className="flex h-16 w-full flex-col justify-end">
            <span className="w-full rounded-t-[2px] border border-heather/70 border-b-0" style={{ height: `${((m.all - m.verified) / highest) * 100}%` }} />
            <span className="w-full bg-heather" style={{ height: `${(m.verified / highest) * 100}%` }} />
          </span>
          <span className="text-[0.7rem] text-ink-soft">{MONTH_INITIALS[i]}</span>
        </span>
      ))}
    </div>
  );
}
