import type { Determination, Photo, Visit } from "../entities/index.ts";
import { BEE_NOT_SURE_LABEL } from "./vocabulary.ts";

/**
 * A visit as the JSON API and the visit page show it, with Darwin Core names where the
 * standard has them. `associatedTaxa` uses the term's recommended "relationship":"name" form.
 */
export function toVisitRecord(visit: Visit, photos: Photo[], determinations: Determination[]) {
  const plantName = visit.plantTaxon?.scientificName ?? null;
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
    decimalLatitude: visit.decimalLatitude,
    decimalLongitude: visit.decimalLongitude,
    geodeticDatum: "EPSG:4326",
    coordinateUncertaintyInMeters: visit.coordinateUncertaintyInMeters,
    site: visit.site ? { id: visit.site.id, name: visit.site.name } : null,
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
