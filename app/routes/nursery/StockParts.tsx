import { Form, Link } from "react-router";
import { BloomStrip } from "~/components/BloomStrip";
import { PlantPicker } from "~/components/PlantPicker";
import { StatusBadge } from "~/components/StatusBadge";
import { Field, PrimaryButton } from "~/components/forms";
import { BAND_LABELS } from "~/forage/seasons";
import { DECLARATION_LABEL, type StockListEntry, type WhatToGrowBand, type WhatToGrowSpecies } from "~/nursery/stock-record";
import { MAX_AVAILABILITY_NOTE, MAX_SOURCE_REGION, type StockFieldErrors } from "~/nursery/stock-schema";
import { STOCK_AVAILABILITIES, STOCK_AVAILABILITY_LABELS, STOCK_FORM_LABELS, STOCK_FORMS, type StockForm } from "~/planting/vocabulary";
import { MONTH_NAMES } from "~/taxa/bloom";
import type { PlantTaxonRecord } from "~/taxa/taxon-record";

/** What a grower should weigh before listing a plant; DESIGN.md "Cautions to show", in our words. */
export function StockCautions() {
  return (
    <aside aria-labelledby="stock-cautions-heading" className="space-y-2 rounded-md border-l-4 border-pollen bg-pollen/10 p-4">
      <h2 id="stock-cautions-heading" className="font-sans text-base font-bold">
        Before you list a plant
      </h2>
      <ul className="list-disc space-y-1.5 pl-5 text-[0.95rem]">
        <li>
          <strong>Systemic insecticides.</strong> Grow stock without systemic insecticides such as neonicotinoids: they move
          into nectar and pollen and can harm the bees the plants are meant to feed. Tick the declaration only for stock grown
          that way from start to sale.
        </li>
        <li>
          <strong>Noxious weeds and invasive plants.</strong> Check your state’s and local noxious-weed and invasive-plant rules
          before you offer a species. Visitwort refuses plants the regional checklist marks as invasive, but local lists can be
          longer.
        </li>
        <li>
          <strong>Local ecotypes.</strong> Prefer seed and parent plants from your own region, and say where they came from in
          the source region: planners look for it.
        </li>
        <li>
          Local regulations and qualified practitioners have the last word; this page is guidance, not a permit.{" "}
          <Link to="/cautions">All cautions</Link>
        </li>
      </ul>
    </aside>
  );
}

const formLower = (form: StockForm) => STOCK_FORM_LABELS[form].toLowerCase();

/** In the table's own column the header says what is declared; folded into the plant's cell, the badge says it. */
function Declaration({ declared, short = false }: { declared: boolean; short?: boolean }) {
  return declared ? (
    <span className={`inline-flex items-center gap-1 rounded-md border border-moss bg-moss/10 px-2 py-0.5 text-xs font-semibold text-moss-deep ${short ? "whitespace-nowrap" : ""}`}>
      <span aria-hidden="true">✓</span> {short ? "Declared" : "Insecticide-free declaration"}
    </span>
  ) : (
    <span className={`inline-flex items-center rounded-md border border-ink/30 px-2 py-0.5 text-xs font-medium text-ink-soft ${short ? "whitespace-nowrap" : ""}`}>
      {short ? "Not declared" : "No insecticide-free declaration"}
    </span>
  );
}

function Availability({ entry }: { entry: StockListEntry }) {
  return (
    <>
      {STOCK_AVAILABILITY_LABELS[entry.availability]}
      {entry.availabilityNote && <span className="text-ink-soft"> — {entry.availabilityNote}</span>}
    </>
  );
}

/**
 * The stock list as a table. On phones the columns beside the plant fold into its cell, so
 * the table never scrolls sideways; from tablets up each has its own column.
 */
export function StockTable({ stock, busy }: { stock: StockListEntry[]; busy: boolean }) {
  if (stock.length === 0) {
    return (
      <p className="rounded-md border border-dashed border-ink/30 bg-white/40 p-4 text-ink-soft">
        Your stock list is empty. Add plants with the form above, or import a CSV file.
      </p>
    );
  }
  const wide = "hidden px-3 py-2 md:table-cell";
  return (
    <div className="rounded-lg border border-ink/10 bg-white/50">
      <table className="w-full text-left text-[0.95rem]" data-testid="stock-table">
        <caption className="sr-only">Your stock list, by scientific name</caption>
        <thead className="bg-paper-deep/70">
          <tr>
            <th scope="col" className="px-3 py-2 font-semibold">Plant</th>
            <th scope="col" className={`${wide} font-semibold`}>Sold as</th>
            <th scope="col" className={`${wide} font-semibold`}>Source region</th>
            <th scope="col" className={`${wide} font-semibold`}>Availability</th>
            <th scope="col" className={`${wide} font-semibold`}>Insecticide-free declaration</th>
            <th scope="col" className="px-3 py-2">
              <span className="sr-only">Remove</span>
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-ink/10">
          {stock.map((entry) => (
            <tr key={entry.id} className="align-top" data-testid="stock-row">
              <th scope="row" className="px-3 py-2 font-normal">
                <span className="block">
                  <i className="font-display">{entry.taxon.scientificName}</i>{" "}
                  {entry.taxon.vernacularName && <span className="text-sm text-ink-soft">{entry.taxon.vernacularName}</span>}
                </span>
                <span className="mt-1 flex flex-wrap items-center gap-2 text-xs text-ink-soft">
                  {entry.taxon.family}
                  <BloomStrip start={entry.taxon.bloomStart} end={entry.taxon.bloomEnd} />
                  {entry.taxon.regionalStatus !== "native" && <StatusBadge status={entry.taxon.regionalStatus} />}
                </span>
                {/* Phones: the other columns, folded in. */}
                <span className="mt-1.5 block space-y-1 text-sm md:hidden">
                  <span className="block">
                    <span className="font-semibold">{STOCK_FORM_LABELS[entry.form]}</span> · <Availability entry={entry} />
                  </span>
                  {entry.sourceRegion && <span className="block text-ink-soft">Source: {entry.sourceRegion}</span>}
                  <span className="block">
                    <Declaration declared={entry.grownWithoutSystemicInsecticides} />
                  </span>
                </span>
              </th>
              <td className={wide}>{STOCK_FORM_LABELS[entry.form]}</td>
              <td className={`${wide} max-w-[14rem] break-words`}>{entry.sourceRegion || <span className="text-ink-soft">not given</span>}</td>
              <td className={wide}>
                <Availability entry={entry} />
              </td>
              <td className={wide}>
                <Declaration declared={entry.grownWithoutSystemicInsecticides} short />
              </td>
              <td className="px-2 py-2 text-right">
                <Form method="post">
                  <input type="hidden" name="intent" value="remove" />
                  <input type="hidden" name="stockItemId" value={entry.id} />
                  <button type="submit" disabled={busy} className="min-h-11 rounded-md border border-ink/25 bg-white px-3 text-sm font-medium text-ink hover:bg-ink/5 disabled:opacity-60">
                    Remove<span className="sr-only">: {entry.taxon.scientificName}, {formLower(entry.form)}</span>
                  </button>
                </Form>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function Problem({ id, messages }: { id: string; messages?: string[] }) {
  return messages?.length ? (
    <p id={id} role="alert" className="text-sm font-medium text-clay">
      {messages.join(" ")}
    </p>
  ) : null;
}

function Choice<T extends string>({ name, legend, values, labels, errors }: { name: string; legend: string; values: readonly T[]; labels: Record<T, string>; errors?: string[] }) {
  return (
    <fieldset className="space-y-1" aria-describedby={errors?.length ? `${name}-error` : undefined}>
      <legend className="mb-1 font-semibold">{legend}</legend>
      <div className="flex flex-wrap gap-2">
        {values.map((value) => (
          <label key={value} className={`inline-flex min-h-11 items-center gap-2 rounded-md border bg-white px-3 ${errors?.length ? "border-clay" : "border-ink/25"}`}>
            <input type="radio" name={name} value={value} className="h-5 w-5 accent-moss" aria-invalid={errors?.length ? true : undefined} />
            {labels[value]}
          </label>
        ))}
      </div>
      <Problem id={`${name}-error`} messages={errors} />
    </fieldset>
  );
}

/** One column, labels above, the save button last: the house form for phones. */
export function AddStockForm({
  plant,
  onPlantChange,
  fields,
  busy,
}: {
  plant: PlantTaxonRecord | null;
  onPlantChange: (taxon: PlantTaxonRecord | null) => void;
  fields: StockFieldErrors;
  busy: boolean;
}) {
  return (
    <Form method="post" className="space-y-5 rounded-lg border border-ink/10 bg-white/50 p-4" noValidate>
      <input type="hidden" name="intent" value="add" />
      <PlantPicker name="plantTaxonId" label="Plant" value={plant} onChange={onPlantChange} errors={fields.plantTaxonId} />
      {plant?.regionalStatus === "invasive" && (
        <p role="alert" className="rounded-md border-l-4 border-clay bg-clay/10 p-2 text-sm">
          <i>{plant.scientificName}</i> is listed as invasive in the region. Visitwort does not take invasive plants on a stock
          list.
        </p>
      )}
      <Choice name="form" legend="Sold as" values={STOCK_FORMS} labels={STOCK_FORM_LABELS} errors={fields.form} />
      <Field
        label="Source region or ecotype"
        name="sourceRegion"
        maxLength={MAX_SOURCE_REGION}
        autoComplete="off"
        errors={fields.sourceRegion}
        hint="Where the seed or parent plants came from, e.g. “seed collected within 80 km of the nursery”."
      />
      <Choice name="availability" legend="Availability" values={STOCK_AVAILABILITIES} labels={STOCK_AVAILABILITY_LABELS} errors={fields.availability} />
      <Field
        label="Availability note"
        name="availabilityNote"
        maxLength={MAX_AVAILABILITY_NOTE}
        autoComplete="off"
        errors={fields.availabilityNote}
        hint="Optional, e.g. “from May” or “small packets only”."
      />
      <div className="space-y-1">
        <label className="flex min-h-11 items-start gap-3 rounded-md border border-ink/20 bg-white p-3">
          <input type="checkbox" name="grownWithoutSystemicInsecticides" className="mt-0.5 h-5 w-5 shrink-0 accent-moss" aria-describedby="declaration-hint" />
          <span>
            <span className="font-semibold">{DECLARATION_LABEL}</span>
            <span id="declaration-hint" className="block text-sm text-ink-soft">
              Your own declaration, shown to planners as you give it. Leave it unticked if you are not sure.
            </span>
          </span>
        </label>
        <Problem id="declaration-error" messages={fields.grownWithoutSystemicInsecticides} />
      </div>
      <div className="space-y-1">
        <PrimaryButton disabled={busy}>Save to the stock list</PrimaryButton>
        <p className="text-sm text-ink-soft">A plant already listed in the same form is updated, not listed twice.</p>
      </div>
    </Form>
  );
}

function StockedBadge({ species }: { species: WhatToGrowSpecies }) {
  return species.stocked ? (
    <span className="inline-flex items-center gap-1 rounded-full bg-moss px-2.5 py-0.5 text-sm font-semibold text-paper" data-testid="stock-state">
      <span aria-hidden="true">✓</span> Stocked: {species.forms.map(formLower).join(", ")}
    </span>
  ) : (
    <span className="inline-flex items-center rounded-full border border-dashed border-ink/50 px-2.5 py-0.5 text-sm font-medium text-ink" data-testid="stock-state">
      Not stocked
    </span>
  );
}

const monthList = (months: number[]) => months.map((m) => MONTH_NAMES[m - 1]).join(" and ");

/**
 * The default planting recommendation of each band, species by species, with whether this
 * nursery stocks it: the planners' first list, seen from the grower's side.
 */
export function WhatToGrow({ bands, onOffer }: { bands: WhatToGrowBand[]; onOffer?: (taxonId: number) => void }) {
  return (
    <section aria-labelledby="grow-heading" className="space-y-4">
      <div className="max-w-3xl space-y-2">
        <h2 id="grow-heading" className="text-2xl">What to grow</h2>
        <p className="text-ink-soft">
          The planting list planners are offered first in each band: native species that keep at least three in flower in every
          month from April to September, with the flowers queens need in early spring chosen first. Species you do not stock
          yet are ones planners will look for.
        </p>
        <p className="flex flex-wrap items-center gap-x-4 gap-y-1 text-sm text-ink-soft">
          <span className="inline-flex items-center gap-1.5">
            <span className="inline-block h-4 w-3 rounded-[2px] bg-moss" aria-hidden="true" /> in bloom
          </span>
          <span className="inline-flex items-center gap-1.5">
            <span className="inline-block h-4 w-3 rounded-[2px] bg-ink/8 ring-2 ring-pollen ring-inset" aria-hidden="true" /> April–May, when queens emerge
          </span>
        </p>
      </div>
      <div className="grid gap-4 md:grid-cols-2">
        {bands.map((view) => (
          <section key={view.band} aria-labelledby={`grow-${view.band}`} className="space-y-2 rounded-lg border border-ink/10 bg-white/50 p-4" data-testid={`what-to-grow-${view.band}`}>
            <h3 id={`grow-${view.band}`} className="text-xl">{BAND_LABELS[view.band]}</h3>
            <p className="text-sm" aria-live="polite">
              You stock <strong>{view.stockedCount}</strong> of the {view.species.length} species recommended here. Early spring:{" "}
              {monthList(view.earlySpringMonths)}.
            </p>
            {view.species.length === 0 ? (
              <p className="text-ink-soft">The checklist has no species to recommend here yet.</p>
            ) : (
              <ol className="divide-y divide-ink/10">
                {view.species.map((species) => (
                  <li key={species.id} className="space-y-1.5 py-3" data-testid="grow-species">
                    <div className="flex flex-wrap items-start justify-between gap-x-3 gap-y-1">
                      <span>
                        <i className="font-display">{species.scientificName}</i>{" "}
                        {species.vernacularName && <span className="text-sm text-ink-soft">{species.vernacularName}</span>}
                      </span>
                      <StockedBadge species={species} />
                    </div>
                    <div className="flex flex-wrap items-center gap-2 text-xs text-ink-soft">
                      {species.family}
                      <BloomStrip start={species.bloomStart} end={species.bloomEnd} />
                    </div>
                    <p className="text-sm text-ink-soft">{species.reason}.</p>
                    {!species.stocked && onOffer && (
                      <button
                        type="button"
                        onClick={() => onOffer(species.id)}
                        className="min-h-11 rounded-md border border-moss bg-white px-3 text-sm font-semibold text-moss-deep hover:bg-moss/10"
                      >
                        Add to my stock<span className="sr-only">: {species.scientificName}</span>
                      </button>
                    )}
                  </li>
                ))}
              </ol>
            )}
            {view.unmet.length > 0 && (
              <div className="rounded-md border-l-4 border-sky bg-sky/10 p-2 text-sm">
                <p className="font-semibold">Months the checklist cannot fill</p>
                <ul className="list-disc pl-5">
                  {view.unmet.map((gap) => (
                    <li key={gap.month}>{gap.why}</li>
                  ))}
                </ul>
              </div>
            )}
          </section>
        ))}
      </div>
    </section>
  );
}
