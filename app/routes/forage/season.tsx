import { Link, useLocation, useNavigate, useSearchParams } from "react-router";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { Route } from "./+types/season";
import { requireUser } from "~/auth/permissions.server";
import { fetchForage, type SeasonResponse } from "~/forage/forage-api";
import { describeSeasonFilters, parseSeasonParams, seasonApiSearch, seasonSearch, withQuery } from "~/forage/view-params";
import { CommonFields, FilterPanel } from "~/components/forage/Filters";
import { EmptyResult, ForageTabs, LoadError, Loading } from "~/components/forage/PageParts";
import { BandCalendarView, CasteKey, seasonMax } from "~/components/forage/SeasonCalendar";

export const meta: Route.MetaFunction = () => [{ title: "Season calendar · Visitwort" }];

export function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context);
  return null;
}

export default function SeasonCalendarPage() {
  const [searchParams] = useSearchParams();
  const location = useLocation();
  const navigate = useNavigate();
  const params = parseSeasonParams(searchParams);
  const apiUrl = withQuery("/api/forage/season", seasonApiSearch(params));
  const query = useQuery({
    queryKey: ["forage", "season", apiUrl],
    queryFn: ({ signal }) => fetchForage<SeasonResponse>(apiUrl, signal),
    placeholderData: keepPreviousData,
    staleTime: 60_000,
    retry: (count, error) => count < 2 && !("status" in error && (error as { status: number }).status === 400),
  });
  const bands = query.data?.bands ?? [];
  const max = seasonMax(bands, params.allCastes);
  const anyVisits = bands.some((band) => band.months.some((m) => m.queen + m.worker + m.male + m.unknown > 0));

  return (
    <div className="space-y-5">
      <ForageTabs />
      <header className="space-y-1">
        <h1 className="text-3xl">Season calendar</h1>
        <p className="max-w-prose text-ink-soft">
          When queens were seen on flowers, month by month, in each band, beside the season windows the programme works with. A planting that feeds queens needs
          flowers in every shaded stretch.
        </p>
      </header>

      <FilterPanel key={location.search} summary={describeSeasonFilters(params)} normalise={(values) => seasonSearch({ ...parseSeasonParams(values), allCastes: params.allCastes })} resetTo="/season">
        <CommonFields values={params} />
      </FilterPanel>

      <div className="flex flex-wrap items-center justify-between gap-3">
        <CasteKey allCastes={params.allCastes} />
        <button
          type="button"
          aria-pressed={params.allCastes}
          onClick={() => navigate(withQuery("/season", seasonSearch({ ...params, allCastes: !params.allCastes })), { preventScrollReset: true })}
          className={`min-h-11 rounded-md border px-4 text-sm font-medium ${params.allCastes ? "border-moss bg-moss/10" : "border-ink/30 bg-white/70"}`}
        >
          <span aria-hidden="true">{params.allCastes ? "☑ " : "☐ "}</span>
          Workers, males and unsure caste too
        </button>
      </div>

      <div aria-busy={query.isFetching} className={`space-y-4 ${query.isPlaceholderData ? "opacity-60" : ""}`}>
        {query.isPending ? (
          <Loading what="the season calendar" />
        ) : query.isError ? (
          <LoadError error={query.error} onRetry={() => query.refetch()} />
        ) : (
          <>
            {!anyVisits && (
              <EmptyResult>
                <p className="font-semibold">No visits match these years and evidence.</p>
                <p className="mt-1 text-ink-soft">The season windows are still shown; widen the years{params.determination === "confirmed" ? " or include all records" : ""} to see visits.</p>
              </EmptyResult>
            )}
            {bands.map((band) => (
              <BandCalendarView key={band.band} band={band} allCastes={params.allCastes} max={max} />
            ))}
          </>
        )}
      </div>

      <p className="max-w-prose text-sm text-ink-soft">
        Bars in both bands share one scale. The windows are set by the programme’s coordinator. Which plants carry the queens in a window:{" "}
        <Link to="/forage/ranking">the forage ranking</Link>.
      </p>
    </div>
  );
}
