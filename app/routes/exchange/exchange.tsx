import { useEffect, useState } from "react";
import { Form, Link, useNavigation, useSubmit } from "react-router";
import type { Route } from "./+types/exchange";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { countExport, exportFilters } from "~/exchange/export.server";
import { listBeeTaxa, listPlantTaxa } from "~/taxa/taxa.server";
import { listSites } from "~/visits/sites.server";
import { MONTH_NAMES } from "~/taxa/bloom";
import { BEE_NOT_SURE_LABEL, CASTE_LABELS, CASTES, DETERMINATION_STATUS_LABELS, DETERMINATION_STATUSES } from "~/visits/vocabulary";

export const meta: Route.MetaFunction = () => [{ title: "Export visits · Visitwort" }];

const FILTER_KEYS = ["bee", "caste", "plant", "status", "month", "site"] as const;

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["planner"] });
  const em = context.get(entityManagerContext);
  const parsed = exportFilters.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  const filters = parsed.success ? parsed.data : {};
  const [counts, bees, plants, sites] = await Promise.all([countExport(em, user, filters), listBeeTaxa(em), listPlantTaxa(em), listSites(em)]);
  const query = new URLSearchParams();
  for (const key of FILTER_KEYS) if (filters[key] !== undefined) query.set(key, String(filters[key]));
  return {
    filters,
    query: query.toString(),
    counts,
    exact: user.roles.includes("coordinator"),
    bees: bees.map((b) => ({ id: b.id, scientificName: b.scientificName, sensitive: b.sensitive })),
    plants: plants.map((p) => ({ id: p.id, scientificName: p.scientificName })),
    sites: sites.map((s) => ({ id: s.id, name: s.name })),
  };
}

const plural = (n: number, one: string, many: string) => `${n.toLocaleString("en")} ${n === 1 ? one : many}`;

export default function Exchange({ loaderData }: Route.ComponentProps) {
  const { filters, counts, exact, query } = loaderData;
  const submit = useSubmit();
  const loading = useNavigation().state === "loading";
  // The selects follow the URL (also after "Every visit" or the back button), and the download
  // links follow the selects, so a file never holds other visits than the page shows chosen.
  const [chosen, setChosen] = useState<Record<string, string>>(() => Object.fromEntries(new URLSearchParams(query)));
  useEffect(() => setChosen(Object.fromEntries(new URLSearchParams(query))), [query]);
  const chosenQuery = new URLSearchParams(FILTER_KEYS.flatMap((key) => (chosen[key] ? [[key, chosen[key]!]] : []))).toString();
  const suffix = chosenQuery ? `?${chosenQuery}` : "";
  const filtersInUse = query !== "";
  const choice = (name: (typeof FILTER_KEYS)[number]) => ({
    name,
    value: chosen[name] ?? "",
    onChange: (value: string) => setChosen((now) => ({ ...now, [name]: value })),
  });

  return (
    <div className="max-w-4xl space-y-6">
      <header className="space-y-2">
        <h1 className="text-3xl sm:text-4xl">Export visits</h1>
        <p className="max-w-2xl">
          Download visits as Darwin Core occurrences, the standard that biodiversity portals such as GBIF read: each row
          is one bee seen on one flower, with its place, date, caste and who identified it.
        </p>
      </header>

      <Form
        method="get"
        aria-label="Choose the visits to export"
        onChange={(event) => submit(event.currentTarget, { replace: true, preventScrollReset: true })}
        className="grid grid-cols-1 gap-3 rounded-lg border border-ink/10 bg-white/50 p-3 min-[420px]:grid-cols-2 md:grid-cols-3"
      >
        <Choice label="Bee" {...choice("bee")} options={[["unsure", BEE_NOT_SURE_LABEL], ...loaderData.bees.map((b) => [String(b.id), b.scientificName] as [string, string])]} />
        <Choice label="Caste" {...choice("caste")} options={CASTES.map((c) => [c, CASTE_LABELS[c]] as [string, string])} />
        <Choice label="Plant" {...choice("plant")} options={[["not_identified", "Not identified"], ...loaderData.plants.map((p) => [String(p.id), p.scientificName] as [string, string])]} />
        <Choice label="Plant status" {...choice("status")} options={DETERMINATION_STATUSES.map((s) => [s, DETERMINATION_STATUS_LABELS[s]] as [string, string])} />
        <Choice label="Month" {...choice("month")} options={MONTH_NAMES.map((m, i) => [String(i + 1), m] as [string, string])} />
        <Choice label="Site" {...choice("site")} options={loaderData.sites.map((s) => [String(s.id), s.name] as [string, string])} />
        <div className="flex flex-wrap gap-2 min-[420px]:col-span-2 md:col-span-3">
          <button type="submit" className="min-h-11 rounded-md border border-moss px-4 font-semibold text-moss hover:bg-moss/10">
            Apply
          </button>
          {filtersInUse && (
            <Link to="/exchange" className="inline-flex min-h-11 items-center rounded-md border border-ink/25 px-4 text-ink no-underline">
              Every visit
            </Link>
          )}
        </div>
      </Form>

      <section aria-labelledby="download-heading" className={`space-y-3 ${loading ? "opacity-60" : ""}`}>
        <h2 id="download-heading" className="text-2xl">Download</h2>
        <p role="status" className="text-lg">
          <strong className="tabular-nums">{plural(counts.visits, "visit", "visits")}</strong> {filtersInUse ? "match your choice" : "in all"}
          {counts.sensitive > 0 && (
            <>
              {", "}
              {plural(counts.sensitive, "of a sensitive species", "of sensitive species")}
              {exact ? " (your copy gives their exact places)" : counts.generalised > 0 ? ` (${plural(counts.generalised, "place", "places")} generalised in your copy)` : " (all recorded by you: exact)"}
            </>
          )}
          .
        </p>
        {!exact && filters.site !== undefined && (
          <p className="text-sm text-ink-soft">
            With a site chosen, visits of sensitive species are left out, except your own: the site’s name beside them would give
            away the place that generalising hides.
          </p>
        )}
        {counts.visits === 0 ? (
          <p className="text-ink-soft">Nothing to download: no visits match. Choose “Any” for a filter to widen the choice.</p>
        ) : (
          <div className="grid gap-3 sm:grid-cols-2">
            <DownloadCard
              href={`/exchange/occurrences.csv${suffix}`}
              action="Download the spreadsheet (CSV)"
              text="One row per visit, with Darwin Core names as column headings. Opens in any spreadsheet program."
            />
            <DownloadCard
              href={`/exchange/archive.zip${suffix}`}
              action="Download the Darwin Core Archive (zip)"
              text="For GBIF and other portals: the occurrences, each bee’s “visits flowers of” link to its plant, and the files that describe them (meta.xml, eml.xml)."
            />
          </div>
        )}
        {exact && (
          <p className="rounded-md border-l-4 border-clay bg-clay/10 px-3 py-2">
            You are a coordinator, so your downloads hold the exact places of sensitive species. Do not publish them or pass them
            on as they are.
          </p>
        )}
      </section>

      <section aria-labelledby="sensitive-heading" className="max-w-2xl space-y-2">
        <h2 id="sensitive-heading" className="text-2xl">Places of sensitive species</h2>
        <p>
          Some bumble bees are rare enough that telling where they live can harm them, by drawing collectors, photographers and
          trampling. The rusty patched bumble bee (<i>Bombus affinis</i>) is one. Only the programme’s coordinators, and the
          person who recorded a visit, get the exact place of these bees; everyone else gets a generalised place.
        </p>
        <p>
          We follow the guidance GBIF published on sensitive species (Chapman 2020, <cite>Current Best Practices for Generalizing
          Sensitive Species Occurrence Data</cite>): for a highly sensitive species, give only a grid square of 0.1°, about 11 km
          from south to north and a little less from west to east. The point is moved to the middle of its square, the stated uncertainty is widened until its
          circle covers the whole square, the site’s name is left out, and each such row says what was done in its{" "}
          <code>dataGeneralizations</code> and <code>informationWithheld</code> columns. A visit
          counts as sensitive if its bee, or any bee it was ever identified as, is on the sensitive list.
        </p>
        <p className="text-sm text-ink-soft">
          Identification columns (<code>identifiedBy</code>, <code>dateIdentified</code>,{" "}
          <code>identificationVerificationStatus</code>) are about the bee. The plant’s identification is in the archive’s
          relationship file: who named the plant, when, and how that stands.
        </p>
      </section>
    </div>
  );
}

function DownloadCard({ href, action, text }: { href: string; action: string; text: string }) {
  return (
    <div className="flex flex-col justify-between gap-3 rounded-lg border border-ink/10 bg-white/60 p-4">
      <p className="text-sm text-ink-soft">{text}</p>
      {/* A plain link: the browser downloads the file; the router must not try to render it. */}
      <a href={href} download className="inline-flex min-h-12 items-center justify-center rounded-md bg-moss px-4 py-2 text-center leading-snug font-semibold text-paper no-underline hover:bg-moss-deep">
        {action}
      </a>
    </div>
  );
}

function Choice({ label, name, value, onChange, options }: { label: string; name: string; value: string; onChange: (value: string) => void; options: [string, string][] }) {
  return (
    <label className="block min-w-0 text-sm">
      <span className="block font-semibold">{label}</span>
      <select name={name} value={value} onChange={(event) => onChange(event.target.value)} className="min-h-11 w-full min-w-0 rounded-md border border-ink/30 bg-white px-2 text-base">
        <option value="">Any</option>
        {options.map(([v, text]) => (
          <option key={v} value={v}>
            {text}
          </option>
        ))}
      </select>
    </label>
  );
}
