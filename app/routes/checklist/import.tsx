import { useEffect, useState } from "react";
import { data, Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/import";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import {
  applyChecklistImport,
  checklistDigest,
  ChecklistImportRefused,
  PLANT_CSV_COLUMNS,
  previewChecklistImport,
  type FieldChange,
  type ImportProblem,
} from "~/taxa/stewardship.server";
import type { PlantChecklistRow } from "~/taxa/checklist-schema";
import { REGIONAL_STATUS_LABELS } from "~/taxa/taxon-record";
import { FormMessage, PrimaryButton, SecondaryButton } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "Import the plant checklist · Visitwort" }];

const MAX_BYTES = 5 * 1024 * 1024;
// Multipart framing and the other fields add a little to the file itself.
const MAX_REQUEST_BYTES = MAX_BYTES + 64 * 1024;
// What the page lists; the counts always cover the whole file.
const LIST_LIMIT = 200;
const PROBLEM_LIMIT = 500;

export function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context, { roles: ["botanist"] });
  return { columns: PLANT_CSV_COLUMNS };
}

type NewRow = { line: number; scientificName: string; family: string; regionalStatus: PlantChecklistRow["regionalStatus"]; bloom: string };
type ChangedRow = { line: number; id: number; scientificName: string; changes: FieldChange[] };

type ActionResult =
  | { intent: "preview"; draftId: string; fileName: string; digest: string; counts: { newTaxa: number; changed: number; unchanged: number; problems: number }; newTaxa: NewRow[]; changed: ChangedRow[]; problems: ImportProblem[] }
  | { intent: "apply"; draftId: string; message: string }
  | { intent: "refused"; draftId: string; error: string; problems?: ImportProblem[]; problemCount?: number };

export async function action({ request, context }: Route.ActionArgs) {
  requireUser(request, context, { roles: ["botanist"] });
  const refuse = (draftId: string, error: string, status = 400, problems?: ImportProblem[]) =>
    data({ intent: "refused", draftId, error, problems: problems?.slice(0, PROBLEM_LIMIT), problemCount: problems?.length } satisfies ActionResult, { status });
  // Refused before the body is read: a larger upload is not worth receiving.
  if (Number(request.headers.get("content-length") ?? 0) > MAX_REQUEST_BYTES) {
    return refuse("", "The file is larger than 5 MB. Split it into smaller files and import them one by one.", 413);
  }
  const em = context.get(entityManagerContext);
  const form = await request.formData();
  const intent = String(form.get("intent"));
  const draftId = String(form.get("draftId") ?? "");
  const csv = form.get("csv");
  if (typeof csv !== "string" || csv.trim() === "") return refuse(draftId, "Choose a CSV file first.");
  if (Buffer.byteLength(csv, "utf8") > MAX_BYTES) {
    return refuse(draftId, "The file is larger than 5 MB. Split it into smaller files and import them one by one.", 413);
  }

  if (intent === "preview") {
    const preview = await previewChecklistImport(em, csv);
    return {
      intent: "preview",
      draftId,
      fileName: String(form.get("fileName") ?? "").slice(0, 200),
      digest: checklistDigest(csv),
      counts: { newTaxa: preview.newTaxa.length, changed: preview.changed.length, unchanged: preview.unchanged.length, problems: preview.problems.length },
      newTaxa: preview.newTaxa.slice(0, LIST_LIMIT).map(({ line, row }) => ({
        line,
        scientificName: row.scientificName,
        family: row.family,
        regionalStatus: row.regionalStatus,
        bloom: `${row.bloomStart}–${row.bloomEnd}`,
      })),
      changed: preview.changed.slice(0, LIST_LIMIT).map(({ line, id, row, changes }) => ({ line, id, scientificName: row.scientificName, changes })),
      problems: preview.problems.slice(0, PROBLEM_LIMIT),
    } satisfies ActionResult;
  }
  if (intent === "apply") {
    // What is written must be what the botanist looked at.
    if (form.get("digest") !== checklistDigest(csv)) {
      return refuse(draftId, "This is not the file that was checked. Check it again before writing. Nothing was written.");
    }
    try {
      const summary = await applyChecklistImport(em, csv);
      const message = `Written: ${summary.created} new ${summary.created === 1 ? "taxon" : "taxa"}, ${summary.updated} changed, ${summary.unchanged} unchanged.`;
      return { intent: "apply", draftId, message } satisfies ActionResult;
    } catch (error) {
      if (error instanceof ChecklistImportRefused) {
        return refuse(draftId, "The checklist changed since the check, and the file now has problems. Nothing was written.", 400, error.problems);
      }
      throw error;
    }
  }
  return refuse(draftId, "Unknown action.");
}

interface Draft {
  id: string;
  fileName: string;
  text: string;
}

const plural = (count: number, one: string, many: string) => `${count} ${count === 1 ? one : many}`;

export default function ImportChecklist({ loaderData, actionData }: Route.ComponentProps) {
  const result = actionData as ActionResult | undefined;
  const busy = useNavigation().state === "submitting";
  const [draft, setDraft] = useState<Draft | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  // A new key empties the file input after a successful write.
  const [inputKey, setInputKey] = useState(0);

  const current = result && draft && result.draftId === draft.id ? result : undefined;
  const preview = current?.intent === "preview" ? current : undefined;

  useEffect(() => {
    if (result?.intent === "apply") {
      setDraft(null);
      setInputKey((key) => key + 1);
    }
  }, [result]);

  async function chooseFile(event: React.ChangeEvent<HTMLInputElement>) {
    const file = event.target.files?.[0];
    setDraft(null);
    setFileError(null);
    if (!file) return;
    if (file.size > MAX_BYTES) {
      setFileError("The file is larger than 5 MB. Split it into smaller files and import them one by one.");
      return;
    }
    setDraft({ id: `${Date.now()}-${Math.random().toString(36).slice(2)}`, fileName: file.name, text: await file.text() });
  }

  const canWrite = preview && preview.counts.problems === 0 && preview.counts.newTaxa + preview.counts.changed > 0;
  return (
    <div className="max-w-3xl space-y-6">
      <p className="text-sm">
        <Link to="/checklist">← Plant checklist</Link>
      </p>
      <header className="space-y-2">
        <h1 className="text-3xl">Import the plant checklist</h1>
        <p className="text-ink-soft">
          A CSV file with the columns of the <a href="/checklist/export.csv">checklist export</a>, which is the easiest file
          to start from. Rows are matched by scientific name: a new name adds a taxon, a known one is updated. Taxa missing
          from the file stay on the checklist. Nothing is written until you have seen what would change, and a file with any
          problem is not written at all.
        </p>
        <details className="text-sm text-ink-soft">
          <summary className="min-h-11 cursor-pointer py-2 font-medium text-ink">The columns</summary>
          <p className="break-words">
            <code>{loaderData.columns.join(",")}</code>. Common names and synonyms are separated by “ | ” within their cell;
            months are numbers 1–12.
          </p>
        </details>
      </header>

      {result?.intent === "apply" && <FormMessage tone="success">{result.message}</FormMessage>}
      {result?.intent === "refused" && (!draft || result.draftId === draft.id || result.draftId === "") && (
        <FormMessage tone="error">
          <p>{result.error}</p>
          {result.problems && <ProblemList problems={result.problems} total={result.problemCount ?? result.problems.length} />}
        </FormMessage>
      )}

      <Form method="post" encType="multipart/form-data" className="space-y-3">
        <input type="hidden" name="intent" value="preview" />
        <input type="hidden" name="draftId" value={draft?.id ?? ""} />
        <input type="hidden" name="fileName" value={draft?.fileName ?? ""} />
        <input type="hidden" name="csv" value={draft?.text ?? ""} />
        <div className="space-y-1">
          <label htmlFor="checklist-file" className="block font-semibold">
            Checklist file (CSV, at most 5 MB)
          </label>
          <input
            key={inputKey}
            id="checklist-file"
            type="file"
            accept=".csv,text/csv"
            onChange={chooseFile}
            aria-invalid={fileError ? true : undefined}
            aria-describedby={fileError ? "checklist-file-error" : undefined}
            className="block min-h-11 w-full rounded-md border border-ink/30 bg-white px-2 py-2 text-base file:mr-3 file:min-h-9 file:rounded file:border-0 file:bg-paper-deep file:px-3 file:font-medium"
          />
          {fileError && (
            <p id="checklist-file-error" role="alert" className="text-sm font-medium text-clay">
              {fileError}
            </p>
          )}
          <noscript>
            <p className="text-sm text-clay">The file is read in your browser: this page needs JavaScript.</p>
          </noscript>
        </div>
        <SecondaryButton disabled={!draft || busy}>Check the file</SecondaryButton>
      </Form>

      {preview && (
        <section aria-labelledby="preview-heading" className="space-y-5" data-testid="import-preview">
          <h2 id="preview-heading" className="text-2xl">
            What importing {preview.fileName ? <span className="break-all">“{preview.fileName}”</span> : "this file"} would do
          </h2>
          <ul className="grid grid-cols-2 gap-2 sm:grid-cols-4" aria-label="Summary">
            <Count label="new taxa" value={preview.counts.newTaxa} tone="moss" />
            <Count label="changed" value={preview.counts.changed} tone="sky" />
            <Count label="unchanged" value={preview.counts.unchanged} tone="ink" />
            <Count label={preview.counts.problems === 1 ? "problem" : "problems"} value={preview.counts.problems} tone="clay" />
          </ul>

          {preview.counts.problems > 0 && (
            <div className="space-y-2 rounded-md border-l-4 border-clay bg-clay/10 p-3" data-testid="import-problems">
              <h3 className="font-sans text-base font-bold">
                {plural(preview.counts.problems, "problem", "problems")} to fix in the file before anything can be written
              </h3>
              <ProblemList problems={preview.problems} total={preview.counts.problems} />
            </div>
          )}

          {preview.newTaxa.length > 0 && (
            <div className="space-y-2">
              <h3 className="text-lg">New taxa</h3>
              <ul className="divide-y divide-ink/10 rounded-lg border border-ink/10 bg-white/50">
                {preview.newTaxa.map((row) => (
                  <li key={row.line} className="flex flex-wrap items-baseline gap-x-3 gap-y-0.5 px-3 py-2">
                    <span className="text-sm text-ink-soft">line {row.line}</span>
                    <i className="font-display">{row.scientificName}</i>
                    <span className="text-sm text-ink-soft">
                      {row.family} · {REGIONAL_STATUS_LABELS[row.regionalStatus]} · blooms {row.bloom}
                    </span>
                  </li>
                ))}
              </ul>
              <MoreThanShown shown={preview.newTaxa.length} total={preview.counts.newTaxa} />
            </div>
          )}

          {preview.changed.length > 0 && (
            <div className="space-y-2">
              <h3 className="text-lg">Changed taxa</h3>
              <ul className="divide-y divide-ink/10 rounded-lg border border-ink/10 bg-white/50">
                {preview.changed.map((row) => (
                  <li key={row.line} className="space-y-1 px-3 py-2">
                    <p className="flex flex-wrap items-baseline gap-x-3">
                      <span className="text-sm text-ink-soft">line {row.line}</span>
                      <Link to={`/checklist/${row.id}`} className="font-display italic">
                        {row.scientificName}
                      </Link>
                    </p>
                    <dl className="grid gap-x-3 gap-y-1 text-sm sm:grid-cols-[max-content_1fr]">
                      {row.changes.map((change) => (
                        <div key={change.field} className="contents">
                          <dt className="font-semibold">{change.field}</dt>
                          <dd className="break-words">
                            <del className="text-ink-soft">{change.before || "(empty)"}</del> → <ins className="no-underline">{change.after || "(empty)"}</ins>
                          </dd>
                        </div>
                      ))}
                    </dl>
                  </li>
                ))}
              </ul>
              <MoreThanShown shown={preview.changed.length} total={preview.counts.changed} />
            </div>
          )}

          <Form method="post" encType="multipart/form-data" className="space-y-2">
            <input type="hidden" name="intent" value="apply" />
            <input type="hidden" name="draftId" value={draft?.id ?? ""} />
            <input type="hidden" name="digest" value={preview.digest} />
            <input type="hidden" name="csv" value={draft?.text ?? ""} />
            <PrimaryButton disabled={!canWrite || busy}>Write these changes</PrimaryButton>
            <p className="text-sm text-ink-soft">
              {preview.counts.problems > 0
                ? "Fix the problems in the file, choose it again and check it; a file with problems is never written in part."
                : canWrite
                  ? `Adds ${plural(preview.counts.newTaxa, "taxon", "taxa")} and updates ${preview.counts.changed}, all at once.`
                  : "Nothing to write: every row matches the checklist."}
            </p>
          </Form>
        </section>
      )}
    </div>
  );
}

function Count({ label, value, tone }: { label: string; value: number; tone: "moss" | "sky" | "ink" | "clay" }) {
  const style = { moss: "border-moss", sky: "border-sky", ink: "border-ink/30", clay: value > 0 ? "border-clay bg-clay/10" : "border-ink/30" }[tone];
  return (
    <li className={`rounded-md border-l-4 bg-white/60 px-3 py-2 ${style}`}>
      <span className="block text-2xl font-semibold tabular-nums">{value}</span>
      <span className="text-sm">{label}</span>
    </li>
  );
}

function ProblemList({ problems, total }: { problems: ImportProblem[]; total: number }) {
  return (
    <>
      <ul className="space-y-1 text-[0.95rem]">
        {problems.map((problem, i) => (
          <li key={i}>
            <span className="font-semibold">{problem.line > 0 ? `Line ${problem.line}` : "The file"}:</span> {problem.reason}
          </li>
        ))}
      </ul>
      <MoreThanShown shown={problems.length} total={total} />
    </>
  );
}

function MoreThanShown({ shown, total }: { shown: number; total: number }) {
  return total > shown ? <p className="text-sm text-ink-soft">…and {total - shown} more, not listed here.</p> : null;
}
