import { data, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/new";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { createPlantTaxon, StewardshipRefused } from "~/taxa/stewardship.server";
import { EMPTY_TAXON_FORM, readTaxonForm, TaxonForm, taxonFieldErrors, type TaxonFieldErrors, type TaxonFormValues } from "./TaxonForm";

export const meta: Route.MetaFunction = () => [{ title: "Add a plant taxon · Visitwort" }];

export function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context, { roles: ["botanist"] });
  return null;
}

type ActionResult = { error?: string; fields?: TaxonFieldErrors; values: TaxonFormValues };

export async function action({ request, context }: Route.ActionArgs) {
  requireUser(request, context, { roles: ["botanist"] });
  const { values, input } = readTaxonForm(await request.formData());
  try {
    const taxon = await createPlantTaxon(context.get(entityManagerContext), input);
    return redirect(`/checklist/${taxon.id}?added=1`);
  } catch (error) {
    if (error instanceof StewardshipRefused) {
      return data({ error: `${error.message} Nothing was saved.`, fields: taxonFieldErrors(values, error.fields), values } satisfies ActionResult, { status: 400 });
    }
    throw error;
  }
}

export default function NewTaxon({ actionData }: Route.ComponentProps) {
  const result = actionData as ActionResult | undefined;
  const busy = useNavigation().state === "submitting";
  return (
    <div className="max-w-2xl space-y-6">
      <p className="text-sm">
        <Link to="/checklist">← Plant checklist</Link>
      </p>
      <header className="space-y-1">
        <h1 className="text-3xl">Add a plant taxon</h1>
        <p className="text-ink-soft">
          For a plant that bees visit in the region and the checklist lacks. Check first that it is not already there under
          a synonym: the checklist search finds synonyms too.
        </p>
      </header>
      <TaxonForm values={result?.values ?? EMPTY_TAXON_FORM} errors={result?.fields} message={result?.error} submitLabel="Add to the checklist" busy={busy} />
    </div>
  );
}
