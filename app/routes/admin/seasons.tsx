import { Fragment, useEffect, useState } from "react";
import { data, Form, useNavigation } from "react-router";
import type { Route } from "./+types/seasons";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { listSeasonWindows, saveSeasonWindows, SeasonWindowsRefused } from "~/forage/season-windows.server";
import { BAND_LABELS, BANDS, DEFAULT_SEASON_WINDOWS, monthDayNumber, SEASON_LABELS, SEASON_NAMES, seasonWindowSchema, type SeasonWindow } from "~/forage/seasons";
import { MONTH_NAMES } from "~/taxa/bloom";
import { FormMessage } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "Season windows · Visitwort" }];

/** The form's field names, as `saveSeasonWindows` keys its refusals: "north.early-spring.start". */
type Values = Record<string, string>;
const fieldName = (w: Pick<SeasonWindow, "band" | "name">, end: "start" | "end") => `${w.band}.${w.name}.${end}`;
const ORDERED = BANDS.flatMap((band) => SEASON_NAMES.map((name) => ({ band, name })));

function valuesOf(windows: readonly SeasonWindow[]): Values {
  const values: Values = {};
  for (const w of windows) {
    values[fieldName(w, "start")] = w.start;
    values[fieldName(w, "end")] = w.end;
  }
  return values;
}

export async function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context, { roles: ["coordinator"] });
  return { windows: await listSeasonWindows(context.get(entityManagerContext)) };
}

type ActionResult =
  | { saved: true; windows: SeasonWindow[]; rebuiltMs: number }
  | { saved: false; error: string; fields: Record<string, string[]>; values: Values };

export async function action({ request, context }: Route.ActionArgs) {
  requireUser(request, context, { roles: ["coordinator"] });
  const form = await request.formData();
  const values: Values = {};
  for (const w of ORDERED) {
    for (const end of ["start", "end"] as const) values[fieldName(w, end)] = String(form.get(fieldName(w, end)) ?? "");
  }
  if (form.get("intent") !== "save") {
    return data({ saved: false, error: "Unknown action; nothing was saved.", fields: {}, values } satisfies ActionResult, { status: 400 });
  }
  const input = ORDERED.map((w) => ({ ...w, start: values[fieldName(w, "start")]!, end: values[fieldName(w, "end")]! }));
  // Dates that name no day are reported alone: the overlap check of the whole year would
  // otherwise also blame the neighbouring seasons for a date it cannot read.
  const unreadable: Record<string, string[]> = {};
  for (const window of input) {
    const parsed = seasonWindowSchema.safeParse(window);
    for (const issue of parsed.error?.issues ?? []) (unreadable[fieldName(window, issue.path[0] === "end" ? "end" : "start")] ??= []).push(issue.message);
  }
  if (Object.keys(unreadable).length) {
    return data({ saved: false, error: "Some dates name no day of the year.", fields: unreadable, values } satisfies ActionResult, { status: 400 });
  }
  try {
    const { windows, rebuiltMs } = await saveSeasonWindows(context.get(entityManagerContext), input);
    return { saved: true, windows, rebuiltMs } satisfies ActionResult;
  } catch (error) {
    if (error instanceof SeasonWindowsRefused) {
      return data({ saved: false, error: error.message, fields: error.fields, values } satisfies ActionResult, { status: 400 });
    }
    throw error;
  }
}

/** "04-20" → "20 April"; null when it names no day of the year. */
function readMonthDay(value: string): string | null {
  const number = monthDayNumber(value.trim());
  if (number === null) return null;
  return `${number % 100} ${MONTH_NAMES[Math.floor(number / 100) - 1]}`;
}

/** "Early spring (queens emerge)" → a title and its gloss, shown on two lines in a narrow column. */
function splitLabel(label: string): { title: string; gloss: string } {
  const open = label.indexOf(" (");
  return open < 0 ? { title: label, gloss: "" } : { title: label.slice(0, open), gloss: label.slice(open + 2).replace(/\)$/, "") };
}

const capitalised = (message: string) => message.charAt(0).toUpperCase() + message.slice(1);

function seconds(ms: number): string {
  return ms < 1000 ? `${Math.max(1, Math.round(ms))} ms` : `${(ms / 1000).toFixed(1)} s`;
}

export default function Seasons({ loaderData, actionData }: Route.ComponentProps) {
  const result = actionData as ActionResult | undefined;
  const busy = useNavigation().state === "submitting";
  // What was typed survives a refusal: without JavaScript the page comes back with it from the action.
  const [values, setValues] = useState<Values>(() => (result && !result.saved ? result.values : valuesOf(loaderData.windows)));
  const fields = result && !result.saved ? result.fields : {};

  useEffect(() => {
    if (result?.saved) setValues(valuesOf(result.windows));
  }, [result]);

  const defaults = valuesOf(DEFAULT_SEASON_WINDOWS);
  const problems = Object.keys(fields).length;

  return (
    <div className="max-w-3xl space-y-6">
      <header className="space-y-2">
        <h1 className="text-3xl">Season windows</h1>
        <p>
          The windows of the bumble-bee year, for each band. Dates are written month-day: <b className="tabular-nums">04-20</b> = 20 April. A
          window whose end comes before its start runs over New Year, as overwintering does.
        </p>
        <p className="text-ink-soft">Saving refiles every recorded visit under the new seasons, so the forage ranking and the season calendar follow at once.</p>
      </header>

      {result?.saved && (
        <FormMessage tone="success">
          Saved. Every visit was refiled under these windows in {seconds(result.rebuiltMs)}.
        </FormMessage>
      )}
      {result && !result.saved && (
        <FormMessage tone="error">
          Nothing was saved. {problems > 0 ? `Check the ${problems === 1 ? "marked date" : `${problems} marked dates`} below.` : result.error}
          {fields.windows?.length ? ` ${fields.windows.map(capitalised).join(" ")}` : null}
        </FormMessage>
      )}

      <Form method="post" className="space-y-6" noValidate>
        {BANDS.map((band) => (
          <section key={band} aria-labelledby={`${band}-heading`} className="overflow-x-auto rounded-lg border border-ink/10 bg-white/50">
            <h2 id={`${band}-heading`} className="bg-paper-deep/70 px-3 py-2 text-xl">{BAND_LABELS[band]}</h2>
            <table className="w-full text-left text-[0.95rem]">
              <thead className="text-sm text-ink-soft">
                <tr className="border-b border-ink/10">
                  <th scope="col" className="px-2 py-2 font-semibold sm:w-[32%] sm:px-3">Season</th>
                  <th scope="col" className="px-1 py-2 font-semibold sm:w-[18%] sm:px-2">Starts</th>
                  <th scope="col" className="px-1 py-2 font-semibold sm:w-[18%] sm:px-2">Ends</th>
                  <th scope="col" className="hidden px-3 py-2 font-semibold sm:table-cell">Default</th>
                </tr>
              </thead>
              <tbody>
                {SEASON_NAMES.map((name) => {
                  const window = { band, name };
                  const label = splitLabel(SEASON_LABELS[name]);
                  const defaultRange = `${defaults[fieldName(window, "start")]} to ${defaults[fieldName(window, "end")]}`;
                  const changed = (["start", "end"] as const).some((end) => values[fieldName(window, end)]?.trim() !== defaults[fieldName(window, end)]);
                  const refusals = (["start", "end"] as const).filter((end) => fields[fieldName(window, end)]?.length);
                  return (
                    <Fragment key={name}>
                      <tr className={`align-top ${refusals.length ? "" : "border-b border-ink/10 last:border-b-0"}`}>
                        <th scope="row" className="px-2 py-2 font-normal sm:px-3">
                          <span className="block font-semibold">{label.title}</span>
                          <span className="block text-sm text-ink-soft">{label.gloss}</span>
                          <span className="block text-xs text-ink-soft sm:hidden">
                            Default <span className="whitespace-nowrap">{defaultRange}</span>
                          </span>
                        </th>
                        {(["start", "end"] as const).map((end) => {
                          const id = fieldName(window, end);
                          const messages = fields[id];
                          const reading = readMonthDay(values[id] ?? "");
                          return (
                            <td key={end} className="px-1 py-2 sm:px-2">
                              <label htmlFor={id} className="sr-only">
                                {BAND_LABELS[band]}, {SEASON_LABELS[name]}: {end === "start" ? "first day" : "last day"}
                              </label>
                              <input
                                id={id}
                                name={id}
                                value={values[id] ?? ""}
                                onChange={(e) => setValues((current) => ({ ...current, [id]: e.target.value }))}
                                placeholder="MM-DD"
                                maxLength={5}
                                autoComplete="off"
                                spellCheck={false}
                                aria-invalid={messages?.length ? true : undefined}
                                aria-describedby={`${id}-reading${messages?.length ? ` ${id}-error` : ""}`}
                                className={`min-h-11 w-[4.75rem] rounded-md border bg-white px-2 text-base tabular-nums sm:w-[5.5rem] ${messages?.length ? "border-2 border-clay" : "border-ink/30"}`}
                              />
                              <span id={`${id}-reading`} className="mt-0.5 block text-xs text-ink-soft">
                                {reading ?? (values[id]?.trim() ? "no such day" : "")}
                              </span>
                            </td>
                          );
                        })}
                        <td className="hidden px-3 py-2 text-ink-soft tabular-nums sm:table-cell">
                          {defaultRange}
                          {changed && <span className="ml-2 rounded-full border border-pollen bg-pollen/15 px-2 py-0.5 text-xs font-semibold text-ink">changed</span>}
                        </td>
                      </tr>
                      {refusals.length > 0 && (
                        <tr className="border-b border-ink/10 last:border-b-0">
                          <td colSpan={4} className="px-2 pb-2 sm:px-3">
                            {refusals.map((end) => (
                              <p key={end} id={`${fieldName(window, end)}-error`} role="alert" className="text-sm font-medium text-clay">
                                {end === "start" ? "Starts" : "Ends"}: {fields[fieldName(window, end)]!.map(capitalised).join(" ")}
                              </p>
                            ))}
                          </td>
                        </tr>
                      )}
                    </Fragment>
                  );
                })}
              </tbody>
            </table>
          </section>
        ))}

        <div className="flex flex-wrap items-center gap-3">
          <button type="submit" name="intent" value="save" disabled={busy} className="min-h-12 rounded-md bg-moss px-5 font-semibold text-paper hover:bg-moss-deep disabled:opacity-60">
            {busy ? "Saving and refiling visits…" : "Save the windows"}
          </button>
          <button
            type="button"
            onClick={() => setValues(defaults)}
            className="min-h-12 rounded-md border border-ink/30 bg-white/70 px-4 font-medium text-ink hover:bg-white"
          >
            Fill in the defaults
          </button>
          <span className="text-sm text-ink-soft">Filling in changes nothing until you save.</span>
        </div>
      </Form>
    </div>
  );
}
