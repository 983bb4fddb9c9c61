import { data, Link, useRouteLoaderData } from "react-router";
import { hasAnyRole, type Role } from "~/auth/roles";
import type { Route } from "./+types/visit";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { findVisitForViewer } from "~/visits/visits.server";
import { toVisitRecord } from "~/visits/visit-record.server";
import { BEE_VIEW_LABELS, BEHAVIOR_LABELS, CASTE_LABELS, BEE_CONFIDENCE_LABELS } from "~/visits/vocabulary";
import { FormMessage } from "~/components/forms";
import { StatusTag } from "./visits";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = requireUser(request, context);
  const found = await findVisitForViewer(context.get(entityManagerContext), user, Number(params.visitId) || 0);
  if (!found) throw data("There is no visit with this number.", { status: 404 });
  if (found === "forbidden") throw data("This visit is not yours to see.", { status: 403 });
  return {
    visit: toVisitRecord(found.visit, found.photos, found.determinations, user),
    justRecorded: new URL(request.url).searchParams.has("recorded"),
  };
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `Visit ${data.visit.eventLocalDate} · Visitwort` : "Visit · Visitwort" }];

/** "43.0731° N, 89.4012° W" — a place in words, no map needed. */
function placeInWords(latitude: number, longitude: number) {
  return `${Math.abs(latitude).toFixed(4)}° ${latitude >= 0 ? "N" : "S"}, ${Math.abs(longitude).toFixed(4)}° ${longitude >= 0 ? "E" : "W"}`;
}

export default function VisitPage({ loaderData }: Route.ComponentProps) {
  const { visit, justRecorded } = loaderData;
  const roles = (useRouteLoaderData("root") as { user: { roles: Role[] } | null } | undefined)?.user?.roles ?? [];
  const time = new Date(visit.eventDate).toLocaleTimeString("en-GB", { hour: "2-digit", minute: "2-digit", timeZone: visit.eventTimeZone || "UTC" });
  return (
    <article className="mx-auto max-w-2xl space-y-6">
      <p className="text-sm">
        <Link to="/visits">← Visits</Link>
      </p>
      {justRecorded && <FormMessage tone="success">Saved. Botanists and bee verifiers will look at it; you will see what they decide here.</FormMessage>}
      <header className="space-y-1">
        <h1 className="text-3xl">
          <i>{visit.scientificName}</i> on {visit.plantScientificName ? <i>{visit.plantScientificName}</i> : "an unidentified plant"}
        </h1>
        <p className="text-ink-soft">
          {visit.eventLocalDate} at {time} · {CASTE_LABELS[visit.caste]} · {BEHAVIOR_LABELS[visit.behavior]} · recorded by {visit.recordedBy}
        </p>
      </header>

      {visit.photos.length > 0 && (
        <section aria-label="Photos" className="grid grid-cols-2 gap-2 sm:grid-cols-3">
          {visit.photos.map((photo) => (
            <figure key={photo.id} className="space-y-1">
              <a href={`/photos/${photo.id}`} target="_blank" rel="noreferrer">
                <img src={`/photos/${photo.id}`} alt={`${photo.subject === "bee" ? "The bee" : "The plant"}${photo.views.length ? `: ${photo.views.map((v) => BEE_VIEW_LABELS[v]).join(", ")}` : ""}`} className="aspect-square w-full rounded-md object-cover" data-testid="visit-photo" />
              </a>
              <figcaption className="text-xs text-ink-soft">
                {photo.subject === "bee" ? "Bee" : "Plant"}
                {photo.views.length ? ` — ${photo.views.map((v) => BEE_VIEW_LABELS[v]).join(", ")}` : ""}
              </figcaption>
            </figure>
          ))}
        </section>
      )}

      <section>
        <h2 className="mb-2 text-xl">Record</h2>
        <dl className="grid grid-cols-[max-content_1fr] gap-x-5 gap-y-2">
          <dt className="font-semibold">Place</dt>
          <dd>
            {placeInWords(visit.decimalLatitude, visit.decimalLongitude)}
            {visit.coordinateUncertaintyInMeters ? ` (within ${visit.coordinateUncertaintyInMeters} m)` : ""}
            {visit.site ? ` · site ${visit.site.name}` : ""}
            {visit.dataGeneralizations && (
              <span className="mt-1 block text-sm text-ink-soft">
                Shown to the nearest 0.1° grid cell: this bee is a sensitive species, and its exact place is kept for the recorder and the coordinators.
              </span>
            )}
          </dd>
          <dt className="font-semibold">Bee</dt>
          <dd>
            <i>{visit.scientificName}</i>, {CASTE_LABELS[visit.caste].toLowerCase()} — recorder {BEE_CONFIDENCE_LABELS[visit.beeIdentificationConfidence].toLowerCase()} · <StatusTag status={visit.beeIdentificationVerificationStatus} />
          </dd>
          <dt className="font-semibold">Plant</dt>
          <dd>
            {visit.plantScientificName ? <i>{visit.plantScientificName}</i> : "not identified"} · <StatusTag status={visit.plantIdentificationVerificationStatus} />
          </dd>
          {visit.habitatNotes && (
            <>
              <dt className="font-semibold">Habitat</dt>
              <dd>{visit.habitatNotes}</dd>
            </>
          )}
          {visit.occurrenceRemarks && (
            <>
              <dt className="font-semibold">Remarks</dt>
              <dd>{visit.occurrenceRemarks}</dd>
            </>
          )}
        </dl>
      </section>

      <section>
        <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
          <h2 className="text-xl">Determinations</h2>
          <span className="flex gap-3 text-sm">
            {hasAnyRole(roles, ["botanist"]) && <Link to={`/determinations?subject=plant&visit=${visit.id}`}>Determine the plant</Link>}
            {hasAnyRole(roles, ["bee_verifier"]) && <Link to={`/determinations?subject=bee&visit=${visit.id}`}>Determine the bee</Link>}
          </span>
        </div>
        <ol className="space-y-2 border-l-2 border-moss/30 pl-4">
          {visit.determinations.map((d) => (
            <li key={d.id}>
              <p>
                <span className="font-semibold">{d.subject === "plant" ? "Plant" : "Bee"}:</span>{" "}
                {d.scientificName ? <i>{d.scientificName}</i> : "not identified"}
                {d.caste ? ` (${CASTE_LABELS[d.caste].toLowerCase()})` : ""} <StatusTag status={d.identificationVerificationStatus} />
              </p>
              <p className="text-sm text-ink-soft">
                {d.identifiedBy}, {d.dateIdentified.slice(0, 10)}
                {d.remarks ? ` — ${d.remarks}` : ""}
              </p>
            </li>
          ))}
        </ol>
      </section>
    </article>
  );
}
