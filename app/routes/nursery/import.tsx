import { useEffect, useState } from "react";
import { data, Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/import";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { applyStockImport, previewStockImport, stockFileDigest, StockImportRefused } from "~/nursery/stock.server";
import type { StockImportProblem, StockImportRow } from "~/nursery/stock-record";
import { STOCK_CSV_COLUMNS } from "~/nursery/stock-schema";
import { STOCK_AVAILABILITY_LABELS, STOCK_FORM_LABELS } from "~/planting/vocabulary";
import { FormMessage, PrimaryButton, SecondaryButton } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "Import your stock list · Visitwort" }];

const MAX_BYTES = 2 * 1024 * 1024;
// Multipart framing and the other fields add a little to the file itself.
const MAX_REQUEST_BYTES = MAX_BYTES + 64 * 1024;
// What the page lists; the counts always cover the whole file.
const LIST_LIMIT = 300;
const PROBLEM_LIMIT = 300;
const TOO_LARGE = "The file is larger than 2 MB. Split it into smaller files and import them one by one.";

export function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context, { roles: ["nursery"] });
  return { columns: [...STOCK_CSV_COLUMNS] };
}

type ActionResult =
  | { intent: "preview"; draftId: string; fileName: string; digest: string; counts: { new: number; changed: number; unchanged: number; problems: number }; rows: StockImportRow[]; problems: StockImportProblem[] }
  | { intent: "apply"; draftId: string; message: string }
  | { intent: "refused"; draftId: string; error: string; problems?: StockImportProblem[]; problemCount?: number };

export async function action({ request, context }: Route.ActionArgs) {
  const user = requireUser(request, context, { roles: ["nursery"] });
  const refuse = (draftId: string, error: string, status = 400, problems?: StockImportProblem[]) =>
    data({ intent: "refused", draftId, error, problems: problems?.slice(0, PROBLEM_LIMIT), problemCount: problems?.length } satisfies ActionResult, { status });
  // Refused before the body is read: a larger upload is not worth receiving.
  if (Number(request.headers.get("content-length") ?? 0) > MAX_REQUEST_BYTES) return refuse("", TOO_LARGE, 413);
  const em = context.get(entityManagerContext);
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "");
  const draftId = String(form.get("draftId") ?? "");
  const csv = form.get("csv");
  if (intent !== "preview" && intent !== "apply") return refuse(draftId, "Unknown action.");
  if (typeof csv !== "string" || csv.trim() === "") return refuse(draftId, "Choose a CSV file first.");
  if (Buffer.byteLength(csv, "utf8") > MAX_BYTES) return refuse(draftId, TOO_LARGE, 413);

  if (intent === "preview") {
    const preview = await previewStockImport(em, user.id, csv);
    return {
      intent,
      draftId,
      fileName: String(form.get("fileName") ?? "").slice(0, 200),
      digest: stockFileDigest(csv),
      counts: preview.counts,
      rows: preview.rows.filter((row) => row.status !== "unchanged").slice(0, LIST_LIMIT),
      problems: preview.problems.slice(0, PROBLEM_LIMIT),
    } satisfies ActionResult;
  }
  // What is written must be what the nursery looked at.
  if (form.get("digest") !== stockFileDigest(csv)) {
    return refuse(draftId, "This is not the file that was checked. Check it again before writing. Nothing was written.");
  }
  try {
    const summary = await applyStockImport(em, user.id, csv);
    const entries = (n: number) => `${n} ${n === 1 ? "entry" : "entries"}`;
    return { intent, draftId, message: `Written: ${entries(summary.created)} added, ${summary.updated} updated, ${summary.unchanged} unchanged.` } satisfies ActionResult;
  } catch (error) {
    if (error instanceof StockImportRefused) {
      return refuse(draftId, "The file has problems now (the checklist or your list changed since the check). Nothing was written.", 400, error.problems);
    }
    throw error;
  }
}

interface Draft {
  id: string;
  fileName: string;
  text: string;
}

const plural = (count: number, one: string, many: string) => `${count} ${count === 1 ? one : many}`;

const CHANGE_LABELS: Record<StockImportRow["changes"][number], string> = {
  sourceRegion: "source region",
  availability: "availability",
  availabilityNote: "availability note",
  grownWithoutSystemicInsecticides: "insecticide declaration",
};

export default function ImportStock({ loaderData, actionData }: Route.ComponentProps) {
  const result = actionData as ActionResult | undefined;
  const busy = useNavigation().state === "submitting";
  const [draft, setDraft] = useState<Draft | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  // A new key empties the file input after a successful write.
  const [inputKey, setInputKey] = useState(0);

  // A result without a draft came from a post made without this page's script (no file was
  // read here); its problems are still worth showing, though it can never be written.
  const current = result && (result.draftId === "" || (draft && result.draftId === draft.id)) ? result : undefined;
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
      setFileError(TOO_LARGE);
      return;
    }
    setDraft({ id: `${Date.now()}-${Math.random().toString(36).slice(2)}`, fileName: file.name, text: await file.text() });
  }

  const toWrite = preview ? preview.counts.new + preview.counts.changed : 0;
  const canWrite = Boolean(draft) && preview && preview.counts.problems === 0 && toWrite > 0;
  return (
    <div className="max-w-3xl space-y-6">
      <p className="text-sm">
        <Link to="/nursery">← Nursery stock</Link>
      </p>
      <header className="space-y-2">
        <h1 className="text-3xl">Import your stock list</h1>
        <p className="text-ink-soft">
          A CSV file with one row per plant and form. Plants are found on the checklist by scientific name (a synonym works
          too). A plant already on your list in the same form is updated; entries missing from the file stay on your list.
          Nothing is written until you have seen what would change, and a file with any problem is not written at all.
        </p>
        <details className="text-sm text-ink-soft">
          <summary className="min-h-11 cursor-pointer py-2 font-medium text-ink">The columns</summary>
          <div className="space-y-1">
            <p className="break-words">
              <code>{loaderData.columns.join(",")}</code>
            </p>
            <ul className="list-disc pl-5">
              <li><code>form</code>: plug, container or seed</li>
              <li><code>availability</code>: now, or season (later in the season)</li>
              <li><code>grownWithoutSystemicInsecticides</code>: yes or no (an empty cell counts as no)</li>
              <li><code>sourceRegion</code> and <code>availabilityNote</code>: free text, at most 200 characters each</li>
            </ul>
            <p>
              The easiest file to start from is your own <a href="/nursery/stock.csv" download>export</a>.
            </p>
          </div>
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
          <label htmlFor="stock-file" className="block font-semibold">
            Stock list file (CSV, at most 2 MB)
          </label>
          <input
            key={inputKey}
            id="stock-file"
            type="file"
            accept=".csv,text/csv"
            onChange={chooseFile}
            aria-invalid={fileError ? true : undefined}
            aria-describedby={fileError ? "stock-file-error" : undefined}
            className="block min-h-11 w-full rounded-md border border-ink/30 bg-white px-2 py-2 text-base file:mr-3 file:min-h-9 file:rounded file:border-0 file:bg-paper-deep file:px-3 file:font-medium"
          />
          {fileError && (
            <p id="stock-file-error" role="alert" className="text-sm font-medium text-clay">
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
            <Count label="to add" value={preview.counts.new} tone="moss" />
            <Count label="to update" value={preview.counts.changed} tone="sky" />
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

          {preview.rows.length > 0 && (
            <div className="space-y-2">
              <h3 className="text-lg">Entries to add or update</h3>
              <ul className="divide-y divide-ink/10 rounded-lg border border-ink/10 bg-white/50" data-testid="import-rows">
                {preview.rows.map((row) => (
                  <li key={row.line} className="flex flex-wrap items-baseline gap-x-3 gap-y-0.5 px-3 py-2">
                    <span className="text-sm text-ink-soft">line {row.line}</span>
                    <span className={`rounded-full px-2 text-xs font-semibold ${row.status === "new" ? "bg-moss text-paper" : "border border-sky text-ink"}`}>
                      {row.status === "new" ? "add" : "update"}
                    </span>
                    <i className="font-display">{row.scientificName}</i>
                    <span className="text-sm text-ink-soft">
                      {STOCK_FORM_LABELS[row.form]} · {STOCK_AVAILABILITY_LABELS[row.availability]}
                      {row.grownWithoutSystemicInsecticides ? " · declared free of systemic insecticides" : ""}
                      {row.givenName !== row.scientificName && ` · written “${row.givenName}” in the file`}
                      {row.status === "changed" && ` · changes ${row.changes.map((c) => CHANGE_LABELS[c]).join(", ")}`}
                    </span>
                  </li>
                ))}
              </ul>
              {preview.counts.new + preview.counts.changed > preview.rows.length && (
                <p className="text-sm text-ink-soft">…and {preview.counts.new + preview.counts.changed - preview.rows.length} more, not listed here.</p>
              )}
            </div>
          )}

          <Form method="post" encType="multipart/form-data" className="space-y-2">
            <input type="hidden" name="intent" value="apply" />
            <input type="hidden" name="draftId" value={draft?.id ?? ""} />
            <input type="hidden" name="digest" value={preview.digest} />
            <input type="hidden" name="csv" value={draft?.text ?? ""} />
            <PrimaryButton disabled={!canWrite || busy}>Write to my stock list</PrimaryButton>
            <p className="text-sm text-ink-soft">
              {preview.counts.problems > 0
                ? "Fix the problems in the file, choose it again and check it; a file with problems is never written in part. Nothing has been written."
                : canWrite
                  ? `Adds ${plural(preview.counts.new, "entry", "entries")} and updates ${preview.counts.changed}, all at once.`
                  : "Nothing to write: every row matches your stock list."}
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

function ProblemList({ problems, total }: { problems: StockImportProblem[]; total: number }) {
  return (
    <>
      <ul className="space-y-2 text-[0.95rem]">
        {problems.map((problem, i) => (
          <li key={i}>
            <span className="font-semibold">{problem.line > 0 ? `Line ${problem.line}` : "The file"}:</span> {problem.reason}
            {problem.suggestions && (
              <span className="block text-sm">
                {problem.suggestions.length === 0 ? (
                  "No similar name on the checklist. A botanist can add the plant if it belongs there."
                ) : (
                  <>
                    Did you mean{" "}
                    {problem.suggestions.map((s, j) => (
                      <span key={s.scientificName}>
                        {j > 0 && (j === problem.suggestions!.length - 1 ? " or " : ", ")}
                        <i className="font-display">{s.scientificName}</i>
                        {s.vernacularName && ` (${s.vernacularName})`}
                      </span>
                    ))}
                    ?
                  </>
                )}
              </span>
            )}
          </li>
        ))}
      </ul>
      {total > problems.length && <p className="text-sm text-ink-soft">…and {total - problems.length} more, not listed here.</p>}
    </>
  );
}
