import { data } from "react-router";
import type { Route } from "./+types/shared";
import { entityManagerContext } from "~/db/orm.server";
import { findSharedList, PlantingListNotFound } from "~/planting/lists.server";
import { describeSettings } from "~/planting/plan-words";
import { PlantingCautions } from "~/components/PlantingCautions";
import { BloomChart, SpeciesList, UnmetMonths } from "~/components/planting/PlanParts";

// Whoever holds the link may read; search engines should not index a private link.
export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: `${loaderData?.list.name ?? "Planting list"} · Visitwort` },
  { name: "robots", content: "noindex, nofollow" },
];

/** GET /planting/shared/:token — the read-only copy of a shared list; no account needed, 404 for an unknown or revoked link. */
export async function loader({ params, context }: Route.LoaderArgs) {
  try {
    return { list: await findSharedList(context.get(entityManagerContext), params.token) };
  } catch (error) {
    if (error instanceof PlantingListNotFound) throw data("This share link does not open a planting list: it may have been mistyped or withdrawn.", { status: 404 });
    throw error;
  }
}

export function headers() {
  // The link is the key: keep shared copies out of shared caches.
  return { "Cache-Control": "private, no-store" };
}

export default function SharedPlantingList({ loaderData }: Route.ComponentProps) {
  const { list } = loaderData;
  return (
    <div className="space-y-5" data-testid="shared-list">
      <header className="space-y-1">
        <p className="text-sm font-semibold uppercase tracking-wide text-ink-soft">Shared planting list · read only</p>
        <h1 className="text-3xl break-words">{list.name}</h1>
        <p className="text-sm text-ink-soft">
          As of {list.updatedAt.slice(0, 10)} · {describeSettings(list.plan.settings)}
        </p>
        <p className="max-w-prose text-sm">
          Native plants chosen so that bumble bees find enough in flower in every month of the season, with spring queens first. The evidence comes from the
          monitoring programme’s own records of bees on flowers.
        </p>
      </header>
      <PlantingCautions />
      <BloomChart plan={list.plan} />
      <UnmetMonths plan={list.plan} />
      <SpeciesList plan={list.plan} />
    </div>
  );
}
