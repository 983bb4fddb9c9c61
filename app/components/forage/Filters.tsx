import { useId, useState, type FormEvent, type ReactNode } from "react";
import { Link, useNavigate } from "react-router";
import { MONTH_NAMES } from "~/taxa/bloom";
import { EVIDENCE_CHOICES, EVIDENCE_LABELS, type CommonFilters } from "~/forage/view-params";

/**
 * The filters of a forage page: a one-line summary of what is shown, and a form that writes
 * its choices to the address (so a view can be shared). On phones the form folds away behind
 * "Change" to leave the results on screen.
 */
export function FilterPanel({
  summary,
  normalise,
  resetTo,
  children,
}: {
  summary: string;
  /** The form's values → the page's search params, tidied (defaults dropped, months joined). */
  normalise: (values: URLSearchParams) => URLSearchParams;
  resetTo: string;
  children: ReactNode;
}) {
  const [open, setOpen] = useState(false);
  const navigate = useNavigate();
  const formId = useId();

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const values = new URLSearchParams();
    for (const [key, value] of new FormData(event.currentTarget)) if (typeof value === "string") values.append(key, value);
    const search = normalise(values).toString();
    setOpen(false);
    navigate({ search: search ? `?${search}` : "" }, { preventScrollReset: true });
  }

  return (
    <section aria-label="Filters" className="rounded-lg border border-ink/10 bg-white/50 p-3">
      <div className="flex items-start justify-between gap-3">
        <p className="min-w-0 text-sm" data-testid="filter-summary">
          <span className="font-semibold">Showing: </span>
          {summary}
        </p>
        <button
          type="button"
          className="min-h-11 flex-none rounded-md border border-ink/25 px-3 text-sm font-medium sm:hidden"
          aria-expanded={open}
          aria-controls={formId}
          onClick={() => setOpen((o) => !o)}
        >
          {open ? "Close" : "Change"}
        </button>
      </div>
      {/* GET without scripts too; with them the values are tidied before they reach the address. */}
      <form id={formId} method="get" onSubmit={onSubmit} className={`${open ? "grid" : "hidden"} mt-3 grid-cols-2 gap-x-3 gap-y-3 sm:grid sm:grid-cols-4`}>
        {children}
        <div className="col-span-2 flex flex-wrap gap-2 sm:col-span-4">
          <button type="submit" className="min-h-11 rounded-md bg-moss px-5 font-semibold text-paper hover:bg-moss-deep">
            Show
          </button>
          <Link to={resetTo} preventScrollReset className="inline-flex min-h-11 items-center rounded-md border border-ink/25 px-4 text-ink no-underline">
            Reset
          </Link>
        </div>
      </form>
    </section>
  );
}

export function SelectField({
  label,
  name,
  defaultValue,
  options,
  emptyLabel,
  wide = false,
  hint,
}: {
  label: string;
  name: string;
  defaultValue: string | undefined;
  options: readonly (readonly [value: string, text: string])[];
  /** An option with the empty value ("Any"), when the filter may be left open. */
  emptyLabel?: string;
  /** Two columns everywhere, or only on phones (where one column is too narrow for the text). */
  wide?: boolean | "phone";
  hint?: string;
}) {
  const id = useId();
  return (
    <div className={wide === "phone" ? "col-span-2 sm:col-span-1" : wide ? "col-span-2" : ""}>
      <label htmlFor={id} className="block text-sm font-semibold">
        {label}
      </label>
      <select id={id} name={name} defaultValue={defaultValue ?? ""} aria-describedby={hint ? `${id}-hint` : undefined} className="min-h-11 w-full rounded-md border border-ink/30 bg-white px-2">
        {emptyLabel !== undefined && <option value="">{emptyLabel}</option>}
        {options.map(([value, text]) => (
          <option key={value} value={value}>
            {text}
          </option>
        ))}
      </select>
      {hint && (
        <p id={`${id}-hint`} className="mt-0.5 text-xs text-ink-soft">
          {hint}
        </p>
      )}
    </div>
  );
}

/** First and last year, and which determinations count: the filters every forage page has. */
export function CommonFields({ values }: { values: CommonFilters }) {
  return (
    <>
      <YearField label="From year" name="from" defaultValue={values.from} />
      <YearField label="To year" name="to" defaultValue={values.to} />
      <SelectField
        label="Evidence"
        name="determination"
        defaultValue={values.determination}
        options={EVIDENCE_CHOICES.map((c) => [c, EVIDENCE_LABELS[c]] as const)}
        wide
      />
    </>
  );
}

function YearField({ label, name, defaultValue }: { label: string; name: string; defaultValue: number | undefined }) {
  const id = useId();
  return (
    <div>
      <label htmlFor={id} className="block text-sm font-semibold">
        {label}
      </label>
      <input
        id={id}
        name={name}
        type="number"
        inputMode="numeric"
        min={1900}
        max={2100}
        step={1}
        placeholder="any"
        defaultValue={defaultValue ?? ""}
        className="min-h-11 w-full rounded-md border border-ink/30 bg-white px-2"
      />
    </div>
  );
}

const MONTH_SHORT = MONTH_NAMES.map((m) => m.slice(0, 3));

/** Twelve toggles, January to December; none ticked means the whole year (or the window). */
export function MonthToggles({ selected, legend, hint }: { selected: readonly number[]; legend: string; hint: string }) {
  const hintId = useId();
  return (
    <fieldset className="col-span-2 sm:col-span-4" aria-describedby={hintId}>
      <legend className="text-sm font-semibold">{legend}</legend>
      <p id={hintId} className="text-xs text-ink-soft">
        {hint}
      </p>
      <div className="mt-1 grid grid-cols-6 gap-1 sm:grid-cols-12">
        {MONTH_SHORT.map((short, index) => (
          <label key={short} className="relative block">
            <input type="checkbox" name="months" value={index + 1} defaultChecked={selected.includes(index + 1)} className="peer absolute inset-0 opacity-0" />
            <span
              title={MONTH_NAMES[index]}
              className="flex min-h-11 items-center justify-center rounded-md border border-ink/25 bg-white text-sm peer-checked:border-moss peer-checked:bg-moss peer-checked:font-semibold peer-checked:text-paper peer-checked:before:content-['✓_'] peer-focus-visible:outline-3 peer-focus-visible:outline-offset-2 peer-focus-visible:outline-pollen"
            >
              <span aria-hidden="true">{short}</span>
              <span className="sr-only">{MONTH_NAMES[index]}</span>
            </span>
          </label>
        ))}
      </div>
    </fieldset>
  );
}
