import { Link, useLocation, useSearchParams, type ShouldRevalidateFunctionArgs } from "react-router";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { Route } from "./+types/ranking";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { listBeeTaxa } from "~/taxa/taxa.server";
import { UNIDENTIFIED_BEE_NAME } from "~/forage/forage-query";
import { fetchForage, type RankingResponse } from "~/forage/forage-api";
import { CHART_TOP, hasSelection, rankingCsv, shareAxisMax } from "~/forage/ranking-view";
import { describeDateRange, describeMonths } from "~/forage/calendar";
import { csvFileName } from "~/forage/csv";
import { SEASON_LABELS, SEASON_NAMES, type SeasonName } from "~/forage/seasons";
import {
  BAND_CHOICES,
  BAND_CHOICE_LABELS,
  describeRankingFilters,
  parseRankingParams,
  rankingApiSearch,
  rankingSearch,
  withQuery,
} from "~/forage/view-params";
import { CASTES, CASTE_LABELS, type Caste } from "~/visits/vocabulary";
import { CommonFields, FilterPanel, MonthToggles, SelectField } from "~/components/forage/Filters";
import { EmptyResult, ForageTabs, LoadError, Loading, downloadText } from "~/components/forage/PageParts";
import { RankingChart, RankingResults } from "~/components/forage/Ranking";

export const meta: Route.MetaFunction = () => [{ title: "Forage ranking · Visitwort" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context);
  const bees = await listBeeTaxa(context.get(entityManagerContext));
  return { bees: bees.map((b) => ({ scientificName: b.scientificName, vernacularName: b.vernacularNames[0] ?? null })) };
}

// Filters live in the address and the figures come from the API: the bee list need not reload.
export function shouldRevalidate({ currentUrl, nextUrl, formMethod, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  return formMethod || currentUrl.pathname !== nextUrl.pathname ? defaultShouldRevalidate : false;
}

const HEADING_CASTE: Record<Caste, string> = { queen: "queens", worker: "workers", male: "males", unknown: "(caste not sure)" };

/** Short names for the windows where a long label would crowd a line. */
const WINDOW_SHORT: Record<SeasonName, string> = { "early-spring": "early spring", "second-wave": "second wave", overwinter: "overwintering" };

export default function ForageRanking({ loaderData }: Route.ComponentProps) {
  const [searchParams] = useSearchParams();
  const location = useLocation();
  const params = parseRankingParams(searchParams);
  const apiUrl = withQuery("/api/forage/ranking", rankingApiSearch(params));
  const query = useQuery({
    queryKey: ["forage", "ranking", apiUrl],
    queryFn: ({ signal }) => fetchForage<RankingResponse>(apiUrl, signal),
    placeholderData: keepPreviousData,
    staleTime: 60_000,
    retry: (count, error) => count < 2 && !("status" in error && (error as { status: number }).status === 400),
  });

  const summary = describeRankingFilters(params, WINDOW_SHORT[params.window]);
  const beeOptions = [
    ...loaderData.bees.map((b) => [b.scientificName, b.vernacularName ? `${b.scientificName} (${b.vernacularName})` : b.scientificName] as const),
    [UNIDENTIFIED_BEE_NAME, `${UNIDENTIFIED_BEE_NAME} (not identified to species)`] as const,
  ];
  const data = query.data;
  const items = data?.items ?? [];
  const max = shareAxisMax(items);
  const withSelection = hasSelection(items);

  return (
    <div className="space-y-5">
      <ForageTabs />
      <header className="space-y-1">
        <h1 className="text-3xl">Forage ranking</h1>
        <p className="max-w-prose text-ink-soft">
          Which plants carry the bumble bees’ visits in a part of the year, with how sure we can be of each plant’s share.
        </p>
      </header>

      <FilterPanel key={location.search} summary={summary} normalise={(values) => rankingSearch(parseRankingParams(values))} resetTo="/forage/ranking">
        <SelectField label="Bee" name="bee" defaultValue={params.bee} options={beeOptions} emptyLabel="All bumble bees" wide />
        <SelectField label="Caste" name="caste" defaultValue={params.caste} options={CASTES.map((c) => [c, CASTE_LABELS[c]] as const)} wide="phone" />
        <SelectField label="Band" name="band" defaultValue={params.band} options={BAND_CHOICES.map((b) => [b, BAND_CHOICE_LABELS[b]] as const)} wide="phone" />
        <SelectField label="Season window" name="window" defaultValue={params.window} options={SEASON_NAMES.map((s) => [s, SEASON_LABELS[s]] as const)} wide />
        <MonthToggles legend="Or months" selected={params.months} hint="Ticked months replace the season window." />
        <CommonFields values={params} />
      </FilterPanel>

      <section aria-labelledby="ranking-heading" aria-busy={query.isFetching} className={`space-y-4 ${query.isPlaceholderData ? "opacity-60" : ""}`}>
        <div className="flex flex-wrap items-end justify-between gap-2">
          <div>
            <h2 id="ranking-heading" className="text-xl">
              Plants visited by {params.bee ? <i>{params.bee}</i> : "bumble bee"} {HEADING_CASTE[params.caste]}
            </h2>
            {data && <WindowLine window={data.window} />}
          </div>
          {items.length > 0 && (
            <button
              type="button"
              onClick={() => downloadText(csvFileName("visitwort", "forage-ranking", params.bee, params.caste, params.band, params.months.length ? `months-${params.months.join("-")}` : params.window, params.from, params.to), rankingCsv(items))}
              className="min-h-11 rounded-md border border-ink/30 bg-white/70 px-4 font-medium hover:bg-white"
            >
              Download CSV
            </button>
          )}
        </div>

        {query.isPending ? (
          <Loading what="the ranking" />
        ) : query.isError ? (
          <LoadError error={query.error} onRetry={() => query.refetch()} />
        ) : data && (data.totalVisits === 0 || items.length === 0) ? (
          <EmptyResult>
            <p className="font-semibold">No visits match these filters.</p>
            <p className="mt-1 text-ink-soft">
              Nothing was recorded for this bee, caste, band and part of the year{params.determination === "confirmed" ? " with confirmed determinations" : ""}. Try another window, both bands
              {params.determination === "confirmed" ? ", or all records" : ""}.
            </p>
          </EmptyResult>
        ) : data ? (
          <>
            <p className="text-sm text-ink-soft">
              {data.totalVisits} {data.totalVisits === 1 ? "visit" : "visits"} to {items.length} {items.length === 1 ? "plant" : "plants"}, ordered by the lower end of each plant’s interval.
            </p>
            <RankingChart
              items={items.slice(0, CHART_TOP)}
              max={max}
              caption={items.length > CHART_TOP ? `The top ${CHART_TOP} plants` : items.length === 1 ? "The plant" : `All ${items.length} plants`}
            />
            <RankingResults items={items} max={max} withSelection={withSelection} caption={`Forage ranking — ${summary}`} />
          </>
        ) : null}
      </section>

      <MethodNote />
    </div>
  );
}

function WindowLine({ window }: { window: RankingResponse["window"] }) {
  if (window.months && window.months.length) {
    return <p className="text-sm text-ink-soft">Visits in {describeMonths(window.months)}{window.band === "all" ? ", both bands" : `, ${window.band} band`}.</p>;
  }
  if (!window.name) return null;
  return (
    <p className="text-sm text-ink-soft">
      {SEASON_LABELS[window.name]}:{" "}
      {window.ranges.length === 0
        ? "no dates set"
        : window.ranges.map((range, index) => (
            <span key={range.band}>
              {index > 0 && "; "}
              {range.band} band, {describeDateRange(range.start, range.end)}
            </span>
          ))}
    </p>
  );
}

function MethodNote() {
  return (
    <section aria-labelledby="method-heading" className="max-w-prose space-y-2 rounded-lg border border-ink/10 bg-paper-deep/40 p-4 text-sm" data-testid="method-note">
      <h2 id="method-heading" className="text-lg">
        How to read the ranking
      </h2>
      <p>
        <strong>Share of visits</strong> is the part of all visits in the chosen window that went to the plant. Its <strong>95 % interval</strong> is the range of shares
        that fit the records (the Wilson 1927 score interval): the fewer the visits, the wider the line.
      </p>
      <p>
        Plants are <strong>ordered by the lower end</strong> of that interval, the share we can be fairly sure of, so a plant seen only now and then does not jump ahead of
        one with plenty of records.
      </p>
      <p>
        <strong>Few records</strong> marks a plant with fewer than 5 visits, or with visits at fewer than 2 sites. Read those rows as hints, not results.
      </p>
      <p>
        <strong>Evidence:</strong> by default only visits whose plant and bee determinations are confirmed (or corrected) count. Choose “All records” to include proposed
        determinations too.
      </p>
      <p>
        <strong>Selection ratio</strong> is the plant’s share of visits divided by its share of the flowers counted at the same sites in the same window (Manly and
        others, 2002). Above 1, bees visited it more than its flowers’ abundance alone would suggest; below 1, less. Its interval is widened (Bonferroni) so that all
        plants’ intervals hold together. It is shown only where flowers were counted.
      </p>
      <p>
        <strong>Jacobs’ D</strong> says the same on a scale from −1 (avoided) through 0 (visited as often as its flowers are found) to +1 (preferred).
      </p>
      <p>
        See also the <Link to="/forage">forage matrix</Link> for counts by bee and month, and the <Link to="/season">season calendar</Link> for when queens are about.
      </p>
    </section>
  );
}
