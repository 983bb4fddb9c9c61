import { useEffect, useRef, useState } from "react";
import { data, Link, redirect, useFetcher } from "react-router";
import type { Route } from "./+types/new";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { listSites } from "~/visits/sites.server";
import { FloralSurveyRefused, recordFloralSurvey } from "~/forage/floral-counts.server";
import { floralSurveyFormToInput, MAX_SURVEY_ROWS, type SurveyFieldErrors } from "~/forage/floral-count-schema";
import type { PlantTaxonRecord } from "~/taxa/taxon-record";
import { PlantPicker, rememberRecentPlant } from "~/components/PlantPicker";
import { FormMessage } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "Count flowers · Visitwort" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context, { roles: ["recorder", "botanist"] });
  const sites = await listSites(context.get(entityManagerContext));
  return { sites: sites.map((site) => ({ id: site.id, name: site.name })) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const user = requireUser(request, context, { roles: ["recorder", "botanist"] });
  try {
    const summary = await recordFloralSurvey(context.get(entityManagerContext), user, floralSurveyFormToInput(await request.formData()));
    const saved = new URLSearchParams({ site: String(summary.siteId), saved: summary.surveyDate, new: String(summary.created), replaced: String(summary.updated) });
    return redirect(`/floral-counts?${saved}`);
  } catch (error) {
    if (error instanceof FloralSurveyRefused) return data({ fields: error.fields }, { status: error.status });
    throw error;
  }
}

interface Row {
  key: number;
  plant: PlantTaxonRecord | null;
  units: string;
}

/** Today in this browser's time zone, as the date input wants it. */
function todayLocal(): string {
  const now = new Date();
  now.setMinutes(now.getMinutes() - now.getTimezoneOffset());
  return now.toISOString().slice(0, 10);
}

/** Drops the messages of a removed row and moves those of the rows below it up by one. */
function withoutRowErrors(errors: SurveyFieldErrors, removed: number): SurveyFieldErrors {
  const next: SurveyFieldErrors = {};
  for (const [key, messages] of Object.entries(errors)) {
    const match = /^rows\.(\d+)\.(.+)$/.exec(key);
    if (!match) next[key] = messages;
    else if (Number(match[1]) < removed) next[key] = messages;
    else if (Number(match[1]) > removed) next[`rows.${Number(match[1]) - 1}.${match[2]}`] = messages;
  }
  return next;
}

function Problem({ id, messages }: { id?: string; messages?: string[] }) {
  return messages?.length ? (
    <p id={id} role="alert" className="text-sm font-medium text-clay">
      {messages.join(" ")}
    </p>
  ) : null;
}

export default function NewFloralSurvey({ loaderData }: Route.ComponentProps) {
  const fetcher = useFetcher<typeof action>();
  const [errors, setErrors] = useState<SurveyFieldErrors>({});
  const [siteId, setSiteId] = useState("");
  const [surveyDate, setSurveyDate] = useState("");
  const [today, setToday] = useState<string | undefined>(undefined);
  const [rows, setRows] = useState<Row[]>([{ key: 1, plant: null, units: "" }]);
  const [remarks, setRemarks] = useState("");
  const nextKey = useRef(2);
  const [focusRow, setFocusRow] = useState<number | null>(null);
  const rowElements = useRef(new Map<number, HTMLLIElement>());

  // The server does not know the recorder's time zone; the browser says what today is.
  useEffect(() => {
    const now = todayLocal();
    setToday(now);
    setSurveyDate((typed) => typed || now);
  }, []);

  useEffect(() => {
    const result = fetcher.data as { fields?: SurveyFieldErrors } | undefined;
    if (result?.fields) setErrors(result.fields);
  }, [fetcher.data]);

  // A new row's plant field gets the focus, so the phone keyboard is ready for the name.
  useEffect(() => {
    if (focusRow === null) return;
    rowElements.current.get(focusRow)?.querySelector<HTMLInputElement>("input[role=combobox]")?.focus();
    setFocusRow(null);
  }, [focusRow]);

  const busy = fetcher.state !== "idle";
  const update = (key: number, change: Partial<Row>) => setRows((current) => current.map((row) => (row.key === key ? { ...row, ...change } : row)));

  function addRow() {
    const key = nextKey.current++;
    setRows((current) => [...current, { key, plant: null, units: "" }]);
    setFocusRow(key);
  }

  function removeRow(index: number) {
    setRows((current) => current.filter((_, i) => i !== index));
    setErrors((current) => withoutRowErrors(current, index));
  }

  function submit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData();
    form.set("siteId", siteId);
    form.set("surveyDate", surveyDate);
    form.set("remarks", remarks);
    for (const row of rows) {
      form.append("plantTaxonId", row.plant ? String(row.plant.id) : "");
      form.append("floweringUnits", row.units);
      if (row.plant) rememberRecentPlant(row.plant.id);
    }
    fetcher.submit(form, { method: "post" });
  }

  const problemCount = Object.values(errors).filter((messages) => messages?.length).length;
  const typedUnits = rows.map((row) => row.units.trim()).filter((units) => /^\d+$/.test(units));
  const totalUnits = typedUnits.reduce((sum, units) => sum + Number(units), 0);
  const chosenPlants = rows.filter((row) => row.plant).length;

  return (
    <div className="mx-auto max-w-xl pb-28 sm:pb-0">
      <p className="mb-2 text-sm">
        <Link to="/floral-counts">← Flower counts</Link>
      </p>
      <h1 className="mb-1 text-3xl">Count flowers</h1>
      <p className="mb-4 text-ink-soft">
        Count what is in flower at the site, plant by plant. Set beside the visits, the counts show which flowers bees seek out
        and which they pass by.
      </p>


      {problemCount > 0 && (
        <div className="mb-4">
          <FormMessage tone="error">
            Nothing was saved. Check the {problemCount === 1 ? "marked field" : `${problemCount} marked fields`} below; everything
            you typed is still there.
          </FormMessage>
        </div>
      )}

      <fetcher.Form method="post" onSubmit={submit} className="space-y-7" noValidate>
        <section className="space-y-4" aria-labelledby="where-heading">
          <h2 id="where-heading" className="text-xl">Where and when</h2>
          <div className="space-y-1">
            <label htmlFor="siteId" className="block font-semibold">Site</label>
            <select
              id="siteId"
              name="siteId"
              value={siteId}
              onChange={(e) => setSiteId(e.target.value)}
              aria-invalid={errors.siteId?.length ? true : undefined}
              aria-describedby={errors.siteId?.length ? "siteId-error" : undefined}
              className={`min-h-12 w-full rounded-md border bg-white px-3 text-base ${errors.siteId?.length ? "border-clay" : "border-ink/30"}`}
            >
              <option value="">Choose a site</option>
              {loaderData.sites.map((site) => (
                <option key={site.id} value={site.id}>{site.name}</option>
              ))}
            </select>
            <Problem id="siteId-error" messages={errors.siteId} />
          </div>
          <div className="space-y-1">
            <label htmlFor="surveyDate" className="block font-semibold">Date of the count</label>
            <input
              id="surveyDate"
              name="surveyDate"
              type="date"
              value={surveyDate}
              max={today}
              onChange={(e) => setSurveyDate(e.target.value)}
              aria-invalid={errors.surveyDate?.length ? true : undefined}
              aria-describedby={errors.surveyDate?.length ? "surveyDate-error" : "surveyDate-hint"}
              className={`min-h-12 w-full rounded-md border bg-white px-3 text-base ${errors.surveyDate?.length ? "border-clay" : "border-ink/30"}`}
            />
            {errors.surveyDate?.length ? (
              <Problem id="surveyDate-error" messages={errors.surveyDate} />
            ) : (
              <p id="surveyDate-hint" className="text-sm text-ink-soft">
                Counted here on this day already? Saving again replaces the number for each plant you list; plants you leave out
                keep their earlier count.
              </p>
            )}
          </div>
        </section>

        <section className="space-y-3" aria-labelledby="plants-heading">
          <h2 id="plants-heading" className="text-xl">Plants in flower</h2>
          {/* The definition of a flowering unit follows common field practice (no single source). */}
          <aside className="rounded-md border-l-4 border-sky bg-sky/10 p-3 text-[0.95rem]" aria-labelledby="unit-heading">
            <h3 id="unit-heading" className="mb-1 font-sans text-base font-semibold">What is a flowering unit?</h3>
            <p>
              One open flower — or, where small flowers grow packed together, one head, umbel or spike counted as one: a dandelion
              head, a golden-alexanders umbel, a willow catkin. Count the same way each time you come back.
            </p>
          </aside>
          <ol className="space-y-3">
            {rows.map((row, index) => {
              const unitsId = `units-${row.key}`;
              const unitErrors = errors[`rows.${index}.floweringUnits`];
              return (
                <li
                  key={row.key}
                  ref={(element) => {
                    if (element) rowElements.current.set(row.key, element);
                    else rowElements.current.delete(row.key);
                  }}
                  className="space-y-3 rounded-lg border border-ink/15 bg-white/60 p-3"
                  data-testid="count-row"
                >
                  <PlantPicker
                    name="plantTaxonId"
                    label={`Plant ${index + 1}`}
                    value={row.plant}
                    onChange={(plant) => update(row.key, { plant })}
                    errors={errors[`rows.${index}.plantTaxonId`]}
                  />
                  <div className="flex items-start gap-2">
                    <div className="min-w-0 flex-1 space-y-1">
                      <label htmlFor={unitsId} className="block font-semibold">
                        Flowering units<span className="sr-only"> of plant {index + 1}</span>
                      </label>
                      <input
                        id={unitsId}
                        name="floweringUnits"
                        inputMode="numeric"
                        autoComplete="off"
                        value={row.units}
                        onChange={(e) => update(row.key, { units: e.target.value })}
                        placeholder="e.g. 120"
                        aria-invalid={unitErrors?.length ? true : undefined}
                        aria-describedby={unitErrors?.length ? `${unitsId}-error` : undefined}
                        className={`min-h-12 w-full rounded-md border bg-white px-3 text-base tabular-nums ${unitErrors?.length ? "border-clay" : "border-ink/30"}`}
                      />
                    </div>
                    {rows.length > 1 && (
                      <button
                        type="button"
                        onClick={() => removeRow(index)}
                        className="mt-7 min-h-12 rounded-md border border-ink/25 bg-white px-3 font-medium text-ink hover:bg-ink/5"
                      >
                        Remove<span className="sr-only"> plant {index + 1}</span>
                      </button>
                    )}
                  </div>
                  <Problem id={`${unitsId}-error`} messages={unitErrors} />
                </li>
              );
            })}
          </ol>
          <Problem messages={errors.rows} />
          <button
            type="button"
            onClick={addRow}
            disabled={rows.length >= MAX_SURVEY_ROWS}
            className="min-h-12 w-full rounded-md border border-moss bg-white px-4 font-semibold text-moss-deep hover:bg-moss/10 disabled:opacity-60"
          >
            + Add another plant
          </button>
          <p className="text-sm text-ink-soft" aria-live="polite">
            {chosenPlants} {chosenPlants === 1 ? "plant" : "plants"} chosen · {totalUnits.toLocaleString("en")} flowering units so far
          </p>
        </section>

        <section className="space-y-1">
          <label htmlFor="remarks" className="block font-semibold">Remarks</label>
          <textarea
            id="remarks"
            name="remarks"
            rows={3}
            value={remarks}
            onChange={(e) => setRemarks(e.target.value)}
            placeholder="How you counted, e.g. along the marked transect; weather; anything unusual"
            aria-invalid={errors.remarks?.length ? true : undefined}
            className={`w-full rounded-md border bg-white px-3 py-2 text-base ${errors.remarks?.length ? "border-clay" : "border-ink/30"}`}
          />
          <Problem messages={errors.remarks} />
        </section>

        <div className="fixed inset-x-0 bottom-0 z-10 border-t border-ink/10 bg-paper/95 p-3 backdrop-blur sm:static sm:border-0 sm:bg-transparent sm:p-0">
          <div className="mx-auto max-w-xl">
            <button type="submit" disabled={busy} className="min-h-14 w-full rounded-md bg-moss px-5 text-lg font-semibold text-paper hover:bg-moss-deep disabled:opacity-60">
              {busy ? "Saving…" : "Save the count"}
            </button>
          </div>
        </div>
      </fetcher.Form>
    </div>
  );
}
