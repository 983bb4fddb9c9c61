import { useEffect, useMemo, useRef, useState } from "react";
import { data, Form, Link, useFetcher } from "react-router";
import type { Route } from "./+types/queue";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { hasAnyRole } from "~/auth/roles";
import { publicOrigin } from "~/auth/accounts.server";
import { determinationInput, determine, DeterminationRefused, listQueue, type QueueItem } from "~/determinations/determinations.server";
import { listBeeTaxa } from "~/taxa/taxa.server";
import { listSites } from "~/visits/sites.server";
import { fieldErrors, formToObject, type FieldErrors } from "~/auth/account-schemas";
import { BEE_VIEW_LABELS, BEHAVIOR_LABELS, CASTE_LABELS, CASTES, BEE_CONFIDENCE_LABELS, type Caste, type PhotoSubject } from "~/visits/vocabulary";
import { MONTH_NAMES } from "~/taxa/bloom";
import type { PlantTaxonRecord } from "~/taxa/taxon-record";
import { PlantPicker } from "~/components/PlantPicker";
import { FormMessage } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "Determinations · Visitwort" }];

function chooseSubject(requested: string | null, roles: Parameters<typeof hasAnyRole>[0]): PhotoSubject {
  const canPlant = hasAnyRole(roles, ["botanist"]);
  const canBee = hasAnyRole(roles, ["bee_verifier"]);
  if (requested === "bee" && canBee) return "bee";
  if (requested === "plant" && canPlant) return "plant";
  return canPlant ? "plant" : "bee";
}

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["botanist", "bee_verifier"] });
  const url = new URL(request.url);
  const subject = chooseSubject(url.searchParams.get("subject"), user.roles);
  const number = (name: string) => Number(url.searchParams.get(name)) || undefined;
  const filters = { site: number("site"), month: number("month"), family: url.searchParams.get("family") || undefined, recorder: number("recorder") };
  // ?visit=<id> opens the queue at that visit (a link from the visit page).
  const focus = number("visit");
  const em = context.get(entityManagerContext);
  const [queue, bees, sites] = await Promise.all([listQueue(em, subject, filters, 50, focus), listBeeTaxa(em), listSites(em)]);
  return {
    subject,
    canSwitch: hasAnyRole(user.roles, ["botanist"]) && hasAnyRole(user.roles, ["bee_verifier"]),
    queue,
    filters,
    focus: focus ?? null,
    bees: bees.map((b) => ({ id: b.id, scientificName: b.scientificName, vernacular: b.vernacularNames[0] ?? "" })),
    sites: sites.map((s) => ({ id: s.id, name: s.name })),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const user = requireUser(request, context, { roles: ["botanist", "bee_verifier"] });
  const form = await request.formData();
  const parsed = determinationInput.safeParse(formToObject(form));
  if (!parsed.success) return data({ ok: false as const, error: "Check the marked fields.", fields: fieldErrors(parsed.error) as FieldErrors }, { status: 400 });
  try {
    await determine(context.get(entityManagerContext), user, Number(form.get("visitId")), parsed.data, publicOrigin(request));
    return { ok: true as const, visitId: Number(form.get("visitId")), error: undefined, fields: undefined };
  } catch (error) {
    if (error instanceof DeterminationRefused) return data({ ok: false as const, error: error.message, fields: error.fields as FieldErrors }, { status: error.status });
    throw error;
  }
}

export default function Queue({ loaderData }: Route.ComponentProps) {
  const { queue, subject } = loaderData;
  const [selectedId, setSelectedId] = useState<number | null>(
    queue.items.find((i) => i.id === loaderData.focus)?.id ?? queue.items[0]?.id ?? null,
  );
  const fetcher = useFetcher<typeof action>();
  const result = fetcher.data;

  // After a determination the visit leaves the queue: move on to the one that took its place.
  const selectedIndex = Math.max(0, queue.items.findIndex((item) => item.id === selectedId));
  const lastIndex = useRef(0);
  useEffect(() => {
    if (queue.items.some((item) => item.id === selectedId)) {
      lastIndex.current = selectedIndex;
      return;
    }
    setSelectedId(queue.items[Math.min(lastIndex.current, queue.items.length - 1)]?.id ?? null);
  }, [queue.items, selectedId, selectedIndex]);

  const item = queue.items.find((i) => i.id === selectedId) ?? null;
  const move = (step: number) => {
    const next = queue.items[Math.min(Math.max(selectedIndex + step, 0), queue.items.length - 1)];
    if (next) setSelectedId(next.id);
  };

  return (
    <div className="space-y-4">
      <header className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-3xl">Determinations</h1>
          <p className="text-ink-soft">
            {queue.total} {queue.total === 1 ? "visit waits" : "visits wait"} for {subject === "plant" ? "a botanist" : "a bee verifier"}
            {subject === "bee" ? "; endangered species first" : ""}; oldest first.
          </p>
        </div>
        {loaderData.canSwitch && (
          <nav aria-label="Queues" className="flex gap-1">
            {(["plant", "bee"] as const).map((s) => (
              <Link key={s} to={`?subject=${s}`} className={`inline-flex min-h-11 items-center rounded-md border px-4 font-semibold no-underline ${s === subject ? "border-moss bg-moss text-paper" : "border-ink/25 text-ink"}`}>
                {s === "plant" ? "Plants" : "Bees"}
              </Link>
            ))}
          </nav>
        )}
      </header>

      <details className="rounded-lg border border-ink/10 bg-white/40 p-3">
        <summary className="cursor-pointer font-semibold">Filter the queue</summary>
        <Form method="get" className="mt-2 grid grid-cols-2 gap-2 sm:grid-cols-5">
          <input type="hidden" name="subject" value={subject} />
          <label className="text-sm"><span className="block font-semibold">Site</span>
            <select name="site" defaultValue={loaderData.filters.site ?? ""} className="min-h-11 w-full rounded-md border border-ink/30 bg-white px-2">
              <option value="">Any</option>
              {loaderData.sites.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
            </select>
          </label>
          <label className="text-sm"><span className="block font-semibold">Month</span>
            <select name="month" defaultValue={loaderData.filters.month ?? ""} className="min-h-11 w-full rounded-md border border-ink/30 bg-white px-2">
              <option value="">Any</option>
              {MONTH_NAMES.map((m, i) => <option key={m} value={i + 1}>{m}</option>)}
            </select>
          </label>
          <label className="text-sm"><span className="block font-semibold">Family</span>
            <input name="family" defaultValue={loaderData.filters.family ?? ""} placeholder="e.g. Rosaceae" className="min-h-11 w-full rounded-md border border-ink/30 bg-white px-2" />
          </label>
          <div className="flex items-end gap-2">
            <button type="submit" className="min-h-11 rounded-md bg-moss px-4 font-semibold text-paper">Filter</button>
            <Link to={`?subject=${subject}`} className="inline-flex min-h-11 items-center rounded-md border border-ink/25 px-3 text-ink no-underline">Clear</Link>
          </div>
        </Form>
      </details>

      {result?.ok && <FormMessage tone="success">Saved. {item ? "Next visit:" : "The queue is empty."}</FormMessage>}
      {result && !result.ok && <FormMessage tone="error">{result.error}</FormMessage>}

      {queue.items.length === 0 ? (
        <p className="rounded-lg border border-ink/10 bg-white/50 p-6 text-center">Nothing waits here. Thank you.</p>
      ) : (
        <div className="grid gap-4 lg:grid-cols-[18rem_1fr]">
          <ol aria-label="Waiting visits" className="max-h-48 space-y-1 overflow-y-auto lg:max-h-[70vh] rounded-lg border border-ink/10 bg-white/40 p-1 lg:block">
            {queue.items.map((i) => (
              <li key={i.id}>
                <button
                  type="button"
                  onClick={() => setSelectedId(i.id)}
                  aria-current={i.id === selectedId ? "true" : undefined}
                  className={`w-full rounded-md px-3 py-2 text-left text-sm ${i.id === selectedId ? "bg-moss text-paper" : "hover:bg-ink/5"}`}
                >
                  <span className="block font-semibold">{i.eventLocalDate} · {i.photos.length} photo{i.photos.length === 1 ? "" : "s"}</span>
                  <span className="block truncate">
                    {subject === "plant" ? (i.plant ? <i>{i.plant.scientificName}</i> : "plant not identified") : i.bee ? <i>{i.bee.scientificName}</i> : "Bombus sp."}
                    {subject === "bee" && i.bee?.sensitive ? " · endangered" : ""}
                  </span>
                </button>
              </li>
            ))}
          </ol>
          {item && (
            <Determiner
              key={`${item.id}-${item.version}`}
              item={item}
              subject={subject}
              bees={loaderData.bees}
              fetcher={fetcher}
              position={`${selectedIndex + 1} of ${queue.items.length}`}
              onMove={move}
            />
          )}
        </div>
      )}
    </div>
  );
}

function Determiner({
  item,
  subject,
  bees,
  fetcher,
  position,
  onMove,
}: {
  item: QueueItem;
  subject: PhotoSubject;
  bees: { id: number; scientificName: string; vernacular: string }[];
  fetcher: ReturnType<typeof useFetcher<typeof action>>;
  position: string;
  onMove: (step: number) => void;
}) {
  const [mode, setMode] = useState<"correct" | "cannot" | null>(null);
  const [zoomed, setZoomed] = useState<number | null>(null);
  const [plant, setPlant] = useState<PlantTaxonRecord | null>(null);
  const [beeId, setBeeId] = useState(item.bee ? String(item.bee.id) : "");
  const [caste, setCaste] = useState<Caste>(item.caste);
  const reasonRef = useRef<HTMLTextAreaElement>(null);
  const correctRef = useRef<HTMLDivElement>(null);
  const busy = fetcher.state !== "idle";
  const errors = (fetcher.data && !fetcher.data.ok ? fetcher.data.fields : undefined) ?? {};
  const canConfirm = subject === "plant" ? Boolean(item.plant) : Boolean(item.bee);

  const submit = (values: Record<string, string>) =>
    fetcher.submit({ visitId: String(item.id), version: String(item.version), subject, ...values }, { method: "post" });

  const photos = useMemo(() => [...item.photos].sort((a, b) => (a.subject === subject ? -1 : 0) - (b.subject === subject ? -1 : 0)), [item.photos, subject]);

  // One key per action, ignored while typing in a field.
  useEffect(() => {
    function onKey(event: KeyboardEvent) {
      const target = event.target as HTMLElement;
      if (target.closest("input, textarea, select, [role=combobox]") || event.ctrlKey || event.metaKey || event.altKey) return;
      if (event.key === "c" && canConfirm && !busy) submit({ action: "confirm" });
      else if (event.key === "r") {
        event.preventDefault();
        setMode("correct");
        setTimeout(() => correctRef.current?.querySelector<HTMLElement>("input:not([type=hidden]), select")?.focus(), 0);
      } else if (event.key === "x") {
        event.preventDefault();
        setMode("cannot");
        setTimeout(() => reasonRef.current?.focus(), 0);
      } else if (event.key === "j" || event.key === "ArrowDown") onMove(1);
      else if (event.key === "k" || event.key === "ArrowUp") onMove(-1);
      else if (event.key === "Escape") {
        setZoomed(null);
        setMode(null);
      }
    }
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  });

  const proposal =
    subject === "plant" ? (
      item.plant ? <><i>{item.plant.scientificName}</i> ({item.plant.vernacular}, {item.plant.family})</> : "not identified by the recorder"
    ) : (
      <>{item.bee ? <i>{item.bee.scientificName}</i> : "Bombus sp. (not sure)"}, {CASTE_LABELS[item.caste].toLowerCase()} — recorder {BEE_CONFIDENCE_LABELS[item.beeIdentificationConfidence].toLowerCase()}</>
    );

  return (
    <section aria-label={`Visit of ${item.eventLocalDate}`} className="space-y-4 rounded-lg border border-ink/10 bg-white/60 p-4" data-testid="determiner">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 className="text-xl">Visit of {item.eventLocalDate}</h2>
        <span className="text-sm text-ink-soft">{position} · <Link to={`/visits/${item.id}`}>full record</Link></span>
      </div>
      {item.bee?.sensitive && (
        <p className="rounded bg-clay/10 p-2 text-sm" role="note">An endangered species was proposed: it counts only once verified. Its exact place stays restricted.</p>
      )}
      {photos.length === 0 ? (
        <p className="text-ink-soft">No photos: confirm only if the record itself is convincing.</p>
      ) : (
        <div className="grid grid-cols-2 gap-2 sm:grid-cols-3">
          {photos.map((photo) => (
            <button key={photo.id} type="button" onClick={() => setZoomed(photo.id)} className="group relative" aria-label={`Enlarge the ${photo.subject} photo`}>
              <img src={`/photos/${photo.id}`} alt="" className={`aspect-square w-full rounded-md object-cover ${photo.subject === subject ? "ring-2 ring-pollen" : ""}`} />
              <span className="absolute bottom-1 left-1 rounded bg-ink/70 px-1.5 text-xs text-paper">
                {photo.subject}{photo.views.length ? `: ${photo.views.map((v) => BEE_VIEW_LABELS[v]).join(", ")}` : ""}
              </span>
            </button>
          ))}
        </div>
      )}
      {zoomed !== null && (
        <div role="dialog" aria-label="Photo, enlarged" className="fixed inset-0 z-40 flex flex-col bg-ink/90 p-2" onClick={() => setZoomed(null)}>
          <p className="p-2 text-right text-sm text-paper">Scroll to look around · Esc or tap to close</p>
          <div className="flex-1 overflow-auto">
            <img src={`/photos/${zoomed}`} alt="Enlarged photo" className="max-w-none" style={{ width: "200%" }} />
          </div>
        </div>
      )}
      <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-[0.95rem]">
        <dt className="font-semibold">Proposed</dt>
        <dd>{proposal}</dd>
        <dt className="font-semibold">Seen</dt>
        <dd>{BEHAVIOR_LABELS[item.behavior]}{item.siteName ? ` at ${item.siteName}` : ""}, by {item.recorderName}</dd>
        {item.occurrenceRemarks && (<><dt className="font-semibold">Remarks</dt><dd>{item.occurrenceRemarks}</dd></>)}
      </dl>

      <div className="flex flex-wrap gap-2">
        <button type="button" disabled={!canConfirm || busy} onClick={() => submit({ action: "confirm" })} className="min-h-12 rounded-md bg-moss px-5 font-semibold text-paper disabled:opacity-50" aria-keyshortcuts="c">
          Confirm <kbd className="ml-1 rounded bg-paper/20 px-1 text-xs">C</kbd>
        </button>
        <button type="button" onClick={() => setMode("correct")} className="min-h-12 rounded-md border border-heather px-5 font-semibold text-heather" aria-keyshortcuts="r" aria-expanded={mode === "correct"}>
          Correct <kbd className="ml-1 rounded bg-heather/10 px-1 text-xs">R</kbd>
        </button>
        <button type="button" onClick={() => setMode("cannot")} className="min-h-12 rounded-md border border-clay px-5 font-semibold text-clay" aria-keyshortcuts="x" aria-expanded={mode === "cannot"}>
          Cannot be determined <kbd className="ml-1 rounded bg-clay/10 px-1 text-xs">X</kbd>
        </button>
      </div>
      <p className="text-xs text-ink-soft">Keys: C confirm · R correct · X cannot be determined · J/K or ↓/↑ next/previous · Esc close</p>

      {mode === "correct" && (
        <div ref={correctRef} className="space-y-3 rounded-md border border-heather/40 p-3">
          {subject === "plant" ? (
            <PlantPicker name="plantTaxonId" label="The plant it is" value={plant} onChange={setPlant} errors={errors.plantTaxonId} />
          ) : (
            <>
              <label className="block space-y-1">
                <span className="block font-semibold">The bee it is</span>
                <select value={beeId} onChange={(e) => setBeeId(e.target.value)} className="min-h-12 w-full rounded-md border border-ink/30 bg-white px-3">
                  <option value="">Bombus sp. (genus only)</option>
                  {bees.map((b) => <option key={b.id} value={b.id}>{b.scientificName} — {b.vernacular}</option>)}
                </select>
              </label>
              <fieldset>
                <legend className="font-semibold">Caste</legend>
                <div className="flex flex-wrap gap-2">
                  {CASTES.map((c) => (
                    <label key={c} className={`inline-flex min-h-11 cursor-pointer items-center rounded-md border px-3 ${caste === c ? "border-moss bg-moss text-paper" : "border-ink/25"}`}>
                      <input type="radio" name="caste" value={c} checked={caste === c} onChange={() => setCaste(c)} className="sr-only" />
                      {CASTE_LABELS[c]}
                    </label>
                  ))}
                </div>
              </fieldset>
            </>
          )}
          <button
            type="button"
            disabled={busy || (subject === "plant" && !plant)}
            onClick={() => submit(subject === "plant" ? { action: "correct", plantTaxonId: String(plant?.id ?? "") } : { action: "correct", beeTaxonId: beeId, caste })}
            className="min-h-12 rounded-md bg-heather px-5 font-semibold text-white disabled:opacity-50"
          >
            Save the correction
          </button>
        </div>
      )}
      {mode === "cannot" && (
        <div className="space-y-2 rounded-md border border-clay/40 p-3">
          <label htmlFor={`reason-${item.id}`} className="block font-semibold">Why not? (the recorder sees this)</label>
          <textarea ref={reasonRef} id={`reason-${item.id}`} rows={2} className="w-full rounded-md border border-ink/30 bg-white px-3 py-2" placeholder="e.g. the flowers are not in the photo"
            onKeyDown={(e) => {
              if (e.key === "Enter" && !e.shiftKey) {
                e.preventDefault();
                submit({ action: "cannot_be_determined", remarks: e.currentTarget.value });
              }
            }}
          />
          {errors.remarks && <p role="alert" className="text-sm font-medium text-clay">{errors.remarks.join(" ")}</p>}
          <button type="button" disabled={busy} onClick={() => submit({ action: "cannot_be_determined", remarks: reasonRef.current?.value ?? "" })} className="min-h-12 rounded-md bg-clay px-5 font-semibold text-white">
            Save: cannot be determined
          </button>
        </div>
      )}
    </section>
  );
}
