import { useMemo, useState } from "react";
import { Link, useLocation, useSearchParams, type ShouldRevalidateFunctionArgs } from "react-router";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { Route } from "./+types/matrix";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { listBeeTaxa } from "~/taxa/taxa.server";
import { UNIDENTIFIED_BEE_NAME } from "~/forage/forage-query";
import { fetchForage, type MatrixResponse } from "~/forage/forage-api";
import { buildGrid, gridCsv } from "~/forage/matrix-grid";
import { countClasses } from "~/forage/colour-scale";
import { csvFileName } from "~/forage/csv";
import {
  BAND_CHOICES,
  BAND_CHOICE_LABELS,
  MATRIX_VIEWS,
  MATRIX_VIEW_LABELS,
  describeMatrixFilters,
  matrixApiSearch,
  matrixSearch,
  parseMatrixParams,
  parseMonths,
  withQuery,
  type MatrixParams,
} from "~/forage/view-params";
import { CASTES, CASTE_LABELS } from "~/visits/vocabulary";
import { CommonFields, FilterPanel, MonthToggles, SelectField } from "~/components/forage/Filters";
import { EmptyResult, ForageTabs, LoadError, Loading, downloadText } from "~/components/forage/PageParts";
import { HeatLegend, MatrixHeatMap } from "~/components/forage/MatrixHeatMap";
import { MatrixTable } from "~/components/forage/MatrixTable";

export const meta: Route.MetaFunction = () => [{ title: "Forage matrix · Visitwort" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context);
  const bees = await listBeeTaxa(context.get(entityManagerContext));
  return { bees: bees.map((b) => ({ scientificName: b.scientificName, vernacularName: b.vernacularNames[0] ?? null })) };
}

// The filters live in the address and the figures come from the API, so a change of filters
// needs nothing new from the loader (the bee list).
export function shouldRevalidate({ currentUrl, nextUrl, formMethod, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  return formMethod || currentUrl.pathname !== nextUrl.pathname ? defaultShouldRevalidate : false;
}

/** More plant rows than this make a heat map too long to take in; the rest wait behind a button. */
const HEATMAP_ROWS = 40;

export default function ForageMatrix({ loaderData }: Route.ComponentProps) {
  const [searchParams] = useSearchParams();
  const location = useLocation();
  const params = parseMatrixParams(searchParams);
  const apiUrl = withQuery("/api/forage/matrix", matrixApiSearch(params));
  const query = useQuery({
    queryKey: ["forage", "matrix", apiUrl],
    queryFn: ({ signal }) => fetchForage<MatrixResponse>(apiUrl, signal),
    placeholderData: keepPreviousData,
    staleTime: 60_000,
    retry: (count, error) => count < 2 && !("status" in error && (error as { status: number }).status === 400),
  });
  const monthsKey = params.months.join(",");
  const grid = useMemo(
    () => (query.data ? buildGrid(query.data, params.view, { months: parseMonths(monthsKey) }) : null),
    [query.data, params.view, monthsKey],
  );
  const classes = useMemo(() => countClasses(grid?.max ?? 0), [grid]);
  const [showAllRows, setShowAllRows] = useState(false);

  const summary = describeMatrixFilters(params);
  const link = (change: Partial<MatrixParams>) => withQuery("/forage", matrixSearch({ ...params, ...change }));
  const beeOptions = [
    ...loaderData.bees.map((b) => [b.scientificName, b.vernacularName ? `${b.scientificName} (${b.vernacularName})` : b.scientificName] as const),
    [UNIDENTIFIED_BEE_NAME, `${UNIDENTIFIED_BEE_NAME} (not identified to species)`] as const,
  ];
  const what = params.view === "bee-plant" ? "Visits by bee and plant" : "Visits by plant and month";

  return (
    <div className="space-y-5">
      <ForageTabs />
      <header className="space-y-1">
        <h1 className="text-3xl">Forage matrix</h1>
        <p className="max-w-prose text-ink-soft">
          Counts of visits: which bumble bees were seen on which plants, and when. Pick the months to add up, or lay the year out month by month.
        </p>
      </header>

      <FilterPanel key={location.search} summary={summary} normalise={(values) => matrixSearch(parseMatrixParams(values))} resetTo={withQuery("/forage", matrixSearch({ ...parseMatrixParams(new URLSearchParams()), view: params.view, display: params.display }))}>
        <input type="hidden" name="view" value={params.view} />
        <input type="hidden" name="display" value={params.display} />
        <SelectField label="Bee" name="bee" defaultValue={params.bee} options={beeOptions} emptyLabel="All bumble bees" wide />
        <SelectField label="Caste" name="caste" defaultValue={params.caste} options={CASTES.map((c) => [c, CASTE_LABELS[c]] as const)} emptyLabel="Any caste" wide="phone" />
        <SelectField label="Band" name="band" defaultValue={params.band} options={BAND_CHOICES.map((b) => [b, BAND_CHOICE_LABELS[b]] as const)} wide="phone" />
        <MonthToggles
          legend="Months"
          selected={params.months}
          hint={params.view === "bee-plant" ? "Visits in the ticked months are added up. None ticked: the whole year." : "Only the ticked months are shown. None ticked: the whole year."}
        />
        <CommonFields values={params} />
      </FilterPanel>

      <div className="flex flex-wrap items-center justify-between gap-3">
        <Switch label="Lay out" options={MATRIX_VIEWS.map((v) => ({ key: v, label: MATRIX_VIEW_LABELS[v], to: link({ view: v }), current: params.view === v }))} />
        <Switch
          label="Show as"
          options={[
            { key: "heatmap", label: "Heat map", to: link({ display: "heatmap" }), current: params.display === "heatmap" },
            { key: "table", label: "Table", to: link({ display: "table" }), current: params.display === "table" },
          ]}
        />
      </div>

      <section aria-labelledby="matrix-heading" aria-busy={query.isFetching} className={`space-y-3 ${query.isPlaceholderData ? "opacity-60" : ""}`}>
        <div className="flex flex-wrap items-end justify-between gap-2">
          <h2 id="matrix-heading" className="text-xl">
            {what}
          </h2>
          {grid && grid.rows.length > 0 && (
            <button
              type="button"
              onClick={() => downloadText(csvFileName("visitwort", "forage", params.view, params.bee, params.caste, params.band, params.from, params.to), gridCsv(grid))}
              className="min-h-11 rounded-md border border-ink/30 bg-white/70 px-4 font-medium hover:bg-white"
            >
              Download CSV
            </button>
          )}
        </div>

        {query.isPending ? (
          <Loading what="the matrix" />
        ) : query.isError ? (
          <LoadError error={query.error} onRetry={() => query.refetch()} />
        ) : grid && grid.rows.length === 0 ? (
          <EmptyResult>
            <p className="font-semibold">No visits match these filters.</p>
            <p className="mt-1 text-ink-soft">
              Try both bands, more months or any caste{params.determination === "confirmed" ? ", or include records whose determinations are not confirmed yet" : ""}.
            </p>
          </EmptyResult>
        ) : grid ? (
          <>
            <p className="text-sm text-ink-soft">
              {grid.total} {grid.total === 1 ? "visit" : "visits"} to {grid.rows.length} {grid.rows.length === 1 ? "plant" : "plants"}
              {params.view === "bee-plant" ? ` by ${grid.columns.length} ${grid.columns.length === 1 ? "kind of bee" : "kinds of bee"}` : ""}. Most-visited plants first.
            </p>
            {params.display === "heatmap" ? (
              <>
                <HeatLegend classes={classes} />
                <MatrixHeatMap
                  grid={grid}
                  classes={classes}
                  rows={showAllRows ? grid.rows : grid.rows.slice(0, HEATMAP_ROWS)}
                  label={`${what}, ${summary}. The same numbers are in the table view.`}
                />
                {grid.rows.length > HEATMAP_ROWS && (
                  <button type="button" onClick={() => setShowAllRows((all) => !all)} className="min-h-11 rounded-md border border-ink/30 px-4 font-medium">
                    {showAllRows ? `Show the top ${HEATMAP_ROWS} plants only` : `Show all ${grid.rows.length} plants`}
                  </button>
                )}
                <p className="text-sm">
                  Reading the numbers aloud? <Link to={link({ display: "table" })}>Use the table view</Link>: the same figures, sortable by any column.
                </p>
              </>
            ) : (
              <MatrixTable grid={grid} caption={`${what} — ${summary}. Select a column heading to sort.`} />
            )}
          </>
        ) : null}
      </section>
    </div>
  );
}

/** A pair of links that behave as a switch; the current one is marked for screen readers too. */
function Switch({ label, options }: { label: string; options: { key: string; label: string; to: string; current: boolean }[] }) {
  return (
    <div className="flex flex-col items-start gap-1 sm:flex-row sm:items-center sm:gap-2" role="group" aria-label={label}>
      <span className="text-sm font-semibold" aria-hidden="true">{label}</span>
      <span className="inline-flex rounded-md border border-ink/25 bg-white/60 p-0.5">
        {options.map((option) => (
          <Link
            key={option.key}
            to={option.to}
            preventScrollReset
            aria-current={option.current ? "page" : undefined}
            className={`inline-flex min-h-10 items-center whitespace-nowrap rounded px-3 text-sm font-medium no-underline ${option.current ? "bg-moss text-paper" : "text-ink hover:bg-ink/5"}`}
          >
            {option.current && <span aria-hidden="true">✓&nbsp;</span>}
            {option.label}
          </Link>
        ))}
      </span>
    </div>
  );
}
