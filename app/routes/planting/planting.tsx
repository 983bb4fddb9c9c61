import { z } from "zod";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/planting";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { listName, listSavedLists, PlantingListRefused, saveList } from "~/planting/lists.server";
import { draftPlan } from "~/planting/plan.server";
import { parseSwaps, planningValues, planSearch } from "~/planting/plan";
import { describeSettings } from "~/planting/plan-words";
import { DEFAULT_MIN_PER_MONTH, MAX_LIST_SIZE, MAX_MIN_PER_MONTH, recommendationInput } from "~/planting/recommend";
import { BAND_LABELS, BANDS } from "~/forage/seasons";
import { GROWTH_FORMS } from "~/taxa/checklist-schema";
import { Field, FormMessage, PrimaryButton } from "~/components/forms";
import { PlantingCautions } from "~/components/PlantingCautions";
import { BloomChart, SpeciesList, SwapPanel, UnmetMonths } from "~/components/planting/PlanParts";

export const meta: Route.MetaFunction = () => [{ title: "Planting list · Visitwort" }];

type FieldErrors = Record<string, string[] | undefined>;

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["planner"] });
  const em = context.get(entityManagerContext);
  const url = new URL(request.url);
  const values = planningValues(url.searchParams);
  const savedLists = await listSavedLists(em, user);
  const deleted = url.searchParams.has("deleted");
  // No band yet: the planner has not asked for a list; show the form.
  if (!url.searchParams.has("band")) return { values, savedLists, deleted, fields: null, result: null };
  const parsed = recommendationInput.safeParse(values);
  if (!parsed.success) return { values, savedLists, deleted, fields: z.flattenError(parsed.error).fieldErrors as FieldErrors, result: null };
  const draft = await draftPlan(em, parsed.data, parseSwaps(url.searchParams.getAll("swap")));
  return {
    values,
    savedLists,
    deleted,
    fields: null,
    result: { plan: draft.view, swaps: draft.swaps, swapProblems: draft.swapProblems },
  };
}

type ActionResult = { error: string; fields?: FieldErrors };

/** intent=save: the settings and swaps of the page, recomputed here, saved under a name. */
export async function action({ request, context }: Route.ActionArgs) {
  const user = requireUser(request, context, { roles: ["planner"] });
  const form = await request.formData();
  if (form.get("intent") !== "save") return data<ActionResult>({ error: "That action is not one this page knows." }, { status: 400 });
  const options = recommendationInput.safeParse(planningValues(form));
  const name = listName.safeParse(form.get("name") ?? "");
  if (!options.success || !name.success) {
    const fields: FieldErrors = {
      ...(options.success ? {} : (z.flattenError(options.error).fieldErrors as FieldErrors)),
      ...(name.success ? {} : { name: name.error.issues.map((i) => i.message) }),
    };
    const error = options.success ? "Give the list a name to save it." : "The list’s settings were not understood; show the list again from the form, then save.";
    return data<ActionResult>({ error, fields }, { status: 400 });
  }
  const em = context.get(entityManagerContext);
  const draft = await draftPlan(em, options.data, parseSwaps(form.getAll("swap").map(String)));
  try {
    const { id } = await saveList(em, user, { name: name.data, options: options.data, items: draft.items });
    return redirect(`/planting/lists/${id}?saved=1`);
  } catch (error) {
    if (error instanceof PlantingListRefused) return data<ActionResult>({ error: error.message, fields: error.fields }, { status: error.status });
    throw error;
  }
}

const MONTH_HINT = "First and last month as numbers: 4-9 is April to September, when colonies are active in most of the region.";

export default function Planting({ loaderData, actionData }: Route.ComponentProps) {
  const { values, savedLists, fields, result, deleted } = loaderData;
  const saving = useNavigation().formMethod === "POST";
  const plan = result?.plan ?? null;
  const search = plan ? planSearch(plan.settings, result!.swaps) : "";
  const formValue = (name: keyof typeof values) => (typeof values[name] === "string" ? (values[name] as string) : "");
  const chosenForms = Array.isArray(values.forms) ? (values.forms as string[]) : [];

  return (
    <div className="space-y-6">
      <header className="space-y-1">
        <h1 className="text-3xl">Planting list</h1>
        <p className="max-w-prose text-ink-soft">
          Native plants chosen so that bumble bees find enough in flower in every month of the season, spring queens first, with the programme’s own forage records
          behind each choice.
        </p>
      </header>

      {deleted && <FormMessage tone="info">The list was deleted.</FormMessage>}

      <details open={!plan} className="rounded-lg border border-ink/15 bg-white/60" data-testid="planting-settings">
        <summary className="min-h-11 cursor-pointer px-4 py-3">
          <span className="font-semibold">{plan ? "Change the settings" : "Settings"}</span>
        </summary>
        <Form method="get" className="space-y-5 border-t border-ink/10 p-4" data-testid="planting-form">
          {fields && <FormMessage tone="error">Some settings were not understood; see the notes under them.</FormMessage>}
          <fieldset className="space-y-2">
            <legend className="font-semibold">Band</legend>
            <p className="text-sm text-ink-soft">Where the planting is: the bands have their own spring, so their lists differ.</p>
            <div className="flex flex-wrap gap-2">
              {BANDS.map((band) => (
                <label key={band} className="flex min-h-11 items-center gap-2 rounded-md border border-ink/25 bg-white px-3">
                  <input type="radio" name="band" value={band} defaultChecked={formValue("band") === band || (!formValue("band") && band === "north")} className="h-5 w-5 accent-moss" />
                  {BAND_LABELS[band]}
                </label>
              ))}
            </div>
            {fields?.band && <p className="text-sm font-medium text-clay">{fields.band.join(" ")}</p>}
          </fieldset>
          <div className="grid gap-5 sm:grid-cols-3">
            <Field label="Season months" name="months" defaultValue={formValue("months") || "4-9"} inputMode="numeric" hint={MONTH_HINT} errors={fields?.months} />
            <Field
              label="Species in flower each month"
              name="minPerMonth"
              type="number"
              min={1}
              max={MAX_MIN_PER_MONTH}
              defaultValue={formValue("minPerMonth") || String(DEFAULT_MIN_PER_MONTH)}
              hint="The fewest listed species that should flower in every month. 3 follows the USDA NRCS pollinator-habitat advice of three per bloom period."
              errors={fields?.minPerMonth}
            />
            <Field
              label="Most species in the list (optional)"
              name="size"
              type="number"
              min={1}
              max={MAX_LIST_SIZE}
              defaultValue={formValue("size")}
              hint="Leave empty and the list is as long as coverage needs. With a limit, spring months are filled first."
              errors={fields?.size}
            />
          </div>
          <fieldset className="space-y-2">
            <legend className="font-semibold">Growth forms</legend>
            <p className="text-sm text-ink-soft">Tick the kinds of plant the site can take; none ticked means every kind.</p>
            <div className="flex flex-wrap gap-2">
              {GROWTH_FORMS.map((form) => (
                <label key={form} className="flex min-h-11 items-center gap-2 rounded-md border border-ink/25 bg-white px-3">
                  <input type="checkbox" name="forms" value={form} defaultChecked={chosenForms.includes(form)} className="h-5 w-5 accent-moss" />
                  {form}
                </label>
              ))}
            </div>
            {fields?.forms && <p className="text-sm font-medium text-clay">{fields.forms.join(" ")}</p>}
          </fieldset>
          <fieldset className="space-y-2">
            <legend className="font-semibold">Native or introduced</legend>
            <p className="text-sm text-ink-soft">Invasive species are never listed, whatever you choose.</p>
            <div className="flex flex-wrap gap-2">
              {[
                ["true", "Native species only"],
                ["false", "Native and introduced species"],
              ].map(([value, label]) => (
                <label key={value} className="flex min-h-11 items-center gap-2 rounded-md border border-ink/25 bg-white px-3">
                  <input type="radio" name="nativeOnly" value={value} defaultChecked={(formValue("nativeOnly") || "true") === value} className="h-5 w-5 accent-moss" />
                  {label}
                </label>
              ))}
            </div>
            {fields?.nativeOnly && <p className="text-sm font-medium text-clay">{fields.nativeOnly.join(" ")}</p>}
          </fieldset>
          <PrimaryButton>Show the list</PrimaryButton>
        </Form>
      </details>

      {plan && result && (
        <section aria-labelledby="plan-heading" className="space-y-4" data-testid="plan">
          <div>
            <h2 id="plan-heading" className="text-2xl">
              {plan.species.length === 0 ? "No species fit these settings" : `${plan.species.length} species`}
            </h2>
            <p className="text-sm text-ink-soft">{describeSettings(plan.settings)}</p>
          </div>
          {result.swapProblems.length > 0 && (
            <FormMessage tone="info">
              {result.swapProblems.length === 1 ? "One swap in this address was not made: " : "Some swaps in this address were not made: "}
              {result.swapProblems.join(" ")}
            </FormMessage>
          )}
          {result.swaps.length > 0 && (
            <p className="text-sm">
              {result.swaps.length === 1 ? "One species swapped." : `${result.swaps.length} species swapped.`}{" "}
              <Link to={`?${planSearch(plan.settings)}`} preventScrollReset>
                Back to the recommendation as it was
              </Link>
            </p>
          )}
          {plan.species.length > 0 && <BloomChart plan={plan} />}
          <UnmetMonths plan={plan} />
          <SpeciesList
            plan={plan}
            swap={(species) => (
              <SwapPanel
                species={species}
                minPerMonth={plan.settings.minPerMonth}
                use={(alternative) => (
                  <Link
                    to={`?${planSearch(plan.settings, [...result.swaps, { from: species.id, to: alternative.id }])}`}
                    preventScrollReset
                    aria-label={`Use ${alternative.scientificName} instead of ${species.scientificName}`}
                    className="inline-flex min-h-11 items-center rounded-md border border-moss px-3 font-semibold text-moss-deep no-underline hover:bg-moss/10"
                  >
                    Use instead
                  </Link>
                )}
              />
            )}
          />

          {plan.species.length > 0 && (
            <Form method="post" className="space-y-3 rounded-lg border border-moss/40 bg-moss/5 p-4" data-testid="save-form">
              <h2 className="text-xl">Save this list</h2>
              <p className="text-sm text-ink-soft">Saved lists keep their species and settings; other planners of the programme can open them, and you can share a read-only link.</p>
              {actionData?.error && <FormMessage tone="error">{actionData.error}</FormMessage>}
              <input type="hidden" name="intent" value="save" />
              {[...new URLSearchParams(search)].map(([name, value], index) => (
                <input key={`${name}-${index}`} type="hidden" name={name} value={value} />
              ))}
              <Field label="Name" name="name" required maxLength={200} autoComplete="off" placeholder="e.g. School meadow, spring 2027" errors={actionData?.fields?.name} />
              <PrimaryButton disabled={saving}>{saving ? "Saving…" : "Save as a named list"}</PrimaryButton>
            </Form>
          )}
        </section>
      )}

      <PlantingCautions />

      <section aria-labelledby="saved-heading" className="space-y-2">
        <h2 id="saved-heading" className="text-xl">
          Saved lists
        </h2>
        {savedLists.length === 0 ? (
          <p className="text-sm text-ink-soft">No planting list has been saved yet.</p>
        ) : (
          <ul className="divide-y divide-ink/10 rounded-lg border border-ink/10 bg-white/60" data-testid="saved-lists">
            {savedLists.map((list) => (
              <li key={list.id} className="flex flex-wrap items-baseline justify-between gap-x-3 px-3 py-2.5">
                <Link to={`/planting/lists/${list.id}`} className="font-medium">
                  {list.name}
                </Link>
                <span className="text-sm text-ink-soft">
                  {list.species} species · {list.band} band · {list.mine ? "yours" : list.ownerName}
                  {list.shared && " · shared"} · changed {list.updatedAt.slice(0, 10)}
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
