// Visits as Darwin Core occurrences, for the CSV download and the Darwin Core Archive. Pure
// module: it builds rows, lines and the archive's two XML files from plain objects; the database
// side is app/exchange/export.server.ts.
//
// One visit is one occurrence: the bee, seen once, at one time and place. The flower it was on
// is named twice, as the core's associatedTaxa ("relationship":"name", the form the term's
// definition recommends) and as a ResourceRelationship row whose relationship is the Relations
// Ontology's "visits flowers of" (RO_0002622), which machines can follow without parsing text.
//
// The identification terms of the core (identifiedBy, dateIdentified,
// identificationVerificationStatus, identificationQualifier) describe the bee, because in
// Darwin Core they belong to the occurrence's own taxon, the scientificName. The plant's
// determination belongs to the relationship ("according to" whom, established when, with what
// status), so it goes into the ResourceRelationship row.

import { csvField } from "../forage/csv.ts";
import type { Behavior, Caste, DeterminationStatus } from "../visits/vocabulary.ts";
import { locationFor, type LocationViewer } from "./generalise.ts";

export const DWC_NAMESPACE = "http://rs.tdwg.org/dwc/terms/";
export const dwcIri = (term: string) => `${DWC_NAMESPACE}${term}`;

export const OCCURRENCE_ROW_TYPE = dwcIri("Occurrence");
export const RESOURCE_RELATIONSHIP_ROW_TYPE = dwcIri("ResourceRelationship");

/** "visits flowers of", Relations Ontology (OBO); its inverse is RO_0002623 "has flowers visited by". */
export const VISITS_FLOWERS_OF = { label: "visits flowers of", iri: "http://purl.obolibrary.org/obo/RO_0002622" } as const;

/** The columns of occurrence.txt and of the CSV, in file order. The first is the core's id. */
export const OCCURRENCE_TERMS = [
  "occurrenceID",
  "basisOfRecord",
  "occurrenceStatus",
  "individualCount",
  "datasetName",
  "recordedBy",
  "eventDate",
  "countryCode",
  "locality",
  "decimalLatitude",
  "decimalLongitude",
  "geodeticDatum",
  "coordinateUncertaintyInMeters",
  "dataGeneralizations",
  "informationWithheld",
  "kingdom",
  "genus",
  "scientificName",
  "scientificNameAuthorship",
  "taxonRank",
  "identificationQualifier",
  "identifiedBy",
  "dateIdentified",
  "identificationVerificationStatus",
  "sex",
  "lifeStage",
  "caste",
  "behavior",
  "associatedTaxa",
] as const;
export type OccurrenceTerm = (typeof OCCURRENCE_TERMS)[number];

/** The columns of resourcerelationship.txt. The first is the core id: the visit's occurrenceID. */
export const RELATIONSHIP_TERMS = [
  "resourceID",
  "resourceRelationshipID",
  "relationshipOfResourceID",
  "relationshipOfResource",
  "relatedResourceID",
  "relationshipAccordingTo",
  "relationshipEstablishedDate",
  "relationshipRemarks",
] as const;
export type RelationshipTerm = (typeof RELATIONSHIP_TERMS)[number];

export type Cell = string | number | null;
export type OccurrenceRow = Record<OccurrenceTerm, Cell>;
export type RelationshipRow = Record<RelationshipTerm, Cell>;

/** Who identified a subject of the visit last, and how that stands. */
export interface LatestDetermination {
  identifiedBy: string;
  dateIdentified: Date;
  status: DeterminationStatus;
  identificationQualifier: string;
}

/** What a visit must tell for its occurrence row: the visit, its names and its latest determinations. */
export interface ExportVisit {
  id: number;
  recorderId: number;
  recorderName: string;
  eventDate: Date;
  /** IANA time zone where the bee was seen ("" when the client did not say). */
  eventTimeZone: string;
  decimalLatitude: number;
  decimalLongitude: number;
  coordinateUncertaintyInMeters: number | null;
  siteName: string | null;
  /** ISO 3166-2 code of the site's region, e.g. US-WI. */
  siteRegionCode: string | null;
  /** null: the bee is "Bombus sp." — the genus only. */
  beeScientificName: string | null;
  beeScientificNameAuthorship: string | null;
  caste: Caste;
  behavior: Behavior;
  beeStatus: DeterminationStatus;
  plantTaxonId: number | null;
  plantScientificName: string | null;
  plantStatus: DeterminationStatus;
  beeDetermination: LatestDetermination | null;
  plantDetermination: LatestDetermination | null;
  /** The bee, now or in any earlier determination, is flagged sensitive. */
  sensitive: boolean;
}

export const occurrenceIdOf = (visitId: number) => `visitwort:visit:${visitId}`;

// Darwin Core's behavior is free text ("foraging", "roosting"); our stored values are codes.
const BEHAVIOR_TEXT: Record<Behavior, string | null> = {
  nectar_foraging: "foraging for nectar",
  pollen_collecting: "collecting pollen",
  nest_searching: "searching for a nest site",
  resting: "resting",
  // "Something else" says nothing a reader could use.
  other: null,
};

// Bumble-bee queens and workers are female, males male (from memory; textbook biology).
const SEX_OF_CASTE: Record<Caste, string | null> = { queen: "female", worker: "female", male: "male", unknown: null };

const wallClockFormats = new Map<string, Intl.DateTimeFormat | null>();

function wallClockFormat(timeZone: string): Intl.DateTimeFormat | null {
  if (!wallClockFormats.has(timeZone)) {
    let format: Intl.DateTimeFormat | null = null;
    try {
      format = new Intl.DateTimeFormat("en-US", {
        timeZone,
        hourCycle: "h23",
        year: "numeric",
        month: "2-digit",
        day: "2-digit",
        hour: "2-digit",
        minute: "2-digit",
        second: "2-digit",
      });
    } catch {
      // A zone this runtime does not know: the instant is still exact in UTC.
    }
    wallClockFormats.set(timeZone, format);
  }
  return wallClockFormats.get(timeZone)!;
}

const pad = (n: number, width = 2) => String(Math.abs(n)).padStart(width, "0");

/**
 * ISO 8601 with the offset of the place, e.g. 2025-05-03T09:10:00-05:00: the wall time where the
 * bee was seen, as the recorder entered it. Without a known zone, the same instant in UTC ("Z").
 */
export function eventDateWithOffset(instant: Date, timeZone: string): string {
  const utc = instant.toISOString().replace(/\.\d{3}Z$/, "Z");
  const format = timeZone ? wallClockFormat(timeZone) : null;
  if (!format) return utc;
  const part = Object.fromEntries(format.formatToParts(instant).map((p) => [p.type, p.value]));
  const [year, month, day, hour, minute, second] = ["year", "month", "day", "hour", "minute", "second"].map((k) => Number(part[k]));
  const wall = Date.UTC(year!, month! - 1, day!, hour!, minute!, second!);
  const offsetMinutes = Math.round((wall - Math.floor(instant.getTime() / 1000) * 1000) / 60_000);
  const sign = offsetMinutes < 0 ? "-" : "+";
  return `${pad(year!, 4)}-${pad(month!)}-${pad(day!)}T${pad(hour!)}:${pad(minute!)}:${pad(second!)}${sign}${pad(Math.trunc(offsetMinutes / 60))}:${pad(offsetMinutes % 60)}`;
}

const isoInstant = (date: Date) => date.toISOString().replace(/\.\d{3}Z$/, "Z");

/** "US" from "US-WI"; nothing from a code that does not start with a two-letter country. */
const countryOf = (regionCode: string | null) => (regionCode && /^[A-Z]{2}(-|$)/.test(regionCode) ? regionCode.slice(0, 2) : null);

/**
 * The occurrence row this viewer may have. A sensitive visit's place goes through `locationFor`,
 * the one rule for sensitive species: exact for coordinators and the visit's own recorder, the
 * centre of its 0.1° cell for everyone else, in which case the site's name is withheld too.
 */
export function occurrenceRow(visit: ExportVisit, viewer: LocationViewer, datasetName: string): OccurrenceRow {
  const place = locationFor(viewer, {
    recorderId: visit.recorderId,
    sensitive: visit.sensitive,
    decimalLatitude: visit.decimalLatitude,
    decimalLongitude: visit.decimalLongitude,
    coordinateUncertaintyInMeters: visit.coordinateUncertaintyInMeters,
  });
  const withheld = place.generalised
    ? ["Exact coordinates withheld to protect a sensitive species; the programme's coordinators hold them.", visit.siteName ? "Site name withheld: it would reveal the place." : ""]
        .filter(Boolean)
        .join(" ")
    : null;
  const bee = visit.beeDetermination;
  const qualifier = bee?.identificationQualifier;
  return {
    occurrenceID: occurrenceIdOf(visit.id),
    basisOfRecord: "HumanObservation",
    occurrenceStatus: "present",
    individualCount: 1,
    datasetName,
    recordedBy: visit.recorderName,
    eventDate: eventDateWithOffset(visit.eventDate, visit.eventTimeZone),
    countryCode: countryOf(visit.siteRegionCode),
    locality: place.generalised ? null : visit.siteName,
    decimalLatitude: place.decimalLatitude,
    decimalLongitude: place.decimalLongitude,
    geodeticDatum: "EPSG:4326",
    coordinateUncertaintyInMeters: place.coordinateUncertaintyInMeters,
    dataGeneralizations: place.dataGeneralizations,
    informationWithheld: withheld,
    kingdom: "Animalia",
    genus: (visit.beeScientificName ?? "Bombus").split(" ")[0]!,
    // Darwin Core's scientificName carries no qualifier: an unsure bee is the genus, at genus rank.
    scientificName: visit.beeScientificName ?? "Bombus",
    scientificNameAuthorship: visit.beeScientificName ? visit.beeScientificNameAuthorship || null : null,
    taxonRank: visit.beeScientificName ? "species" : "genus",
    // "sp." only repeats the genus rank; cf. and aff. are the determiner's doubts, which the term is for.
    identificationQualifier: qualifier === "cf." || qualifier === "aff." ? qualifier : null,
    identifiedBy: bee?.identifiedBy ?? null,
    dateIdentified: bee ? isoInstant(bee.dateIdentified) : null,
    identificationVerificationStatus: bee?.status ?? visit.beeStatus,
    sex: SEX_OF_CASTE[visit.caste],
    // Only adults visit flowers.
    lifeStage: "adult",
    caste: visit.caste === "unknown" ? null : visit.caste,
    behavior: BEHAVIOR_TEXT[visit.behavior],
    associatedTaxa: visit.plantScientificName ? `"visited flowers of":"${visit.plantScientificName}"` : null,
  };
}

/**
 * The visit's bee–flower relationship, or null when the plant was not identified. relatedResourceID
 * is the plant's accepted scientific name on our checklist: Visitwort's own taxon number would
 * mean nothing to whoever reads the archive, and the name is what associatedTaxa gives too.
 */
export function relationshipRow(visit: ExportVisit): RelationshipRow | null {
  if (!visit.plantScientificName) return null;
  const plant = visit.plantDetermination;
  const status = plant?.status ?? visit.plantStatus;
  return {
    resourceID: occurrenceIdOf(visit.id),
    resourceRelationshipID: `${occurrenceIdOf(visit.id)}:visits-flowers-of`,
    relationshipOfResourceID: VISITS_FLOWERS_OF.iri,
    relationshipOfResource: VISITS_FLOWERS_OF.label,
    relatedResourceID: visit.plantScientificName,
    relationshipAccordingTo: plant?.identifiedBy ?? null,
    relationshipEstablishedDate: plant ? isoInstant(plant.dateIdentified) : null,
    relationshipRemarks: [
      `Plant determination: ${status.replace(/_/g, " ")}`,
      plant?.identificationQualifier ? `qualifier ${plant.identificationQualifier}` : "",
      visit.plantTaxonId !== null ? `Visitwort checklist taxon ${visit.plantTaxonId}` : "",
    ]
      .filter(Boolean)
      .join("; "),
  };
}

/**
 * A field of a tab-separated file. The archive declares no quoting, so a tab or line break inside
 * a value would split the row: each run of them becomes one space (common practice, no source).
 */
export function tsvField(value: Cell): string {
  if (value === null) return "";
  const text = typeof value === "number" ? (Number.isFinite(value) ? String(value) : "") : value;
  return text.replace(/[\t\r\n]+/g, " ");
}

export const tsvLine = (cells: readonly Cell[]) => cells.map(tsvField).join("\t") + "\n";
export const csvLine = (cells: readonly Cell[]) => cells.map((c) => csvField(c)).join(",") + "\r\n";

export const valuesOf = <T extends string>(terms: readonly T[], row: Record<T, Cell>): Cell[] => terms.map((t) => row[t]);

const escapeXml = (text: string) =>
  text.replace(/[<>&"']/g, (c) => ({ "<": "&lt;", ">": "&gt;", "&": "&amp;", '"': "&quot;", "'": "&apos;" })[c]!);

export const ARCHIVE_FILES = {
  meta: "meta.xml",
  eml: "eml.xml",
  occurrence: "occurrence.txt",
  relationship: "resourcerelationship.txt",
} as const;

function fileElement(tag: "core" | "extension", rowType: string, location: string, idTag: "id" | "coreid", terms: readonly string[]): string {
  // The Darwin Core text guide's attributes: tab-separated, one header line, no quoting.
  const fields = terms.map((term, index) => `    <field index="${index}" term="${dwcIri(term)}"/>`).join("\n");
  return [
    `  <${tag} encoding="UTF-8" fieldsTerminatedBy="\\t" linesTerminatedBy="\\n" fieldsEnclosedBy="" ignoreHeaderLines="1" rowType="${rowType}">`,
    `    <files><location>${location}</location></files>`,
    `    <${idTag} index="0"/>`,
    fields,
    `  </${tag}>`,
  ].join("\n");
}

/** meta.xml: which file holds what, and each column's Darwin Core term, in the files' exact order. */
export function metaXml(): string {
  return [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<archive xmlns="http://rs.tdwg.org/dwc/text/" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" xsi:schemaLocation="http://rs.tdwg.org/dwc/text/ http://rs.tdwg.org/dwc/text/tdwg_dwc_text.xsd" metadata="${ARCHIVE_FILES.eml}">`,
    fileElement("core", OCCURRENCE_ROW_TYPE, ARCHIVE_FILES.occurrence, "id", OCCURRENCE_TERMS),
    fileElement("extension", RESOURCE_RELATIONSHIP_ROW_TYPE, ARCHIVE_FILES.relationship, "coreid", RELATIONSHIP_TERMS),
    `</archive>`,
    "",
  ].join("\n");
}

export interface DatasetDescription {
  /** The programme that publishes the data, as an organisation. */
  programmeName: string;
  /** When the archive was made; its date is the pubDate. */
  publishedAt: Date;
  /** What was selected, in words, e.g. "caste: queen; month: May". Empty: every visit. */
  selection: string;
  occurrences: number;
  relationships: number;
  /** Sensitive species' places were generalised in this copy. */
  generalised: boolean;
}

/**
 * eml.xml: the dataset's description in Ecological Metadata Language 2.1.1, the smallest valid
 * document that says what, by whom and when (element order from the EML 2.1.1 schema, from memory).
 * The licence is left for the programme to choose before it publishes anywhere.
 */
export function emlXml(dataset: DatasetDescription): string {
  const day = dataset.publishedAt.toISOString().slice(0, 10);
  const organisation = `<organizationName>${escapeXml(dataset.programmeName)}</organizationName>`;
  const abstract = [
    `Flower visits by bumble bees (Bombus) recorded by the volunteers of ${dataset.programmeName}: each occurrence is one bee seen on one flower at one time and place, with its caste and behaviour; the flower is given in associatedTaxa and as a "visits flowers of" relationship (Relations Ontology RO_0002622).`,
    `This copy holds ${dataset.occurrences} ${dataset.occurrences === 1 ? "occurrence" : "occurrences"} and ${dataset.relationships} ${dataset.relationships === 1 ? "relationship" : "relationships"}, exported on ${day}${dataset.selection ? `, selected by ${dataset.selection}` : ""}.`,
    dataset.generalised
      ? "Places of sensitive species are generalised to the centre of a 0.1° grid cell, with coordinateUncertaintyInMeters enlarged to cover the cell, following Chapman (2020), Current Best Practices for Generalizing Sensitive Species Occurrence Data, GBIF Secretariat; dataGeneralizations says so on each such record."
      : "Coordinates are exact, including those of sensitive species: this copy is for the programme's coordinators and must not be published as it is.",
  ];
  return [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<eml:eml xmlns:eml="eml://ecoinformatics.org/eml-2.1.1" packageId="visitwort-occurrences-${day}" system="visitwort" xml:lang="en">`,
    `  <dataset>`,
    `    <title xml:lang="en">${escapeXml(`${dataset.programmeName}: bumble-bee flower visits`)}</title>`,
    `    <creator>${organisation}</creator>`,
    `    <pubDate>${day}</pubDate>`,
    `    <language>en</language>`,
    `    <abstract>`,
    ...abstract.map((para) => `      <para>${escapeXml(para)}</para>`),
    `    </abstract>`,
    `    <intellectualRights>`,
    `      <para>${escapeXml(`Not yet licensed. ${dataset.programmeName} chooses a licence (for example CC0 1.0 or CC BY 4.0) before publishing these data; until then, ask the programme before reusing them.`)}</para>`,
    `    </intellectualRights>`,
    `    <contact>${organisation}</contact>`,
    `  </dataset>`,
    `</eml:eml>`,
    "",
  ].join("\n");
}
