import { data, Link } from "react-router";
import type { Route } from "./+types/taxon";
import { entityManagerContext } from "~/db/orm.server";
import { findPlantTaxon } from "~/taxa/taxa.server";
import { BloomStrip } from "~/components/BloomStrip";
import { StatusBadge } from "~/components/StatusBadge";
import { bloomsInEarlySpring, describeBloom } from "~/taxa/bloom";

export async function loader({ params, context }: Route.LoaderArgs) {
  const id = Number(params.taxonId);
  const taxon = Number.isInteger(id) && id > 0 ? await findPlantTaxon(context.get(entityManagerContext), id) : null;
  if (!taxon) throw data("There is no plant with this number on the checklist.", { status: 404 });
  return { taxon };
}

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `${data.taxon.scientificName} · Visitwort` : "Plant not found · Visitwort" },
];

export default function Taxon({ loaderData }: Route.ComponentProps) {
  const { taxon } = loaderData;
  return (
    <article className="space-y-6">
      <p className="text-sm">
        <Link to="/checklist">← Plant checklist</Link>
      </p>
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
