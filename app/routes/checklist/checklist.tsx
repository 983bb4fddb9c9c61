import { useMemo, useState } from "react";
import { Form, Link, useRouteLoaderData, useSearchParams, type ShouldRevalidateFunctionArgs } from "react-router";
import type { loader as rootLoader } from "~/root";
import { hasAnyRole } from "~/auth/roles";
import type { Route } from "./+types/checklist";
import { entityManagerContext } from "~/db/orm.server";
import { listPlantTaxa } from "~/taxa/taxa.server";
import { createTaxonIndex, type MatchedField } from "~/taxa/search";
import { REGIONAL_STATUSES, type RegionalStatus } from "~/taxa/checklist-schema";
import { REGIONAL_STATUS_LABELS, type PlantTaxonRecord } from "~/taxa/taxon-record";
import { BloomStrip } from "~/components/BloomStrip";
import { StatusBadge } from "~/components/StatusBadge";

export const meta: Route.MetaFunction = () => [
  { title: "Plant checklist · Visitwort" },
  { name: "description", content: "The regional checklist of plants that bumble bees visit, with bloom months." },
];

export async function loader({ context }: Route.LoaderArgs) {
  const taxa = await listPlantTaxa(context.get(entityManagerContext));
  return { taxa };
}

// Typing in the search box only changes ?q= and ?status=: the list itself is already here.
export function shouldRevalidate({ currentUrl, nextUrl, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  if (currentUrl.pathname === nextUrl.pathname) return false;
  return defaultShouldRevalidate;
}

const FIELD_LABEL: Record<MatchedField, string> = {
  scientificName: "scientific name",
  vernacularName: "common name",
  synonym: "synonym",
};

function parseStatus(value: string | null): RegionalStatus | "all" {
  return REGIONAL_STATUSES.includes(value as RegionalStatus) ? (value as RegionalStatus) : "all";
}

export default function Checklist({ loaderData }: Route.ComponentProps) {
  const { taxa } = loaderData;
  const [searchParams, setSearchParams] = useSearchParams();
  const [query, setQuery] = useState(searchParams.get("q") ?? "");
  const status = parseStatus(searchParams.get("status"));
  const index = useMemo(() => createTaxonIndex(taxa), [taxa]);

  const rows = useMemo(() => {
    const found: { taxon: PlantTaxonRecord; matchedName?: string; matchedField?: MatchedField }[] = query.trim()
      ? index.search(query, 60)
      : taxa.map((taxon) => ({ taxon }));
    return status === "all" ? found : found.filter((row) => row.taxon.regionalStatus === status);
  }, [index, taxa, query, status]);

  function updateParams(next: { q?: string; status?: string }) {
    const params = new URLSearchParams(searchParams);
    for (const [key, value] of Object.entries(next)) {
      if (value && value !== "all") params.set(key, value);
      else params.delete(key);
    }
    setSearchParams(params, { replace: true, preventScrollReset: true });
  }

  return (
    <div className="space-y-5">
      <header className="space-y-1">
        <h1 className="text-3xl sm:text-4xl">Plant checklist</h1>
        <p className="text-ink-soft">
          {taxa.length} flowering plants of the upper Midwest and Great Lakes that bumble bees visit, native and
          introduced, with the months they bloom.
        </p>
      </header>

      <StewardshipLinks />

      <Form method="get" role="search" className="space-y-3" onSubmit={(event) => event.preventDefault()}>
        <div>
          <label htmlFor="checklist-q" className="mb-1 block font-semibold">
            Find a plant
          </label>
          <div className="flex gap-2">
            <input
              id="checklist-q"
              name="q"
              type="search"
              autoComplete="off"
              spellCheck={false}
              value={query}
              placeholder="Scientific name, common name or synonym"
              onChange={(event) => {
                setQuery(event.target.value);
                updateParams({ q: event.target.value });
              }}
              className="min-h-11 w-full rounded-md border border-ink/30 bg-white px-3 text-base shadow-inner focus:border-moss"
            />
            <noscript>
              <button type="submit" className="min-h-11 rounded-md bg-moss px-4 font-semibold text-paper">
                Search
              </button>
            </noscript>
          </div>
          <p className="mt-1 text-sm text-ink-soft">Misspellings are fine: “bloodrot” finds bloodroot.</p>
        </div>
        <fieldset className="flex flex-wrap items-center gap-2">
          <legend className="sr-only">Status in the region</legend>
          {(["all", ...REGIONAL_STATUSES] as const).map((value) => (
            <label
              key={value}
              className={`inline-flex min-h-11 cursor-pointer items-center rounded-full border px-4 text-sm font-medium has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-pollen ${
                status === value ? "border-moss bg-moss text-paper" : "border-ink/25 bg-white/60 text-ink"
              }`}
            >
              <input
                type="radio"
                name="status"
                value={value}
                checked={status === value}
                onChange={() => updateParams({ status: value })}
                className="sr-only"
              />
              {value === "all" ? "All" : REGIONAL_STATUS_LABELS[value]}
            </label>
          ))}
        </fieldset>
      </Form>

      <BloomLegend />

      <p className="text-sm text-ink-soft" aria-live="polite">
        {query.trim() ? `${rows.length} matching “${query.trim()}”` : `${rows.length} taxa`}
      </p>

      <ul className="divide-y divide-ink/10 rounded-lg border border-ink/10 bg-white/50" data-testid="checklist-results">
        {rows.map(({ taxon, matchedName, matchedField }) => (
          <li key={taxon.id} className="grid gap-x-4 gap-y-1 px-3 py-3 sm:grid-cols-[1fr_auto] sm:items-center">
            <div className="min-w-0">
              <Link to={`/checklist/${taxon.id}`} className="font-display text-lg italic text-ink underline decoration-ink/25 underline-offset-2 hover:decoration-moss">
                {taxon.scientificName}
              </Link>{" "}
              <span className="text-sm text-ink-soft">{taxon.scientificNameAuthorship}</span>
              <p className="text-[0.95rem]">{taxon.vernacularNames.join(", ")}</p>
              {matchedField && matchedField !== "scientificName" && matchedField !== "vernacularName" && (
                <p className="text-sm text-ink-soft">
                  matched {FIELD_LABEL[matchedField]} <i>{matchedName}</i>
                </p>
              )}
            </div>
            <div className="flex flex-wrap items-center gap-x-3 gap-y-1 text-sm">
              <span className="text-ink-soft">{taxon.family}</span>
              <StatusBadge status={taxon.regionalStatus} />
              <BloomStrip start={taxon.bloomStart} end={taxon.bloomEnd} />
            </div>
          </li>
        ))}
        {rows.length === 0 && (
          <li className="px-3 py-6 text-center text-ink-soft">
            No plant on the checklist matches. Try the genus, or fewer letters.
          </li>
        )}
      </ul>
    </div>
  );
}

const stewardLink = "inline-flex min-h-11 items-center rounded-md border border-moss px-4 font-semibold text-moss-deep no-underline hover:bg-moss/10";

/** For the people who keep the checklist: add, import, export. */
function StewardshipLinks() {
  const roles = useRouteLoaderData<typeof rootLoader>("root")?.user?.roles;
  if (!roles || !hasAnyRole(roles, ["botanist"])) return null;
  return (
    <nav aria-label="Checklist stewardship" className="flex flex-wrap gap-2">
      <Link to="/checklist/new" className={stewardLink}>
        Add a taxon
      </Link>
      <Link to="/checklist/import" className={stewardLink}>
        Import
      </Link>
      {/* A file download, not a page: the browser fetches it itself. */}
      <a href="/checklist/export.csv" download className={stewardLink}>
        Export CSV
      </a>
    </nav>
  );
}

function BloomLegend() {
  return (
    <div className="flex flex-wrap items-center gap-x-4 gap-y-1 text-sm text-ink-soft">
      <span className="inline-flex items-center gap-1.5">
        <span className="inline-block h-4 w-3 rounded-[2px] bg-moss" aria-hidden="true" /> in bloom
      </span>
      <span className="inline-flex items-center gap-1.5">
        <span className="inline-block h-4 w-3 rounded-[2px] bg-ink/8 ring-2 ring-pollen ring-inset" aria-hidden="true" />
        early spring (April–May), when queens emerge
      </span>
      <span>Months run January to December.</span>
    </div>
  );
}
