import type { ReactNode } from "react";
import { Form } from "react-router";
import { GROWTH_FORMS, REGIONAL_STATUSES, TAXON_RANKS, type PlantChecklistRow } from "~/taxa/checklist-schema";
import { REGIONAL_STATUS_LABELS } from "~/taxa/taxon-record";
import { MONTH_NAMES } from "~/taxa/bloom";
import { Field, FormMessage, PrimaryButton } from "~/components/forms";

/** The taxon form as typed: every field a string, name lists one per line. Sent back on a refusal. */
export type TaxonFormValues = Record<keyof PlantChecklistRow, string>;

export type TaxonFieldErrors = Record<string, string[] | undefined>;

export const EMPTY_TAXON_FORM: TaxonFormValues = {
  scientificName: "",
  scientificNameAuthorship: "",
  family: "",
  genus: "",
  taxonRank: "species",
  vernacularNames: "",
  synonyms: "",
  regionalStatus: "native",
  growthForm: "forb",
  bloomStart: "",
  bloomEnd: "",
  sourceNote: "",
};

export function taxonFormValues(taxon: PlantChecklistRow): TaxonFormValues {
  const values = { ...EMPTY_TAXON_FORM };
  for (const key of Object.keys(values) as (keyof PlantChecklistRow)[]) {
    const value = taxon[key];
    values[key] = Array.isArray(value) ? value.join("\n") : String(value);
  }
  return values;
}

/** Reads the posted form: the values as typed, and the input for the checklist's checks. */
export function readTaxonForm(form: FormData) {
  const values = Object.fromEntries(
    Object.keys(EMPTY_TAXON_FORM).map((key) => [key, String(form.get(key) ?? "")]),
  ) as TaxonFormValues;
  const lines = (text: string) => text.split(/\r?\n/).map((line) => line.trim()).filter(Boolean);
  const scientificName = values.scientificName.trim().replace(/\s+/g, " ");
  const input = {
    ...values,
    scientificName,
    // The genus is the first word of the name; asking for it twice only invites a mismatch.
    genus: values.genus.trim() || scientificName.split(" ")[0] || "",
    vernacularNames: lines(values.vernacularNames),
    synonyms: lines(values.synonyms),
    // An unchosen month stays missing, so the message asks for a month rather than citing a range.
    bloomStart: values.bloomStart || undefined,
    bloomEnd: values.bloomEnd || undefined,
  };
  return { values, input };
}

/**
 * The checks' messages, made to fit the form: an unchosen month asks for a month, a genus left
 * empty (taken from the name) is not blamed for the name's fault, and a field shows its first
 * message only (an empty name is both "required" and "not a binomial") — except the name lists,
 * where each clashing name has its own.
 */
export function taxonFieldErrors(values: TaxonFormValues, fields: Record<string, string[]>): TaxonFieldErrors {
  const shown: TaxonFieldErrors = {};
  for (const [field, messages] of Object.entries(fields)) {
    shown[field] = field === "vernacularNames" || field === "synonyms" ? messages : messages.slice(0, 1);
  }
  for (const month of ["bloomStart", "bloomEnd"] as const) {
    if (!values[month] && shown[month]) shown[month] = ["choose a month"];
  }
  if (!values.genus.trim()) delete shown.genus;
  return shown;
}

const GROWTH_FORM_LABELS: Record<(typeof GROWTH_FORMS)[number], string> = {
  tree: "tree",
  shrub: "shrub",
  forb: "forb (non-woody flowering plant)",
  graminoid: "graminoid (grass-like)",
  vine: "vine",
};

/** The checks' messages continue a column name ("is required"); under a label they read as sentences. */
const sentence = (messages?: string[]) => messages?.map((m) => m.charAt(0).toUpperCase() + m.slice(1));

const inputStyle = (invalid: boolean) =>
  `w-full rounded-md border bg-white px-3 text-base ${invalid ? "border-clay" : "border-ink/30"}`;

function Labelled({ id, label, hint, errors, children }: { id: string; label: string; hint?: ReactNode; errors?: string[]; children: ReactNode }) {
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block font-semibold">
        {label}
      </label>
      {children}
      {hint && (
        <p id={`${id}-hint`} className="text-sm text-ink-soft">
          {hint}
        </p>
      )}
      {errors?.length ? (
        <p id={`${id}-error`} className="text-sm font-medium text-clay" role="alert">
          {errors.join(" ")}
        </p>
      ) : null}
    </div>
  );
}

const describedBy = (id: string, hint: boolean, errors?: string[]) =>
  [errors?.length ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;

function Select({ name, label, options, defaultValue, errors, placeholder }: {
  name: string;
  label: string;
  options: { value: string; label: string }[];
  defaultValue: string;
  errors?: string[];
  placeholder?: string;
}) {
  const id = `field-${name}`;
  return (
    <Labelled id={id} label={label} errors={errors}>
      <select id={id} name={name} defaultValue={defaultValue} aria-invalid={errors?.length ? true : undefined} aria-describedby={describedBy(id, false, errors)} className={`min-h-11 ${inputStyle(Boolean(errors?.length))}`}>
        {placeholder !== undefined && <option value="">{placeholder}</option>}
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
    </Labelled>
  );
}

function TextArea({ name, label, hint, defaultValue, errors, rows = 3 }: { name: string; label: string; hint?: ReactNode; defaultValue: string; errors?: string[]; rows?: number }) {
  const id = `field-${name}`;
  return (
    <Labelled id={id} label={label} hint={hint} errors={errors}>
      <textarea id={id} name={name} rows={rows} defaultValue={defaultValue} spellCheck={false} aria-invalid={errors?.length ? true : undefined} aria-describedby={describedBy(id, Boolean(hint), errors)} className={`py-2 ${inputStyle(Boolean(errors?.length))}`} />
    </Labelled>
  );
}

const MONTH_OPTIONS = MONTH_NAMES.map((name, i) => ({ value: String(i + 1), label: name }));

/** One plant taxon's fields, for adding and for editing; nothing is kept when the checks refuse it. */
export function TaxonForm({ values, errors, message, submitLabel, busy }: {
  values: TaxonFormValues;
  errors?: TaxonFieldErrors;
  message?: string;
  submitLabel: string;
  busy: boolean;
}) {
  const e = (field: keyof TaxonFormValues) => sentence(errors?.[field]);
  return (
    <Form method="post" className="space-y-5" noValidate>
      <input type="hidden" name="intent" value="save" />
      {message && (
        <FormMessage tone="error">
          <p>{message}</p>
        </FormMessage>
      )}
      <fieldset className="space-y-4">
        <legend className="mb-2 text-xl font-display font-semibold">Name</legend>
        <Field label="Scientific name" name="scientificName" defaultValue={values.scientificName} autoComplete="off" spellCheck={false} errors={e("scientificName")} hint="Genus and epithet without authorship, e.g. Salix discolor; a variety or subspecies adds “var.” or “subsp.” and its name." />
        <Field label="Authorship" name="scientificNameAuthorship" defaultValue={values.scientificNameAuthorship} autoComplete="off" spellCheck={false} errors={e("scientificNameAuthorship")} hint="e.g. Muhl. or (L.) Mill." />
        <div className="grid gap-4 sm:grid-cols-2">
          <Field label="Family" name="family" defaultValue={values.family} autoComplete="off" spellCheck={false} errors={e("family")} hint="e.g. Salicaceae" />
          <Field label="Genus" name="genus" defaultValue={values.genus} autoComplete="off" spellCheck={false} errors={e("genus")} hint="Leave empty to take it from the scientific name." />
        </div>
        <Select name="taxonRank" label="Rank" defaultValue={values.taxonRank} errors={e("taxonRank")} options={TAXON_RANKS.map((rank) => ({ value: rank, label: rank }))} />
        <TextArea name="vernacularNames" label="Common names" defaultValue={values.vernacularNames} errors={e("vernacularNames")} hint="One per line; the first is the one pickers show." />
        <TextArea name="synonyms" label="Synonyms" defaultValue={values.synonyms} errors={e("synonyms")} hint="One per line, without authorship. A synonym cannot be another taxon’s accepted name or synonym." />
      </fieldset>
      <fieldset className="space-y-4">
        <legend className="mb-2 text-xl font-display font-semibold">In the region</legend>
        <div className="grid gap-4 sm:grid-cols-2">
          <Select name="regionalStatus" label="Status" defaultValue={values.regionalStatus} errors={e("regionalStatus")} options={REGIONAL_STATUSES.map((status) => ({ value: status, label: REGIONAL_STATUS_LABELS[status] }))} />
          <Select name="growthForm" label="Growth form" defaultValue={values.growthForm} errors={e("growthForm")} options={GROWTH_FORMS.map((form) => ({ value: form, label: GROWTH_FORM_LABELS[form] }))} />
          <Select name="bloomStart" label="Bloom starts" defaultValue={values.bloomStart} errors={e("bloomStart")} placeholder="Choose a month" options={MONTH_OPTIONS} />
          <Select name="bloomEnd" label="Bloom ends" defaultValue={values.bloomEnd} errors={e("bloomEnd")} placeholder="Choose a month" options={MONTH_OPTIONS} />
        </div>
        <TextArea name="sourceNote" label="Source" rows={2} defaultValue={values.sourceNote} errors={e("sourceNote")} hint="Where these facts come from, e.g. a regional flora and page, or a herbarium specimen." />
      </fieldset>
      <PrimaryButton disabled={busy}>{submitLabel}</PrimaryButton>
    </Form>
  );
}
