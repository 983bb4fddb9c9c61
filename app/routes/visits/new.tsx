import { useEffect, useState } from "react";
import { data, redirect, useFetcher } from "react-router";
import type { Route } from "./+types/new";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { listBeeTaxa } from "~/taxa/taxa.server";
import { listSites } from "~/visits/sites.server";
import { createVisit, VisitRefused } from "~/visits/visits.server";
import { visitFormToInput, visitInput } from "~/visits/visit-schema";
import { photoInspector } from "~/storage/photo-inspector.server";
import { readPhotoExif } from "~/visits/exif";
import { fieldErrors, type FieldErrors } from "~/auth/account-schemas";
import {
  BEE_CONFIDENCE_LABELS,
  BEE_CONFIDENCES,
  BEE_NOT_SURE_LABEL,
  BEHAVIOR_LABELS,
  BEHAVIORS,
  CASTE_LABELS,
  CASTES,
  type BeeView,
  type PhotoSubject,
} from "~/visits/vocabulary";
import type { PlantTaxonRecord } from "~/taxa/taxon-record";
import { PlantPicker, rememberRecentPlant } from "~/components/PlantPicker";
import { FormMessage } from "~/components/forms";
import { MAX_PHOTO_BYTES, PhotoList, PhotoPicker, uploadPhoto, type PhotoDraft } from "./PhotoUploads";

export const meta: Route.MetaFunction = () => [{ title: "Record a visit · Visitwort" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context, { roles: ["recorder"] });
  const em = context.get(entityManagerContext);
  const [bees, sites] = await Promise.all([listBeeTaxa(em), listSites(em)]);
  return { bees, sites };
}

export async function action({ request, context }: Route.ActionArgs) {
  const user = requireUser(request, context, { roles: ["recorder"] });
  const parsed = visitInput.safeParse(visitFormToInput(await request.formData()));
  if (!parsed.success) return data({ fields: fieldErrors(parsed.error) as FieldErrors }, { status: 400 });
  try {
    const { visit } = await createVisit(context.get(entityManagerContext), user.id, parsed.data, photoInspector());
    return redirect(`/visits/${visit.id}?recorded`);
  } catch (error) {
    if (error instanceof VisitRefused) return data({ fields: error.fields as FieldErrors }, { status: error.status });
    throw error;
  }
}

/** "2025-04-27T09:41" in this browser's zone → "2025-04-27T09:41:00-05:00". */
function withOffset(local: string): string {
  const date = new Date(local);
  const minutes = -date.getTimezoneOffset();
  const sign = minutes >= 0 ? "+" : "-";
  const pad = (n: number) => String(Math.floor(Math.abs(n))).padStart(2, "0");
  return `${local.length === 16 ? `${local}:00` : local}${sign}${pad(minutes / 60)}:${pad(minutes % 60)}`;
}

function nowLocal(): string {
  const now = new Date();
  now.setMinutes(now.getMinutes() - now.getTimezoneOffset());
  return now.toISOString().slice(0, 16);
}

function Chips<T extends string>({ name, legend, values, labels, value, onChange, errors }: {
  name: string;
  legend: string;
  values: readonly T[];
  labels: Record<T, string>;
  value: T | "";
  onChange: (value: T) => void;
  errors?: string[];
}) {
  return (
    <fieldset className="space-y-1">
      <legend className="mb-1 font-semibold">{legend}</legend>
      <div className="grid grid-cols-2 gap-2 sm:flex sm:flex-wrap">
        {values.map((v) => (
          <label
            key={v}
            className={`flex min-h-12 cursor-pointer items-center justify-center rounded-md border px-3 text-center font-medium has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-pollen ${
              value === v ? "border-moss bg-moss text-paper" : "border-ink/25 bg-white/70"
            }`}
          >
            <input type="radio" name={name} value={v} checked={value === v} onChange={() => onChange(v)} className="sr-only" />
            {labels[v]}
          </label>
        ))}
      </div>
      {errors?.length ? <p role="alert" className="text-sm font-medium text-clay">{errors.join(" ")}</p> : null}
    </fieldset>
  );
}

export default function NewVisit({ loaderData }: Route.ComponentProps) {
  const fetcher = useFetcher<typeof action>();
  const errors = (fetcher.data as { fields?: FieldErrors } | undefined)?.fields ?? {};
  const [clientSubmissionId] = useState(() => (typeof crypto !== "undefined" && "randomUUID" in crypto ? crypto.randomUUID() : ""));
  const [when, setWhen] = useState("");
  const [latitude, setLatitude] = useState("");
  const [longitude, setLongitude] = useState("");
  const [uncertainty, setUncertainty] = useState("");
  const [locationNote, setLocationNote] = useState<string | null>(null);
  const [siteId, setSiteId] = useState("");
  const [beeTaxonId, setBeeTaxonId] = useState("");
  const [caste, setCaste] = useState<(typeof CASTES)[number] | "">("");
  const [confidence, setConfidence] = useState<(typeof BEE_CONFIDENCES)[number] | "">("");
  const [behavior, setBehavior] = useState<(typeof BEHAVIORS)[number] | "">("");
  const [plant, setPlant] = useState<PlantTaxonRecord | null>(null);
  const [plantNotIdentified, setPlantNotIdentified] = useState(false);
  const [photos, setPhotos] = useState<PhotoDraft[]>([]);

  useEffect(() => setWhen(nowLocal()), []);

  const update = (localId: string, change: Partial<PhotoDraft>) =>
    setPhotos((current) => current.map((p) => (p.localId === localId ? { ...p, ...change } : p)));

  function addPhotos(files: File[], subject: PhotoSubject) {
    for (const file of files) {
      const localId = crypto.randomUUID();
      const draft: PhotoDraft = { localId, subject, fileName: file.name, previewUrl: URL.createObjectURL(file), progress: 0, state: "uploading", views: [] };
      setPhotos((current) => [...current, draft]);
      if (file.size > MAX_PHOTO_BYTES) {
        update(localId, { state: "failed", error: `This file is ${(file.size / 1048576).toFixed(1)} MB; photos may be at most 20 MB.` });
        continue;
      }
      readPhotoExif(file).then((exif) => update(localId, { exif }));
      uploadPhoto(file, subject, (progress) => update(localId, { progress }))
        .then((key) => update(localId, { key, state: "uploaded", progress: 1 }))
        .catch((error: Error) => update(localId, { state: "failed", error: error.message }));
    }
  }

  function applyExif(photo: PhotoDraft) {
    if (!photo.exif) return;
    if (photo.exif.takenAt) setWhen(photo.exif.takenAt);
    if (photo.exif.latitude !== null && photo.exif.longitude !== null) {
      setLatitude(photo.exif.latitude.toFixed(6));
      setLongitude(photo.exif.longitude.toFixed(6));
      // A phone's GPS fix in a photo is good to some tens of metres (common practice, no source).
      setUncertainty((u) => u || "30");
      setSiteId("");
      setLocationNote("Place taken from the photo.");
    }
  }

  function locate() {
    if (!("geolocation" in navigator)) {
      setLocationNote("This browser cannot tell its location; choose a site or type the coordinates.");
      return;
    }
    setLocationNote("Finding your location…");
    navigator.geolocation.getCurrentPosition(
      (position) => {
        setLatitude(position.coords.latitude.toFixed(6));
        setLongitude(position.coords.longitude.toFixed(6));
        setUncertainty(String(Math.max(1, Math.round(position.coords.accuracy))));
        setSiteId("");
        setLocationNote(`Located to within ${Math.round(position.coords.accuracy)} m.`);
      },
      (failure) => setLocationNote(failure.code === failure.PERMISSION_DENIED ? "Location is blocked for this site; choose a site or type the coordinates." : "No location fix; try again outside, or choose a site."),
      { enableHighAccuracy: true, timeout: 20_000, maximumAge: 60_000 },
    );
  }

  const uploading = photos.some((p) => p.state === "uploading");
  const busy = fetcher.state !== "idle";

  function submit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    form.set("eventDate", when ? withOffset(when) : "");
    form.set("eventTimeZone", Intl.DateTimeFormat().resolvedOptions().timeZone ?? "");
    form.set("photos", JSON.stringify(photos.filter((p) => p.state === "uploaded").map((p) => ({ key: p.key, subject: p.subject, views: p.views }))));
    if (plant) rememberRecentPlant(plant.id);
    fetcher.submit(form, { method: "post" });
  }

  const errorCount = Object.values(errors).filter((messages) => messages?.length).length;
  const beeWarning = loaderData.bees.find((b) => String(b.id) === beeTaxonId)?.sensitive;

  return (
    <div className="mx-auto max-w-xl pb-28">
      <h1 className="mb-1 text-3xl">Record a visit</h1>
      <p className="mb-4 text-ink-soft">One bee on one flower. Photos help the botanists and bee verifiers confirm it.</p>

      <aside className="mb-5 rounded-md border-l-4 border-pollen bg-pollen/15 p-3 text-[0.95rem]" aria-label="Before you record">
        Photograph bees; never catch or handle them — some, like the rusty patched bumble bee, are endangered. Record only
        where you may be, and keep to paths on private land and reserves. <a href="/cautions">More cautions</a>
      </aside>

      {errorCount > 0 && (
        <div className="mb-4">
          <FormMessage tone="error">Nothing was saved. Check the {errorCount === 1 ? "marked field" : `${errorCount} marked fields`} below.</FormMessage>
        </div>
      )}

      <fetcher.Form method="post" onSubmit={submit} className="space-y-7" noValidate>
        <input type="hidden" name="clientSubmissionId" value={clientSubmissionId} />

        <section className="space-y-3" aria-labelledby="photos-heading">
          <h2 id="photos-heading" className="text-xl">Photos</h2>
          <div className="flex gap-2">
            <PhotoPicker subject="bee" label="Bee photo" onFiles={addPhotos} />
            <PhotoPicker subject="plant" label="Plant photo" onFiles={addPhotos} />
          </div>
          <PhotoList
            photos={photos}
            onViews={(localId, views: BeeView[]) => update(localId, { views })}
            onRemove={(localId) => setPhotos((current) => current.filter((p) => p.localId !== localId))}
            onUseExif={applyExif}
          />
          {errors.photos?.length ? <p role="alert" className="text-sm font-medium text-clay">{errors.photos.join(" ")}</p> : null}
        </section>

        <section className="space-y-4" aria-labelledby="bee-heading">
          <h2 id="bee-heading" className="text-xl">The bee</h2>
          <div className="space-y-1">
            <label htmlFor="beeTaxonId" className="block font-semibold">Species</label>
            <select
              id="beeTaxonId"
              name="beeTaxonId"
              value={beeTaxonId}
              onChange={(e) => setBeeTaxonId(e.target.value)}
              className="min-h-12 w-full rounded-md border border-ink/30 bg-white px-3 text-base"
            >
              <option value="">{BEE_NOT_SURE_LABEL}</option>
              {loaderData.bees.map((bee) => (
                <option key={bee.id} value={bee.id}>
                  {bee.vernacularNames[0]} — {bee.scientificName}
                </option>
              ))}
            </select>
            {beeWarning && (
              <p className="rounded bg-clay/10 p-2 text-sm" role="note">
                An endangered species: photograph only, do not disturb. Its exact place is shown only to coordinators and you.
              </p>
            )}
          </div>
          <Chips name="caste" legend="Caste" values={CASTES} labels={CASTE_LABELS} value={caste} onChange={setCaste} errors={errors.caste} />
          <Chips name="beeIdentificationConfidence" legend="How sure are you of the bee?" values={BEE_CONFIDENCES} labels={BEE_CONFIDENCE_LABELS} value={confidence} onChange={setConfidence} errors={errors.beeIdentificationConfidence} />
          <Chips name="behavior" legend="What was it doing?" values={BEHAVIORS} labels={BEHAVIOR_LABELS} value={behavior} onChange={setBehavior} errors={errors.behavior} />
          <div className="space-y-1">
            <label htmlFor="habitatNotes" className="block font-semibold">
              Habitat {behavior === "nest_searching" ? "(please describe: a nest-searching queen tells us about nest sites)" : "notes"}
            </label>
            <textarea
              id="habitatNotes"
              name="habitatNotes"
              rows={behavior === "nest_searching" ? 3 : 2}
              placeholder="Vegetation, ground cover, e.g. leaf litter under oaks, bare sandy bank"
              className={`w-full rounded-md border bg-white px-3 py-2 text-base ${behavior === "nest_searching" ? "border-pollen ring-2 ring-pollen/40" : "border-ink/30"}`}
            />
          </div>
        </section>

        <section className="space-y-3" aria-labelledby="plant-heading">
          <h2 id="plant-heading" className="text-xl">The flower</h2>
          <PlantPicker name="plantTaxonId" label="Plant" value={plant} onChange={setPlant} errors={errors.plantTaxonId ?? errors.plantScientificName} disabled={plantNotIdentified} />
          <label className="flex min-h-12 items-center gap-3">
            <input
              type="checkbox"
              name="plantNotIdentified"
              checked={plantNotIdentified}
              onChange={(e) => {
                setPlantNotIdentified(e.target.checked);
                if (e.target.checked) setPlant(null);
              }}
              className="h-6 w-6 accent-moss"
            />
            I could not identify the plant (add a plant photo)
          </label>
        </section>

        <section className="space-y-3" aria-labelledby="when-heading">
          <h2 id="when-heading" className="text-xl">When and where</h2>
          <div className="space-y-1">
            <label htmlFor="when" className="block font-semibold">Date and time</label>
            <input id="when" type="datetime-local" value={when} max={nowLocal()} onChange={(e) => setWhen(e.target.value)} aria-invalid={errors.eventDate?.length ? true : undefined} className="min-h-12 w-full rounded-md border border-ink/30 bg-white px-3 text-base" />
            {errors.eventDate?.length ? <p role="alert" className="text-sm font-medium text-clay">{errors.eventDate.join(" ")}</p> : null}
          </div>
          <button type="button" onClick={locate} className="min-h-12 w-full rounded-md border border-moss bg-white px-4 font-semibold text-moss-deep">
            Use my location
          </button>
          {locationNote && <p className="text-sm text-ink-soft" role="status">{locationNote}</p>}
          <div className="grid grid-cols-2 gap-2">
            <div className="space-y-1">
              <label htmlFor="decimalLatitude" className="block text-sm font-semibold">Latitude</label>
              <input id="decimalLatitude" name="decimalLatitude" inputMode="decimal" value={latitude} onChange={(e) => setLatitude(e.target.value)} aria-invalid={errors.decimalLatitude?.length ? true : undefined} className="min-h-12 w-full rounded-md border border-ink/30 bg-white px-3 text-base tabular-nums" />
            </div>
            <div className="space-y-1">
              <label htmlFor="decimalLongitude" className="block text-sm font-semibold">Longitude</label>
              <input id="decimalLongitude" name="decimalLongitude" inputMode="decimal" value={longitude} onChange={(e) => setLongitude(e.target.value)} aria-invalid={errors.decimalLongitude?.length ? true : undefined} className="min-h-12 w-full rounded-md border border-ink/30 bg-white px-3 text-base tabular-nums" />
            </div>
          </div>
          {[...(errors.decimalLatitude ?? []), ...(errors.decimalLongitude ?? [])].length ? (
            <p role="alert" className="text-sm font-medium text-clay">{[...(errors.decimalLatitude ?? []), ...(errors.decimalLongitude ?? [])].join(" ")}</p>
          ) : null}
          <div className="space-y-1">
            <label htmlFor="coordinateUncertaintyInMeters" className="block text-sm font-semibold">Within (metres)</label>
            <input id="coordinateUncertaintyInMeters" name="coordinateUncertaintyInMeters" inputMode="numeric" value={uncertainty} onChange={(e) => setUncertainty(e.target.value)} className="min-h-12 w-full rounded-md border border-ink/30 bg-white px-3 text-base tabular-nums" />
            {errors.coordinateUncertaintyInMeters?.length ? <p role="alert" className="text-sm font-medium text-clay">{errors.coordinateUncertaintyInMeters.join(" ")}</p> : null}
          </div>
          <div className="space-y-1">
            <label htmlFor="siteId" className="block font-semibold">Or a monitoring site</label>
            <select id="siteId" name="siteId" value={siteId} onChange={(e) => setSiteId(e.target.value)} className="min-h-12 w-full rounded-md border border-ink/30 bg-white px-3 text-base">
              <option value="">No site</option>
              {loaderData.sites.map((site) => (
                <option key={site.id} value={site.id}>{site.name}</option>
              ))}
            </select>
            {errors.siteId?.length ? <p role="alert" className="text-sm font-medium text-clay">{errors.siteId.join(" ")}</p> : null}
          </div>
        </section>

        <section className="space-y-1">
          <label htmlFor="occurrenceRemarks" className="block font-semibold">Remarks</label>
          <textarea id="occurrenceRemarks" name="occurrenceRemarks" rows={2} className="w-full rounded-md border border-ink/30 bg-white px-3 py-2 text-base" />
        </section>

        <div className="fixed inset-x-0 bottom-0 z-10 border-t border-ink/10 bg-paper/95 p-3 backdrop-blur sm:static sm:border-0 sm:bg-transparent sm:p-0">
          <div className="mx-auto max-w-xl">
            <button type="submit" disabled={busy || uploading} className="min-h-14 w-full rounded-md bg-moss px-5 text-lg font-semibold text-paper hover:bg-moss-deep disabled:opacity-60">
              {uploading ? "Waiting for photos…" : busy ? "Saving…" : "Save the visit"}
            </button>
          </div>
        </div>
      </fetcher.Form>
    </div>
  );
}
