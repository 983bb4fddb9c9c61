import { useState } from "react";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/edit";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { findPlantTaxon } from "~/taxa/taxa.server";
import { countTaxonUse, mergePlantTaxa, StewardshipRefused, updatePlantTaxon } from "~/taxa/stewardship.server";
import type { PlantTaxonRecord } from "~/taxa/taxon-record";
import { PlantPicker } from "~/components/PlantPicker";
import { FormMessage, SecondaryButton } from "~/components/forms";
import { readTaxonForm, TaxonForm, taxonFieldErrors, taxonFormValues, type TaxonFieldErrors, type TaxonFormValues } from "./TaxonForm";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Edit ${data.taxon.scientificName} · Visitwort` : "Plant not found · Visitwort" },
];

function taxonIdOf(params: { taxonId?: string }): number {
  const id = Number(params.taxonId);
  if (!Number.isInteger(id) || id <= 0) throw data("There is no plant with this number on the checklist.", { status: 404 });
  return id;
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  requireUser(request, context, { roles: ["botanist"] });
  const em = context.get(entityManagerContext);
  const id = taxonIdOf(params);
  const taxon = await findPlantTaxon(em, id);
  if (!taxon) throw data("There is no plant with this number on the checklist.", { status: 404 });
  return { taxon, use: await countTaxonUse(em, id) };
}

type ActionResult = { intent: string; error?: string; fields?: TaxonFieldErrors; values?: TaxonFormValues };

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = requireUser(request, context, { roles: ["botanist"] });
  const em = context.get(entityManagerContext);
  const id = taxonIdOf(params);
  const form = await request.formData();
  const intent = String(form.get("intent"));
  const refuse = (result: ActionResult) => data(result, { status: 400 });
  try {
    if (intent === "save") {
      const { values, input } = readTaxonForm(form);
      try {
        await updatePlantTaxon(em, id, input);
      } catch (error) {
        if (error instanceof StewardshipRefused && error.status === 400) {
          return refuse({ intent, error: `${error.message} Nothing was saved.`, fields: taxonFieldErrors(values, error.fields), values });
        }
        throw error;
      }
      return redirect(`/checklist/${id}?saved=1`);
    }
    if (intent === "merge") {
      const keepId = Number(form.get("keepId"));
      const fields: TaxonFieldErrors = {};
      if (!Number.isInteger(keepId) || keepId <= 0) fields.keepId = ["Choose the taxon to keep."];
      if (form.get("confirm") !== "yes") fields.confirm = ["Tick the box to confirm the merge."];
      if (Object.keys(fields).length) return refuse({ intent, error: "Nothing was merged.", fields });
      const merged = await mergePlantTaxa(em, { duplicateId: id, keepId, actingUserId: user.id });
      const message = new URLSearchParams({
        merged: merged.mergedScientificName,
        visits: String(merged.visitsMoved),
        determinations: String(merged.determinationsMoved),
      });
      return redirect(`/checklist/${merged.keptId}?${message}`);
    }
    return refuse({ intent, error: "Unknown action." });
  } catch (error) {
    if (error instanceof StewardshipRefused) {
      if (error.status !== 400) throw data(error.message, { status: error.status });
      return refuse({ intent, error: error.message, fields: error.fields });
    }
    throw error;
  }
}

export default function EditTaxon({ loaderData, actionData }: Route.ComponentProps) {
  const { taxon, use } = loaderData;
  const result = actionData as ActionResult | undefined;
  const busy = useNavigation().state === "submitting";
  const saveResult = result?.intent === "save" ? result : undefined;
  const mergeResult = result?.intent === "merge" ? result : undefined;
  return (
    <div className="max-w-2xl space-y-8">
      <p className="text-sm">
        <Link to={`/checklist/${taxon.id}`}>
          ← <i>{taxon.scientificName}</i>
        </Link>
      </p>
      <header className="space-y-1">
        <h1 className="text-3xl">
          Edit <i>{taxon.scientificName}</i>
        </h1>
        <p className="text-ink-soft">
          Visits and determinations keep pointing at this taxon whatever its names become.
        </p>
      </header>
      <TaxonForm
        values={saveResult?.values ?? taxonFormValues(taxon)}
        errors={saveResult?.fields}
        message={saveResult?.error}
        submitLabel="Save the changes"
        busy={busy}
      />
      <MergeSection taxon={taxon} use={use} result={mergeResult} busy={busy} />
    </div>
  );
}

function MergeSection({ taxon, use, result, busy }: {
  taxon: PlantTaxonRecord;
  use: { visits: number; determinations: number };
  result?: ActionResult;
  busy: boolean;
}) {
  const [keep, setKeep] = useState<PlantTaxonRecord | null>(null);
  const keepError = keep?.id === taxon.id ? ["Choose a different taxon: this is the one being merged."] : result?.fields?.keepId;
  return (
    <section id="merge" aria-labelledby="merge-heading" className="space-y-3 rounded-lg border border-heather/40 bg-heather/5 p-4">
      <h2 id="merge-heading" className="text-xl">
        Merge into another taxon
      </h2>
      <p className="text-[0.95rem]">
        When the same plant is on the checklist twice, keep one. Everything recorded against <i>{taxon.scientificName}</i>{" "}
        ({use.visits} {use.visits === 1 ? "visit" : "visits"}, {use.determinations}{" "}
        {use.determinations === 1 ? "determination" : "determinations"}) moves to the taxon you keep;{" "}
        <i>{taxon.scientificName}</i> and its synonyms become synonyms there, its common names are added, and it is deleted.
        This cannot be undone.
      </p>
      {result?.error && (
        <FormMessage tone="error">
          <p>{result.error}</p>
        </FormMessage>
      )}
      <Form method="post" className="space-y-4">
        <input type="hidden" name="intent" value="merge" />
        <PlantPicker name="keepId" label="Taxon to keep" value={keep} onChange={setKeep} errors={keepError} />
        <div className="space-y-1">
          <label className="flex min-h-11 cursor-pointer items-start gap-3 py-2">
            <input
              type="checkbox"
              name="confirm"
              value="yes"
              aria-invalid={result?.fields?.confirm ? true : undefined}
              aria-describedby={result?.fields?.confirm ? "merge-confirm-error" : undefined}
              className="mt-0.5 h-6 w-6 shrink-0 accent-moss"
            />
            <span>
              Merge <i>{taxon.scientificName}</i> into {keep ? <i>{keep.scientificName}</i> : "the taxon chosen above"} and
              delete it.
            </span>
          </label>
          {result?.fields?.confirm && (
            <p id="merge-confirm-error" className="text-sm font-medium text-clay" role="alert">
              {result.fields.confirm.join(" ")}
            </p>
          )}
        </div>
        <SecondaryButton disabled={busy || keep?.id === taxon.id}>Merge and delete this taxon</SecondaryButton>
      </Form>
    </section>
  );
}
