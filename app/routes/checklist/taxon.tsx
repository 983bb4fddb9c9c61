import { data, Link, useRouteLoaderData, useSearchParams } from "react-router";
import type { Route } from "./+types/taxon";
import type { loader as rootLoader } from "~/root";
import { hasAnyRole } from "~/auth/roles";
import { FormMessage } from "~/components/forms";
import { entityManagerContext } from "~/db/orm.server";
import { findPlantTaxon } from "~/taxa/taxa.server";
import { summariseTaxonVisits } from "~/taxa/taxon-visits.server";
import { MonthBars } from "~/components/MonthBars";
import { BloomStrip } from "~/components/BloomStrip";
import { StatusBadge } from "~/components/StatusBadge";
import { bloomsInEarlySpring, describeBloom } from "~/taxa/bloom";

export async function loader({ params, context }: Route.LoaderArgs) {
  const id = Number(params.taxonId);
  const taxon = Number.isInteger(id) && id > 0 ? await findPlantTaxon(context.get(entityManagerContext), id) : null;
  if (!taxon) throw data("There is no plant with this number on the checklist.", { status: 404 });
  const evidence = await summariseTaxonVisits(context.get(entityManagerContext), taxon.id);
  return { taxon, evidence };
}

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `${data.taxon.scientificName} · Visitwort` : "Plant not found · Visitwort" },
];

/** The confirmation a stewardship page redirected here with (added, saved, merged). */
function StewardshipNotice() {
  const [params] = useSearchParams();
  const merged = params.get("merged");
  if (merged) {
    const visits = Number(params.get("visits") ?? 0);
    const determinations = Number(params.get("determinations") ?? 0);
    return (
      <FormMessage tone="success">
        <i>{merged}</i> was merged into this taxon and deleted: {visits} {visits === 1 ? "visit" : "visits"} and {determinations}{" "}
        {determinations === 1 ? "determination" : "determinations"} moved here, and its names are now synonyms.
      </FormMessage>
    );
  }
  if (params.has("added")) return <FormMessage tone="success">Added to the checklist.</FormMessage>;
  if (params.has("saved")) return <FormMessage tone="success">Saved.</FormMessage>;
  return null;
}

export default function Taxon({ loaderData }: Route.ComponentProps) {
  const { taxon, evidence } = loaderData;
  const roles = useRouteLoaderData<typeof rootLoader>("root")?.user?.roles;
  const steward = roles ? hasAnyRole(roles, ["botanist"]) : false;
  return (
    <article className="space-y-6">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="text-sm">
          <Link to="/checklist">← Plant checklist</Link>
        </p>
        {steward && (
          <nav aria-label="Checklist stewardship" className="flex gap-2">
            <Link to={`/checklist/${taxon.id}/edit`} className="inline-flex min-h-11 items-center rounded-md border border-moss px-4 font-semibold text-moss-deep no-underline hover:bg-moss/10">
              Edit
            </Link>
            <Link to={`/checklist/${taxon.id}/edit#merge`} className="inline-flex min-h-11 items-center rounded-md border border-heather px-4 font-semibold text-heather no-underline hover:bg-heather/10">
              Merge
            </Link>
          </nav>
        )}
      </div>
      <StewardshipNotice />
      <header className="space-y-2">
        <h1 className="text-3xl sm:text-4xl">
          <i>{taxon.scientificName}</i>{" "}
          <span className="font-sans text-lg font-normal text-ink-soft">{taxon.scientificNameAuthorship}</span>
        </h1>
        <p className="text-lg">{taxon.vernacularNames.join(" · ")}</p>
        <div className="flex flex-wrap items-center gap-3">
          <StatusBadge status={taxon.regionalStatus} />
          <span className="text-ink-soft">
            {taxon.family} · {taxon.growthForm}
          </span>
        </div>
      </header>

      {taxon.regionalStatus === "invasive" && (
        <aside className="rounded-lg border-l-4 border-clay bg-clay/10 p-4" role="note">
          <h2 className="font-sans text-base font-bold">Invasive in the region — do not plant</h2>
          <p>
            Bees may visit it, but it spreads into natural areas. Visitwort never recommends it. Check your state’s or
            province’s noxious-weed and invasive-plant rules, and ask a qualified practitioner before removing it;
            herbicide use follows the label and local law.
          </p>
        </aside>
      )}

      <section className="space-y-2">
        <h2 className="text-xl">Bloom</h2>
        <BloomStrip start={taxon.bloomStart} end={taxon.bloomEnd} size="lg" />
        <p>
          {describeBloom(taxon.bloomStart, taxon.bloomEnd)} in the region.
          {bloomsInEarlySpring(taxon.bloomStart, taxon.bloomEnd)
            ? " It flowers in early spring, when queens emerge and need forage most."
            : ""}
        </p>
      </section>

      <section className="space-y-2" aria-labelledby="records-heading">
        <h2 id="records-heading" className="text-xl">What the records say</h2>
        {evidence.visits === 0 ? (
          <p className="text-ink-soft">No visits to this plant recorded yet.</p>
        ) : (
          <>
            <p>
              {evidence.visits} {evidence.visits === 1 ? "visit" : "visits"} recorded, {evidence.byMonth.reduce((sum, m) => sum + m.verified, 0)} verified by a
              botanist; {evidence.determinations} {evidence.determinations === 1 ? "determination" : "determinations"} name it.
            </p>
            <MonthBars months={evidence.byMonth} />
            <p className="text-sm text-ink-soft">Bars: visits by month; filled = the plant was verified, outlined = not yet.</p>
            {evidence.bees.length > 0 && (
              <div>
                <h3 className="font-sans text-base font-semibold">Bees seen on it (verified visits)</h3>
                <ul className="flex flex-wrap gap-x-4 gap-y-1">
                  {evidence.bees.map((bee) => (
                    <li key={bee.scientificName}>
                      <i>{bee.scientificName}</i> <span className="tabular-nums text-ink-soft">{bee.visits}</span>
                    </li>
                  ))}
                </ul>
              </div>
            )}
          </>
        )}
      </section>

      <section>
        <h2 className="mb-2 text-xl">Names and classification</h2>
        <dl className="grid grid-cols-[max-content_1fr] gap-x-6 gap-y-2">
          <dt className="font-semibold">Family</dt>
          <dd>{taxon.family}</dd>
          <dt className="font-semibold">Genus</dt>
          <dd>
            <i>{taxon.genus}</i>
          </dd>
          <dt className="font-semibold">Rank</dt>
          <dd>{taxon.taxonRank}</dd>
          <dt className="font-semibold">Common names</dt>
          <dd>{taxon.vernacularNames.join(", ")}</dd>
          <dt className="font-semibold">Synonyms</dt>
          <dd>{taxon.synonyms.length ? taxon.synonyms.map((s, i) => <span key={s}>{i > 0 && ", "}<i>{s}</i></span>) : "none listed"}</dd>
          <dt className="font-semibold">Growth form</dt>
          <dd>{taxon.growthForm}</dd>
          <dt className="font-semibold">Source</dt>
          <dd className="text-ink-soft">{taxon.sourceNote}</dd>
        </dl>
      </section>
    </article>
  );
}
