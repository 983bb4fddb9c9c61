import type { ReactNode } from "react";
import { BloomStrip } from "~/components/BloomStrip";
import { PlantingCautions } from "~/components/PlantingCautions";
import { formatPercentInterval } from "~/forage/chart-scale";
import { describeBloom, MONTH_INITIALS, MONTH_NAMES } from "~/taxa/bloom";
import type { PlanView } from "~/planting/plan";
import { describeSettings, monthShort } from "~/planting/plan-words";
import { STOCK_AVAILABILITY_LABELS, STOCK_FORM_LABELS } from "~/planting/vocabulary";
import { PRINT_EXACT } from "./PlanParts";

/**
 * Hides the site's header, footer and skip link when this sheet is printed: they are the root
 * layout's, so the sheet reaches them through `body:has(this sheet)` rather than changing the
 * layout for one page.
 */
const HIDE_SITE_CHROME_IN_PRINT = "print:[body:has(&)>header]:hidden print:[body:has(&)>footer]:hidden print:[body:has(&)>a]:hidden print:[body:has(&)_main]:p-0";

/**
 * A saved list on paper: one compact table (bloom months as a small month grid), the month
 * counts, short months with why, and the cautions at the bottom. Sized to fit one page where
 * the list allows; the on-screen buttons are not printed.
 */
export function PlantingPrintSheet({ name, asOf, plan, back }: { name: string; asOf: string; plan: PlanView; back: ReactNode }) {
  return (
    <article className={`space-y-4 text-sm print:space-y-2 print:text-[9pt] ${PRINT_EXACT} ${HIDE_SITE_CHROME_IN_PRINT}`} data-testid="print-sheet">
      <div className="flex flex-wrap gap-2 print:hidden">
        <button type="button" onClick={() => window.print()} className="min-h-11 rounded-md bg-moss px-5 font-semibold text-paper hover:bg-moss-deep">
          Print
        </button>
        {back}
        <p className="basis-full text-ink-soft">The list is laid out for one sheet of paper where it fits; the site’s menus are left off when printing.</p>
      </div>

      <header>
        <h1 className="text-2xl print:text-[15pt]">{name}</h1>
        <p className="text-ink-soft">
          Planting list from Visitwort, as of {asOf.slice(0, 10)} · {describeSettings(plan.settings)}
        </p>
      </header>

      <div className="overflow-x-auto print:overflow-visible">
        <table className="w-full border-collapse text-left" data-testid="print-table">
          <caption className="sr-only">Species of the list with their bloom months, forage evidence and nurseries</caption>
          <thead className="border-b-2 border-ink/40 align-bottom">
            <tr>
              <th scope="col" className="py-1 pr-2 text-right">
                #
              </th>
              <th scope="col" className="py-1 pr-2">
                Species
              </th>
              <th scope="col" className="py-1 pr-2">
                Bloom
                {/* Initials over the grid's twelve cells (BloomStrip's small cells: 0.75rem wide, 1px apart). */}
                <span className="flex gap-px font-normal text-ink-soft" aria-hidden="true">
                  {MONTH_INITIALS.map((initial, index) => (
                    <span key={index} className="w-3 text-center text-[0.55rem] leading-none">
                      {initial}
                    </span>
                  ))}
                </span>
              </th>
              <th scope="col" className="py-1 pr-2">
                Early-spring evidence
                <span className="block font-normal text-ink-soft">rank · visits · share (95 %)</span>
              </th>
              <th scope="col" className="py-1">
                Stocked by
              </th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink/15">
            {plan.species.map((s, index) => (
              <tr key={s.id} className="align-top print:break-inside-avoid">
                <td className="py-1 pr-2 text-right tabular-nums">{index + 1}</td>
                <th scope="row" className="py-1 pr-2 font-normal">
                  <i className="font-medium">{s.scientificName}</i>
                  <span className="block text-ink-soft">
                    {[s.vernacularName, s.growthForm].filter(Boolean).join(" · ")}
                    {s.regionalStatus === "introduced" && <strong className="text-ink"> · introduced</strong>}
                  </span>
                  {!s.allowed && <strong className="block text-clay">{s.regionalStatus === "invasive" ? "Now marked invasive: do not plant" : "No longer fits the list’s settings"}</strong>}
                </th>
                <td className="py-1 pr-2">
                  <BloomStrip start={s.bloomStart} end={s.bloomEnd} />
                  <span className="sr-only">{describeBloom(s.bloomStart, s.bloomEnd)}</span>
                </td>
                <td className="py-1 pr-2">
                  {s.evidence ? (
                    <>
                      {s.evidence.rank} · {s.evidence.visits} · {formatPercentInterval(s.evidence.wilsonLow, s.evidence.wilsonHigh)}
                      {s.evidence.fewRecords && <span className="block font-semibold">few records</span>}
                    </>
                  ) : (
                    <span className="text-ink-soft">no records yet</span>
                  )}
                </td>
                <td className="py-1">
                  {s.offers.length === 0 ? (
                    <span className="text-ink-soft">none listed</span>
                  ) : (
                    <ul>
                      {s.offers.map((offer) => (
                        <li key={`${offer.nurseryId}-${offer.form}`}>
                          {offer.nurseryName} ({STOCK_FORM_LABELS[offer.form].toLowerCase()}, {STOCK_AVAILABILITY_LABELS[offer.availability].toLowerCase()})
                          {offer.grownWithoutSystemicInsecticides ? " — declared insecticide-free" : " — no insecticide-free declaration"}
                        </li>
                      ))}
                    </ul>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>

      <div className="print:break-inside-avoid">
        <p className="pb-1 font-semibold">Species in flower each month (need {plan.settings.minPerMonth})</p>
        <table className="border-collapse text-center" data-testid="print-month-counts">
          <thead>
            <tr>
              {plan.perMonth.map(({ month }) => (
                <th key={month} scope="col" className="border border-ink/25 px-2 font-semibold" title={MONTH_NAMES[month - 1]}>
                  {monthShort(month)}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            <tr>
              {plan.perMonth.map(({ month, count, met }) => (
                <td key={month} className={`border border-ink/25 px-2 tabular-nums ${met ? "" : "font-semibold"}`}>
                  {count}
                  {!met && " short"}
                </td>
              ))}
            </tr>
          </tbody>
        </table>
        {plan.unmet.length > 0 && (
          <ul className="mt-1 list-disc pl-5">
            {plan.unmet.map((month) => (
              <li key={month.month}>
                {MONTH_NAMES[month.month - 1]}: {month.why}.
              </li>
            ))}
          </ul>
        )}
      </div>

      <PlantingCautions compact />
    </article>
  );
}
