import { data, Link } from "react-router";
import type { Route } from "./+types/print";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { loadList, PlantingListNotFound } from "~/planting/lists.server";
import { PlantingPrintSheet } from "~/components/planting/PrintSheet";

export const meta: Route.MetaFunction = ({ loaderData }) => [{ title: `${loaderData?.list.name ?? "Planting list"} (print) · Visitwort` }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["planner"] });
  try {
    return { list: await loadList(context.get(entityManagerContext), user, params.listId, { alternatives: false }) };
  } catch (error) {
    if (error instanceof PlantingListNotFound) throw data(error.message, { status: 404 });
    throw error;
  }
}

export default function PrintPlantingList({ loaderData }: Route.ComponentProps) {
  const { list } = loaderData;
  return (
    <PlantingPrintSheet
      name={list.name}
      asOf={list.updatedAt}
      plan={list.plan}
      back={
        <Link to={`/planting/lists/${list.id}`} className="inline-flex min-h-11 items-center rounded-md border border-ink/30 bg-white/70 px-4 font-medium text-ink no-underline hover:bg-white">
          Back to the list
        </Link>
      }
    />
  );
}
