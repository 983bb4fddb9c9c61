import type { CSSProperties, ReactNode } from "react";
import { BloomStrip } from "~/components/BloomStrip";
import { FewRecordsFlag } from "~/components/forage/Ranking";
import { formatPercentTick, niceAxisMax } from "~/forage/chart-scale";
import { bloomMonths, describeBloom, MONTH_NAMES } from "~/taxa/bloom";
import type { PlanAlternative, PlanSpecies, PlanStockOffer, PlanView } from "~/planting/plan";
import { describeChanges, describeEvidenceShort, describeSeason, joinMonths, monthShort } from "~/planting/plan-words";
import { STOCK_AVAILABILITY_LABELS, STOCK_FORM_LABELS } from "~/planting/vocabulary";

/** Diagonal stripes for a month short of the minimum: reads without colour, and in print. */
const SHORT_MONTH: CSSProperties = {
  backgroundImage: "repeating-linear-gradient(135deg, rgba(181, 86, 58, 0.38) 0 2px, transparent 2px 6px)",
};

/** Browsers leave out background colours when printing unless told; the bloom cells are backgrounds. */
export const PRINT_EXACT = "[print-color-adjust:exact] [-webkit-print-color-adjust:exact]";

/** One axis for every evidence bar of a list, so the bars compare. */
export function evidenceAxisMax(species: readonly { evidence: PlanSpecies["evidence"] }[]): number {
  return niceAxisMax(species.map((s) => s.evidence?.wilsonHigh ?? 0), { cap: 1 });
}

/**
 * The 95 % interval of a plant's share of early-spring queen visits on the list's axis: a line
 * from the lower to the upper limit, dashed for few records. The text beside it says the same.
 */
export function EvidenceBar({ evidence, max }: { evidence: NonNullable<PlanSpecies["evidence"]>; max: number }) {
  const at = (value: number) => `${Math.min(100, Math.max(0, (value / max) * 100))}%`;
  return (
    <svg width="100%" height="12" aria-hidden="true" focusable="false" className="block max-w-56 overflow-visible" data-testid="evidence-bar">
      <line x1="0" x2="100%" y1="6" y2="6" stroke="#24231f" strokeOpacity="0.15" />
      <line x1="0" x2="0" y1="1" y2="11" stroke="#24231f" strokeOpacity="0.35" />
      <line
        x1={at(evidence.wilsonLow)}
        x2={at(evidence.wilsonHigh)}
        y1="6"
        y2="6"
        stroke={evidence.fewRecords ? "#55524a" : "#2f472b"}
        strokeWidth="4"
        strokeLinecap="round"
        strokeDasharray={evidence.fewRecords ? "4 3" : undefined}
      />
    </svg>
  );
}

export function EvidenceBlock({ evidence, max }: { evidence: PlanSpecies["evidence"]; max: number }) {
  return (
    <div className="space-y-1 text-sm" data-testid="species-evidence">
      <p className="font-semibold">Early-spring forage evidence</p>
      {evidence ? (
        <>
          <p>
            {describeEvidenceShort(evidence)}
            {evidence.fewRecords && (
              <>
                {" "}
                <FewRecordsFlag /> <span className="text-ink-soft">— read it as a hint, not a result.</span>
              </>
            )}
          </p>
          <div className="max-w-56">
            <EvidenceBar evidence={evidence} max={max} />
            <div className="flex justify-between text-[0.65rem] text-ink-soft" aria-hidden="true">
              <span>0</span>
              <span>{formatPercentTick(max)}</span>
            </div>
          </div>
        </>
      ) : (
        <p className="text-ink-soft">No queen visits to it in early spring are recorded yet; that says nothing against it.</p>
      )}
    </div>
  );
}

/** The nursery's own declaration about insecticides, in words (and a border style, not colour alone). */
export function Declaration({ declared }: { declared: boolean }) {
  return declared ? (
    <span className="inline-block rounded-full border border-moss px-2 py-0.5 text-xs font-semibold text-moss-deep">
      <span aria-hidden="true">✓ </span>Declared grown without systemic insecticides
    </span>
  ) : (
    <span className="inline-block rounded-full border border-dashed border-clay px-2 py-0.5 text-xs font-semibold text-ink">
      No insecticide-free declaration — ask before buying
    </span>
  );
}

export function StockOffers({ offers }: { offers: readonly PlanStockOffer[] }) {
  return (
    <div className="text-sm" data-testid="species-stock">
      <p className="font-semibold">Stocked by</p>
      {offers.length === 0 ? (
        <p className="text-ink-soft">No nursery in the programme lists it yet.</p>
      ) : (
        <ul className="mt-1 space-y-1.5">
          {offers.map((offer) => (
            <li key={`${offer.nurseryId}-${offer.form}`}>
              <strong>{offer.nurseryName}</strong>: {STOCK_FORM_LABELS[offer.form].toLowerCase()}, {STOCK_AVAILABILITY_LABELS[offer.availability].toLowerCase()}
              {offer.availabilityNote && ` (${offer.availabilityNote})`}
              {offer.sourceRegion && <span className="text-ink-soft"> · source: {offer.sourceRegion}</span>} <Declaration declared={offer.grownWithoutSystemicInsecticides} />
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

/** The bloom strip, large with month initials from tablets up, small on phones. */
function ResponsiveBloomStrip({ start, end }: { start: number; end: number }) {
  return (
    <>
      <span className="sm:hidden">
        <BloomStrip start={start} end={end} />
      </span>
      <span className="hidden sm:inline-flex">
        <BloomStrip start={start} end={end} size="lg" />
      </span>
    </>
  );
}

const FORM_WORDS: Record<PlanSpecies["growthForm"], string> = { tree: "tree", shrub: "shrub", forb: "forb (wildflower)", graminoid: "grass or sedge", vine: "vine" };

export function SpeciesCard({ species, position, axisMax, children }: { species: PlanSpecies; position: number; axisMax: number; children?: ReactNode }) {
  return (
    <li className="rounded-lg border border-ink/10 bg-white/60 p-3 sm:p-4" data-testid="plan-species" data-taxon-id={species.id}>
      <div className="flex items-baseline gap-2">
        <span className="font-display text-lg font-semibold tabular-nums text-ink-soft">{position}.</span>
        <div className="min-w-0">
          <h3 className="text-lg leading-snug">
            <a href={`/checklist/${species.id}`} className="text-ink">
              <i>{species.scientificName}</i>
            </a>
          </h3>
          <p className="text-sm text-ink-soft">
            {[species.vernacularName, species.family, FORM_WORDS[species.growthForm]].filter(Boolean).join(" · ")}
            {species.regionalStatus === "introduced" && <strong className="text-ink"> · introduced, not native</strong>}
          </p>
        </div>
      </div>
      {!species.allowed && (
        <p className="mt-2 rounded-md border-l-4 border-clay bg-clay/10 p-2 text-sm font-semibold" data-testid="species-not-allowed">
          {species.regionalStatus === "invasive"
            ? "The checklist now marks this species invasive: do not plant it; swap it out."
            : "The checklist now says this species does not fit the list’s settings; consider swapping it out."}
        </p>
      )}
      <div className="mt-3 grid gap-3 sm:grid-cols-2">
        <div className="space-y-1 text-sm">
          <ResponsiveBloomStrip start={species.bloomStart} end={species.bloomEnd} />
          <p>
            {describeBloom(species.bloomStart, species.bloomEnd)}
            {species.monthsCovered.length > 0 && <span className="text-ink-soft"> · counts for {joinMonths(species.monthsCovered)}</span>}
          </p>
          {species.reason && <p className="text-ink-soft">{species.reason}.</p>}
        </div>
        <EvidenceBlock evidence={species.evidence} max={axisMax} />
      </div>
      <div className="mt-3">
        <StockOffers offers={species.offers} />
      </div>
      {children}
    </li>
  );
}

/**
 * The species that could take this one's place, best first, each with what it does to the
 * month counts; `use` renders the control that makes the swap (a link or a form).
 */
export function SwapPanel({ species, minPerMonth, use }: { species: PlanSpecies; minPerMonth: number; use: (alternative: PlanAlternative) => ReactNode }) {
  const total = species.alternatives.length + species.moreAlternatives;
  return (
    <details className="group mt-3 rounded-md border border-ink/20 bg-paper/70" data-testid="swap-panel">
      <summary className="flex min-h-11 cursor-pointer list-none items-center justify-between gap-2 px-3 py-2 font-medium">
        <span>
          Swap <span className="sr-only">{species.scientificName} </span>for another<span className="hidden sm:inline"> species</span>
        </span>
        <span className="text-sm font-normal text-ink-soft">
          {total === 0 ? "no options" : `${total} ${total === 1 ? "option" : "options"}`}
          <span aria-hidden="true" className="ml-1 inline-block transition-transform group-open:rotate-180">▾</span>
        </span>
      </summary>
      <div className="space-y-2 border-t border-ink/10 px-3 py-3 text-sm">
        {total === 0 ? (
          <p>No other species allowed by the settings keeps every month at {minPerMonth} or more in its place.</p>
        ) : (
          <>
            <p className="text-ink-soft">
              Each keeps every month at {minPerMonth} or more species in flower (a month already short gets no shorter). Best first, in the recommendation’s order:
              early spring, then forage evidence, then bloom length.
            </p>
            <ul className="divide-y divide-ink/10">
              {species.alternatives.map((alternative) => (
                <li key={alternative.id} className="flex flex-wrap items-center justify-between gap-x-3 gap-y-2 py-2" data-testid="swap-alternative">
                  <div className="min-w-0 space-y-0.5">
                    <p>
                      <i className="font-medium">{alternative.scientificName}</i>
                      {alternative.vernacularName && <span className="text-ink-soft"> · {alternative.vernacularName}</span>}
                    </p>
                    <BloomStrip start={alternative.bloomStart} end={alternative.bloomEnd} />
                    <p className="text-xs text-ink-soft">
                      {describeEvidenceShort(alternative.evidence)}
                      {alternative.evidence?.fewRecords && " · few records"}
                    </p>
                    <p className="text-xs">
                      <span className="text-ink-soft">Species in flower: </span>
                      {describeChanges(alternative.changes)}
                    </p>
                  </div>
                  {use(alternative)}
                </li>
              ))}
            </ul>
            {species.moreAlternatives > 0 && (
              <p className="text-ink-soft">
                {species.moreAlternatives} more {species.moreAlternatives === 1 ? "keeps" : "keep"} coverage; these are the first {species.alternatives.length}.
              </p>
            )}
          </>
        )}
      </div>
    </details>
  );
}

/**
 * Month × species: which listed species flower in which season month, and how many each month
 * has. A month short of the minimum is striped down its whole column and says "short" under its
 * count; cells in flower are filled and say so to screen readers.
 */
export function BloomChart({ plan, compact = false }: { plan: PlanView; compact?: boolean }) {
  const { species, perMonth, settings, earlySpringMonths } = plan;
  const short = new Set(perMonth.filter((m) => !m.met).map((m) => m.month));
  const early = new Set(earlySpringMonths);
  // Phones: six month columns and a species column must fit 360 px; longer seasons scroll inside the figure.
  const cell = compact ? "h-4 w-7" : "h-5 w-6 sm:h-6 sm:w-10";
  return (
    <figure className={`rounded-lg border border-ink/10 bg-white/60 ${compact ? "p-2" : "p-3"} ${PRINT_EXACT}`} data-testid="bloom-chart">
      <figcaption className={compact ? "mb-1 text-xs" : "mb-2 text-sm"}>
        <span className="font-semibold">Bloom coverage, {describeSeason(settings.months)}</span>
        <span className="block text-ink-soft">
          Filled: in flower. Striped column marked “short”: fewer than {settings.minPerMonth} species in flower. Outlined month: early spring, when queens emerge.
        </span>
      </figcaption>
      <div className="overflow-x-auto">
        <table className={`border-separate border-spacing-[2px] ${compact ? "text-[0.65rem]" : "text-[0.7rem] sm:text-xs"}`}>
          <thead>
            <tr>
              <th scope="col" className="text-left font-semibold">
                Species
              </th>
              {perMonth.map(({ month }) => (
                <th
                  key={month}
                  scope="col"
                  className={`px-0.5 text-center font-semibold ${early.has(month) ? "rounded-sm ring-2 ring-pollen ring-inset" : ""}`}
                  title={early.has(month) ? `${MONTH_NAMES[month - 1]}: early spring` : MONTH_NAMES[month - 1]}
                >
                  {monthShort(month)}
                  {early.has(month) && <span className="sr-only"> (early spring)</span>}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {species.map((s) => {
              const bloom = bloomMonths(s.bloomStart, s.bloomEnd);
              return (
                <tr key={s.id}>
                  <th scope="row" className={`truncate pr-1 text-left font-normal ${compact ? "max-w-[10rem]" : "max-w-[6.5rem] sm:max-w-[16rem]"}`}>
                    <i>{s.scientificName}</i>
                  </th>
                  {perMonth.map(({ month }) => {
                    const flowering = bloom.has(month);
                    return (
                      <td key={month} className={`${cell} rounded-[2px] ${flowering ? "bg-moss" : "bg-ink/5"}`} style={!flowering && short.has(month) ? SHORT_MONTH : undefined}>
                        <span className="sr-only">{flowering ? "in flower" : "not in flower"}</span>
                      </td>
                    );
                  })}
                </tr>
              );
            })}
          </tbody>
          <tfoot>
            <tr>
              <th scope="row" className="pt-1 text-left font-semibold">
                In flower <span className="font-normal text-ink-soft">(need {settings.minPerMonth})</span>
              </th>
              {perMonth.map(({ month, count, met }) => (
                <td
                  key={month}
                  className={`rounded-[2px] px-0.5 pt-1 text-center align-top tabular-nums ${met ? "" : "outline outline-1 outline-clay"}`}
                  style={met ? undefined : SHORT_MONTH}
                  data-testid="month-count"
                  data-short={met ? undefined : "yes"}
                >
                  <strong>{count}</strong>
                  {!met && <span className="block font-semibold">{count === 0 ? "gap" : "short"}</span>}
                </td>
              ))}
            </tr>
          </tfoot>
        </table>
      </div>
    </figure>
  );
}

/** The months short of the minimum with why, or that every month is met. */
export function UnmetMonths({ plan }: { plan: PlanView }) {
  const { unmet, settings } = plan;
  if (unmet.length === 0) {
    return (
      <p className="rounded-md border-l-4 border-moss bg-moss/10 p-3 text-sm" data-testid="unmet-months">
        Every month from {describeSeason(settings.months)} has at least {settings.minPerMonth} listed species in flower.
      </p>
    );
  }
  return (
    <section aria-labelledby="unmet-heading" className="rounded-md border-l-4 border-clay bg-clay/10 p-3 text-sm" data-testid="unmet-months">
      <h2 id="unmet-heading" className="text-lg">
        {unmet.length === 1 ? "One month is" : `${unmet.length} months are`} short of {settings.minPerMonth} species in flower
      </h2>
      <ul className="mt-1 space-y-1">
        {unmet.map((month) => (
          <li key={month.month}>
            <strong>
              {MONTH_NAMES[month.month - 1]}: {month.count} of {month.needed}
            </strong>{" "}
            — {month.why}.
          </li>
        ))}
      </ul>
    </section>
  );
}

/** Every species of the plan as cards; `swap` adds the swap control to each (none on read-only views). */
export function SpeciesList({ plan, swap }: { plan: PlanView; swap?: (species: PlanSpecies) => ReactNode }) {
  const axisMax = evidenceAxisMax(plan.species);
  return (
    <ol className="space-y-3" data-testid="plan-species-list">
      {plan.species.map((species, index) => (
        <SpeciesCard key={species.id} species={species} position={index + 1} axisMax={axisMax}>
          {swap?.(species)}
        </SpeciesCard>
      ))}
    </ol>
  );
}
