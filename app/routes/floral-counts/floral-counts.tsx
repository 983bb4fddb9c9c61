import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/floral-counts";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { listSites } from "~/visits/sites.server";
import { listFloralCounts, listFloralSurveys, type FloralCountRow } from "~/forage/floral-counts.server";
import { floralCountListQuery } from "~/forage/floral-count-schema";
import { FormMessage } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "Flower counts · Visitwort" }];

const PAGE_SIZE = 50;

const surveyKey = (siteId: number, surveyDate: string) => `${siteId}|${surveyDate}`;

export async function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context, { roles: ["recorder", "botanist"] });
  const em = context.get(entityManagerContext);
  const query = floralCountListQuery.parse(Object.fromEntries(new URL(request.url).searchParams));
  const filter = { siteId: query.site, from: query.from, to: query.to };
  const [{ surveys, total }, sites] = await Promise.all([
    listFloralSurveys(em, filter, { limit: PAGE_SIZE, offset: (query.page - 1) * PAGE_SIZE }),
    listSites(em),
  ]);
  // The plants of this page's surveys only: the page's dates bound them (newest first).
  const shown = new Set(surveys.map((s) => surveyKey(s.siteId, s.surveyDate)));
  const counts = surveys.length
    ? (await listFloralCounts(em, { siteId: query.site, from: surveys.at(-1)!.surveyDate, to: surveys[0]!.surveyDate })).filter((c) =>
        shown.has(surveyKey(c.siteId, c.surveyDate)),
      )
    : [];
  const plantsBySurvey: Record<string, FloralCountRow[]> = {};
  for (const count of counts) (plantsBySurvey[surveyKey(count.siteId, count.surveyDate)] ??= []).push(count);
  for (const plants of Object.values(plantsBySurvey)) plants.sort((a, b) => b.floweringUnits - a.floweringUnits || a.scientificName.localeCompare(b.scientificName));

  const saved =
    query.saved && query.site !== undefined
      ? {
          siteName: sites.find((s) => s.id === query.site)?.name ?? "the site",
          surveyDate: query.saved,
          created: query.new ?? 0,
          replaced: query.replaced ?? 0,
        }
      : null;
  return { query, surveys, total, plantsBySurvey, sites: sites.map((s) => ({ id: s.id, name: s.name })), saved, pages: Math.max(1, Math.ceil(total / PAGE_SIZE)) };
}

const number = (value: number) => value.toLocaleString("en");

function savedMessage(saved: { siteName: string; surveyDate: string; created: number; replaced: number }): string {
  const parts = [];
  if (saved.created) parts.push(`${saved.created} new ${saved.created === 1 ? "count" : "counts"}`);
  if (saved.replaced) parts.push(`${saved.replaced} ${saved.replaced === 1 ? "count" : "counts"} replacing an earlier one`);
  return `Saved the flower count at ${saved.siteName} on ${saved.surveyDate}: ${parts.join(" and ") || "nothing changed"}.`;
}

export default function FloralCounts({ loaderData }: Route.ComponentProps) {
  const { query, surveys, total, plantsBySurvey, sites, saved, pages } = loaderData;
  const loading = useNavigation().state === "loading";
  const filtered = query.site !== undefined || query.from !== undefined || query.to !== undefined;
  const pageLink = (page: number) => {
    const params = new URLSearchParams();
    if (query.site !== undefined) params.set("site", String(query.site));
    if (query.from) params.set("from", query.from);
    if (query.to) params.set("to", query.to);
    params.set("page", String(page));
    return `?${params}`;
  };

  return (
    <div className="space-y-5">
      <header className="flex flex-wrap items-end justify-between gap-3">
        <div className="max-w-2xl">
          <h1 className="text-3xl">Flower counts</h1>
          <p className="text-ink-soft">
            Each survey is the flowering units counted at one site on one day: what the bees had to choose from. The forage
            ranking weighs the visits against it.
          </p>
        </div>
        <Link to="/floral-counts/new" className="inline-flex min-h-12 items-center rounded-md bg-moss px-5 font-semibold text-paper no-underline hover:bg-moss-deep">
          Count flowers
        </Link>
      </header>

      {saved && <FormMessage tone="success">{savedMessage(saved)}</FormMessage>}

      <Form method="get" className="grid grid-cols-2 items-end gap-2 rounded-lg border border-ink/10 bg-white/40 p-3 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_minmax(0,1fr)_auto]" aria-label="Filter surveys">
        <label className="col-span-2 block text-sm sm:col-span-1">
          <span className="block font-semibold">Site</span>
          <select name="site" defaultValue={query.site ?? ""} className="min-h-11 w-full rounded-md border border-ink/30 bg-white px-2 text-base">
            <option value="">All sites</option>
            {sites.map((site) => (
              <option key={site.id} value={site.id}>{site.name}</option>
            ))}
          </select>
        </label>
        <label className="block text-sm">
          <span className="block font-semibold">From</span>
          <input type="date" name="from" defaultValue={query.from ?? ""} className="min-h-11 w-full min-w-0 rounded-md border border-ink/30 bg-white px-2 text-base" />
        </label>
        <label className="block text-sm">
          <span className="block font-semibold">To</span>
          <input type="date" name="to" defaultValue={query.to ?? ""} className="min-h-11 w-full min-w-0 rounded-md border border-ink/30 bg-white px-2 text-base" />
        </label>
        <div className="col-span-2 flex gap-2 sm:col-span-1">
          <button type="submit" className="min-h-11 rounded-md bg-moss px-4 font-semibold text-paper hover:bg-moss-deep">Show</button>
          {filtered && (
            <Link to="/floral-counts" className="inline-flex min-h-11 items-center whitespace-nowrap rounded-md border border-ink/25 bg-white/70 px-4 text-ink no-underline">
              All surveys
            </Link>
          )}
        </div>
      </Form>

      <p className="text-sm text-ink-soft">
        {total} {total === 1 ? "survey" : "surveys"}
        {filtered ? (total === 1 ? " matches" : " match") : ""}. Open a survey to see its plants.
      </p>

      <div className={loading ? "opacity-60" : undefined}>
        <div aria-hidden="true" className="hidden grid-cols-[8rem_minmax(0,1fr)_6rem_8rem_minmax(0,12rem)] gap-3 border-b border-ink/15 px-3 pb-1 text-sm font-semibold text-ink-soft sm:grid">
          <span>Date</span>
          <span>Site</span>
          <span className="text-right">Plants</span>
          <span className="text-right">Flowering units</span>
          <span>Counted by</span>
        </div>
        <ol aria-label="Surveys" className="divide-y divide-ink/10">
          {surveys.map((survey) => {
            const key = surveyKey(survey.siteId, survey.surveyDate);
            const plants = plantsBySurvey[key] ?? [];
            const justSaved = saved && query.site === survey.siteId && saved.surveyDate === survey.surveyDate;
            return (
              <li key={key} data-testid="survey" className={justSaved ? "bg-pollen/15" : undefined}>
                <details open={justSaved || undefined} className="group">
                  <summary className="grid min-h-12 cursor-pointer list-none grid-cols-[minmax(0,1fr)_auto] gap-x-3 gap-y-0.5 px-3 py-2 hover:bg-white/60 sm:grid-cols-[8rem_minmax(0,1fr)_6rem_8rem_minmax(0,12rem)] sm:items-center [&::-webkit-details-marker]:hidden">
                    <span className="whitespace-nowrap font-semibold tabular-nums">
                      <span aria-hidden="true" className="mr-1 inline-block text-ink-soft transition-transform group-open:rotate-90">›</span>
                      {survey.surveyDate}
                    </span>
                    <span className="col-span-2 row-start-2 truncate sm:col-span-1 sm:row-start-auto">{survey.siteName}</span>
                    <span className="col-start-2 row-start-1 text-right text-sm tabular-nums sm:col-start-auto sm:row-start-auto sm:text-base">
                      {survey.plants}
                      <span className="sm:sr-only"> {survey.plants === 1 ? "plant" : "plants"}</span>
                    </span>
                    <span className="col-span-2 text-sm text-ink-soft tabular-nums sm:col-span-1 sm:text-right sm:text-base sm:text-ink">
                      {number(survey.totalUnits)}
                      <span className="sm:sr-only"> flowering units</span>
                      <span className="sm:hidden"> · {survey.recorders.join(", ")}</span>
                    </span>
                    <span className="hidden truncate sm:block">{survey.recorders.join(", ")}</span>
                  </summary>
                  <table className="mx-3 mb-3 w-[calc(100%-1.5rem)] text-left text-[0.95rem]">
                    <caption className="sr-only">Plants counted at {survey.siteName} on {survey.surveyDate}</caption>
                    <thead className="text-sm text-ink-soft">
                      <tr>
                        <th scope="col" className="py-1 pr-2 font-semibold">Plant</th>
                        <th scope="col" className="py-1 pl-2 text-right font-semibold">Units</th>
                        <th scope="col" className="hidden w-1/3 py-1 pl-3 font-semibold sm:table-cell">Share of the survey</th>
                      </tr>
                    </thead>
                    <tbody className="divide-y divide-ink/5">
                      {plants.map((plant) => {
                        const share = survey.totalUnits > 0 ? plant.floweringUnits / survey.totalUnits : 0;
                        return (
                          <tr key={plant.id}>
                            <td className="py-1 pr-2">
                              <Link to={`/checklist/${plant.plantTaxonId}`} className="italic">{plant.scientificName}</Link>
                              {plant.vernacularName && <span className="block text-xs text-ink-soft sm:ml-2 sm:inline">{plant.vernacularName}</span>}
                            </td>
                            <td className="py-1 pl-2 text-right tabular-nums">{number(plant.floweringUnits)}</td>
                            <td className="hidden py-1 pl-3 sm:table-cell">
                              <span className="flex items-center gap-2">
                                <span className="h-2 flex-1 rounded-full bg-ink/10">
                                  <span className="block h-2 rounded-full bg-heather" style={{ width: `${Math.max(share * 100, share > 0 ? 1 : 0)}%` }} />
                                </span>
                                <span className="w-10 text-right text-xs tabular-nums text-ink-soft">{Math.round(share * 100)} %</span>
                              </span>
                            </td>
                          </tr>
                        );
                      })}
                    </tbody>
                  </table>
                  {plants.some((p) => p.remarks) && (
                    <p className="mx-3 mb-3 text-sm text-ink-soft">
                      {[...new Set(plants.map((p) => p.remarks).filter(Boolean))].join(" · ")}
                    </p>
                  )}
                </details>
              </li>
            );
          })}
          {surveys.length === 0 && (
            <li className="px-3 py-8 text-center text-ink-soft">
              {filtered ? "No surveys match these filters." : "No flowers counted yet."} <Link to="/floral-counts/new">Count flowers</Link>.
            </li>
          )}
        </ol>
      </div>

      {pages > 1 && (
        <nav aria-label="Pages" className="flex items-center justify-between gap-2">
          {query.page > 1 ? <Link to={pageLink(query.page - 1)} className="inline-flex min-h-11 items-center rounded-md border border-ink/25 px-4 no-underline">← Newer</Link> : <span />}
          <span className="text-sm text-ink-soft">Page {query.page} of {pages}</span>
          {query.page < pages ? <Link to={pageLink(query.page + 1)} className="inline-flex min-h-11 items-center rounded-md border border-ink/25 px-4 no-underline">Older →</Link> : <span />}
        </nav>
      )}
    </div>
  );
}
