import type { Determination, Photo, Visit } from "../entities/index.ts";
import { locationFor, type LocationViewer } from "../exchange/generalise.ts";
import { BEE_NOT_SURE_LABEL } from "./vocabulary.ts";

/**
 * A visit is sensitive when its bee, or any bee it was ever determined as, is flagged sensitive:
 * a correction away from an endangered species does not make the first report's place public.
 */
export function isSensitiveVisit(visit: Visit, determinations: Determination[]): boolean {
  return Boolean(visit.beeTaxon?.sensitive) || determinations.some((d) => d.subject === "bee" && d.beeTaxon?.sensitive);
}

/**
 * A visit as the JSON API and the visit page show it to this viewer, with Darwin Core names
 * where the standard has them. `associatedTaxa` uses the term's recommended
 * "relationship":"name" form. A sensitive visit's place is generalised for everyone but
 * coordinators and its recorder (app/exchange/generalise.ts), and its site withheld.
 */
export function toVisitRecord(visit: Visit, photos: Photo[], determinations: Determination[], viewer: LocationViewer) {
  const plantName = visit.plantTaxon?.scientificName ?? null;
  const place = locationFor(viewer, {
    recorderId: visit.recorder.id,
    sensitive: isSensitiveVisit(visit, determinations),
    decimalLatitude: visit.decimalLatitude,
    decimalLongitude: visit.decimalLongitude,
    coordinateUncertaintyInMeters: visit.coordinateUncertaintyInMeters ?? null,
  });
  return {
    id: visit.id,
    occurrenceID: `visitwort:visit:${visit.id}`,
    basisOfRecord: "HumanObservation",
    clientSubmissionId: visit.clientSubmissionId,
    // Send it back with a determination: it tells whether somebody else acted in between.
    version: visit.version,
    recordedBy: visit.recorder.name,
    eventDate: visit.eventDate.toISOString(),
    eventLocalDate: String(visit.eventLocalDate),
    eventTimeZone: visit.eventTimeZone,
    decimalLatitude: place.decimalLatitude,
    decimalLongitude: place.decimalLongitude,
    geodeticDatum: "EPSG:4326",
    coordinateUncertaintyInMeters: place.coordinateUncertaintyInMeters,
    dataGeneralizations: place.dataGeneralizations,
    informationWithheld: place.generalised && visit.site ? "Site withheld: it would reveal the place of a sensitive species." : null,
    site: visit.site && !place.generalised ? { id: visit.site.id, name: visit.site.name } : null,
    scientificName: visit.beeTaxon?.scientificName ?? BEE_NOT_SURE_LABEL,
    beeTaxonId: visit.beeTaxon?.id ?? null,
    caste: visit.caste,
    beeIdentificationConfidence: visit.beeIdentificationConfidence,
    beeIdentificationVerificationStatus: visit.beeStatus,
    behavior: visit.behavior,
    habitatNotes: visit.habitatNotes,
    plantScientificName: plantName,
    plantTaxonId: visit.plantTaxon?.id ?? null,
    plantIdentificationVerificationStatus: visit.plantStatus,
    associatedTaxa: plantName ? `"visited flowers of":"${plantName}"` : null,
    occurrenceRemarks: visit.occurrenceRemarks,
    photos: photos.map((p) => ({ id: p.id, subject: p.subject, views: p.views, contentType: p.contentType, byteSize: p.byteSize })),
    determinations: determinations.map((d) => ({
      id: d.id,
      subject: d.subject,
      scientificName: d.subject === "plant" ? (d.plantTaxon?.scientificName ?? null) : (d.beeTaxon?.scientificName ?? BEE_NOT_SURE_LABEL),
      caste: d.caste,
      identificationQualifier: d.identificationQualifier,
      identifiedBy: d.identifiedBy.name,
      dateIdentified: d.dateIdentified.toISOString(),
      identificationVerificationStatus: d.status,
      remarks: d.remarks,
    })),
  };
}

export type VisitRecord = ReturnType<typeof toVisitRecord>;
