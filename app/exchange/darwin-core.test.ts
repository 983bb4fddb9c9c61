import { describe, expect, it } from "vitest";
import {
  csvLine,
  emlXml,
  eventDateWithOffset,
  metaXml,
  OCCURRENCE_TERMS,
  occurrenceRow,
  RELATIONSHIP_TERMS,
  relationshipRow,
  tsvField,
  tsvLine,
  valuesOf,
  type ExportVisit,
} from "./darwin-core";

// The Darwin Core terms this export may use. Taken from REFERENCES.md, section "Darwin Core",
// and completed from the TDWG Darwin Core term list (http://rs.tdwg.org/dwc/terms/) from memory:
// occurrenceStatus, individualCount, datasetName, countryCode, locality, kingdom, genus,
// scientificNameAuthorship and the ResourceRelationship terms other than those REFERENCES.md names.
const DWC_TERMS = new Set(
  [
    // classes
    "Occurrence",
    "ResourceRelationship",
    // REFERENCES.md "Darwin Core"
    "occurrenceID",
    "basisOfRecord",
    "eventDate",
    "decimalLatitude",
    "decimalLongitude",
    "geodeticDatum",
    "coordinateUncertaintyInMeters",
    "scientificName",
    "taxonRank",
    "caste",
    "sex",
    "lifeStage",
    "behavior",
    "associatedTaxa",
    "identifiedBy",
    "dateIdentified",
    "identificationQualifier",
    "identificationVerificationStatus",
    "establishmentMeans",
    "degreeOfEstablishment",
    "dataGeneralizations",
    "informationWithheld",
    "recordedBy",
    "resourceID",
    "relatedResourceID",
    "relationshipOfResource",
    "relationshipOfResourceID",
    // TDWG term list, from memory
    "occurrenceStatus",
    "individualCount",
    "datasetName",
    "countryCode",
    "locality",
    "kingdom",
    "genus",
    "scientificNameAuthorship",
    "resourceRelationshipID",
    "relationshipAccordingTo",
    "relationshipEstablishedDate",
    "relationshipRemarks",
  ].map((term) => `http://rs.tdwg.org/dwc/terms/${term}`),
);

const affinis: ExportVisit = {
  id: 41,
  recorderId: 7,
  recorderName: "Odile Fenwick",
  // 09:10 in Chicago in May is 14:10 UTC (CDT, UTC−5).
  eventDate: new Date("2025-05-03T14:10:00Z"),
  eventTimeZone: "America/Chicago",
  decimalLatitude: 43.07342,
  decimalLongitude: -89.40121,
  coordinateUncertaintyInMeters: 12,
  siteName: "Hidden fen",
  siteRegionCode: "US-WI",
  beeScientificName: "Bombus affinis",
  beeScientificNameAuthorship: "Cresson 1863",
  caste: "queen",
  behavior: "nectar_foraging",
  beeStatus: "confirmed",
  plantTaxonId: 12,
  plantScientificName: "Salix discolor",
  plantStatus: "corrected",
  beeDetermination: { identifiedBy: "Tamsin Bracken", dateIdentified: new Date("2025-05-10T08:00:00Z"), status: "confirmed", identificationQualifier: "" },
  plantDetermination: { identifiedBy: "Sorrel Pike", dateIdentified: new Date("2025-05-12T10:30:00Z"), status: "corrected", identificationQualifier: "cf." },
  sensitive: true,
};

const coordinator = { id: 1, roles: ["coordinator"] };
const planner = { id: 2, roles: ["planner"] };

/** The attributes of each <field>, <id> and <coreid> of one file element of meta.xml, in document order. */
function fileElement(xml: string, tag: "core" | "extension") {
  const block = new RegExp(`<${tag} ([^>]*)>([\\s\\S]*?)</${tag}>`).exec(xml);
  if (!block) throw new Error(`no <${tag}>`);
  const attributes = Object.fromEntries([...block[1]!.matchAll(/(\w+)="([^"]*)"/g)].map((m) => [m[1], m[2]]));
  const fields = [...block[2]!.matchAll(/<field index="(\d+)" term="([^"]+)"\/>/g)].map((m) => ({ index: Number(m[1]), term: m[2]! }));
  const id = /<(id|coreid) index="(\d+)"\/>/.exec(block[2]!);
  const location = /<location>([^<]+)<\/location>/.exec(block[2]!)?.[1];
  return { attributes, fields, id: id ? { tag: id[1], index: Number(id[2]) } : null, location };
}

/** Every start tag has its end tag, properly nested (common practice, no source: a well-formedness smoke check). */
function tagsBalance(xml: string): boolean {
  const stack: string[] = [];
  for (const m of xml.replace(/<\?[^>]*\?>/g, "").matchAll(/<(\/?)([\w:]+)[^>]*?(\/?)>/g)) {
    if (m[3]) continue;
    if (!m[1]) stack.push(m[2]!);
    else if (stack.pop() !== m[2]) return false;
  }
  return stack.length === 0;
}

describe("meta.xml", () => {
  const xml = metaXml();
  const core = fileElement(xml, "core");
  const extension = fileElement(xml, "extension");

  it("uses only Darwin Core terms, by their IRIs", () => {
    // REFERENCES.md "Darwin Core": term IRIs are http://rs.tdwg.org/dwc/terms/<term>; rowType is a URI.
    const iris = [...xml.matchAll(/(?:term|rowType)="([^"]+)"/g)].map((m) => m[1]!);
    expect(iris.length).toBe(OCCURRENCE_TERMS.length + RELATIONSHIP_TERMS.length + 2);
    for (const iri of iris) expect(DWC_TERMS, iri).toContain(iri);
  });

  it("has one core of occurrences with an id, and one ResourceRelationship extension with a coreid", () => {
    // REFERENCES.md "Darwin Core": exactly one <core>; with extensions the core has <id> and each extension <coreid>.
    expect(xml.match(/<core /g)).toHaveLength(1);
    expect(xml.match(/<extension /g)).toHaveLength(1);
    expect(core.attributes.rowType).toBe("http://rs.tdwg.org/dwc/terms/Occurrence");
    expect(extension.attributes.rowType).toBe("http://rs.tdwg.org/dwc/terms/ResourceRelationship");
    expect(core.id).toEqual({ tag: "id", index: 0 });
    expect(extension.id).toEqual({ tag: "coreid", index: 0 });
    expect(xml).toMatch(/<archive xmlns="http:\/\/rs\.tdwg\.org\/dwc\/text\/"[^>]* metadata="eml\.xml">/);
    expect(tagsBalance(xml)).toBe(true);
  });

  it("declares tab-separated UTF-8 files with one header line and no quoting", () => {
    // Darwin Core text guide (TDWG), attributes of <core> and <extension>, from memory: "\t" and "\n" are written escaped.
    for (const file of [core, extension]) {
      expect(file.attributes).toMatchObject({ encoding: "UTF-8", fieldsTerminatedBy: "\\t", linesTerminatedBy: "\\n", fieldsEnclosedBy: "", ignoreHeaderLines: "1" });
    }
    expect(core.location).toBe("occurrence.txt");
    expect(extension.location).toBe("resourcerelationship.txt");
  });

  it("numbers the columns in the order of the files' header lines", () => {
    // Darwin Core text guide: a field's index is its column, counted from 0 (common practice of archive readers).
    const coreHeader = tsvLine(OCCURRENCE_TERMS).trimEnd().split("\t");
    expect(core.fields.map((f) => f.index)).toEqual(coreHeader.map((_, i) => i));
    expect(core.fields.map((f) => f.term)).toEqual(coreHeader.map((term) => `http://rs.tdwg.org/dwc/terms/${term}`));
    const extensionHeader = tsvLine(RELATIONSHIP_TERMS).trimEnd().split("\t");
    expect(extension.fields.map((f) => f.term)).toEqual(extensionHeader.map((term) => `http://rs.tdwg.org/dwc/terms/${term}`));
    // The id columns: the occurrence's own id, and in the extension the same value (resourceID).
    expect(coreHeader[0]).toBe("occurrenceID");
    expect(extensionHeader[0]).toBe("resourceID");
  });
});

describe("an occurrence row", () => {
  it("is exact for a coordinator", () => {
    const row = occurrenceRow(affinis, coordinator, "Two Rivers");
    expect(row).toMatchObject({
      // REFERENCES.md "Darwin Core": HumanObservation, EPSG:4326, ISO 8601 eventDate, term values.
      occurrenceID: "visitwort:visit:41",
      basisOfRecord: "HumanObservation",
      eventDate: "2025-05-03T09:10:00-05:00",
      decimalLatitude: 43.07342,
      decimalLongitude: -89.40121,
      geodeticDatum: "EPSG:4326",
      coordinateUncertaintyInMeters: 12,
      locality: "Hidden fen",
      countryCode: "US",
      dataGeneralizations: null,
      informationWithheld: null,
      scientificName: "Bombus affinis",
      scientificNameAuthorship: "Cresson 1863",
      taxonRank: "species",
      caste: "queen",
      sex: "female",
      recordedBy: "Odile Fenwick",
      identifiedBy: "Tamsin Bracken",
      dateIdentified: "2025-05-10T08:00:00Z",
      identificationVerificationStatus: "confirmed",
      // REFERENCES.md "Darwin Core": associatedTaxa's recommended form "visited flowers of":"Zizia aurea".
      associatedTaxa: '"visited flowers of":"Salix discolor"',
    });
  });

  it("is the centre of its 0.1° cell for a planner, saying so, without the site's name", () => {
    // Chapman 2020 (REFERENCES.md "Sensitive species locations"), Table 7: 0.1° for highly
    // sensitive species; record it in dataGeneralizations / informationWithheld.
    const row = occurrenceRow(affinis, planner, "Two Rivers");
    expect(row).toMatchObject({ decimalLatitude: 43.05, decimalLongitude: -89.45, locality: null });
    expect(row.coordinateUncertaintyInMeters).toBeGreaterThan(6890);
    expect(row.dataGeneralizations).toMatch(/0\.1° grid cell/);
    expect(row.informationWithheld).toMatch(/Site name withheld/);
    expect(JSON.stringify(row)).not.toContain("43.07342");
    expect(JSON.stringify(row)).not.toContain("Hidden fen");
  });

  it("is exact for a planner who recorded the visit, as locationFor says", () => {
    const row = occurrenceRow(affinis, { id: affinis.recorderId, roles: ["planner", "recorder"] }, "Two Rivers");
    expect(row).toMatchObject({ decimalLatitude: 43.07342, locality: "Hidden fen", dataGeneralizations: null });
  });

  it("names an unsure bee by its genus, at genus rank, without a qualifier in the name", () => {
    // REFERENCES.md "Darwin Core": scientificName carries no qualifiers.
    const row = occurrenceRow({ ...affinis, beeScientificName: null, beeScientificNameAuthorship: null, sensitive: false, caste: "unknown", behavior: "other" }, planner, "Two Rivers");
    expect(row).toMatchObject({ scientificName: "Bombus", taxonRank: "genus", genus: "Bombus", scientificNameAuthorship: null, caste: null, sex: null, behavior: null });
  });

  it("leaves associatedTaxa empty when the plant was not identified, and makes no relationship", () => {
    const visit = { ...affinis, plantScientificName: null, plantTaxonId: null, plantDetermination: null };
    expect(occurrenceRow(visit, coordinator, "x").associatedTaxa).toBeNull();
    expect(relationshipRow(visit)).toBeNull();
  });
});

describe("eventDate", () => {
  it("gives the wall time where the bee was seen, with that place's offset", () => {
    // ISO 8601 with offset (REFERENCES.md "Darwin Core"); US Central time is UTC−5 in summer, UTC−6 in winter (from memory).
    expect(eventDateWithOffset(new Date("2025-05-03T14:10:00Z"), "America/Chicago")).toBe("2025-05-03T09:10:00-05:00");
    expect(eventDateWithOffset(new Date("2025-01-03T15:10:00Z"), "America/Chicago")).toBe("2025-01-03T09:10:00-06:00");
    expect(eventDateWithOffset(new Date("2025-07-01T02:30:00Z"), "America/Detroit")).toBe("2025-06-30T22:30:00-04:00");
    // India is UTC+5:30 (from memory): half hours survive.
    expect(eventDateWithOffset(new Date("2025-07-01T02:30:00Z"), "Asia/Kolkata")).toBe("2025-07-01T08:00:00+05:30");
  });

  it("falls back to UTC when the zone is unknown", () => {
    expect(eventDateWithOffset(new Date("2025-05-03T14:10:00Z"), "")).toBe("2025-05-03T14:10:00Z");
    expect(eventDateWithOffset(new Date("2025-05-03T14:10:00Z"), "Not/AZone")).toBe("2025-05-03T14:10:00Z");
  });
});

describe("a relationship row", () => {
  it("says the bee visits flowers of the plant, by the Relations Ontology", () => {
    // REFERENCES.md "Relations Ontology": RO_0002622 "visits flowers of", IRI http://purl.obolibrary.org/obo/RO_0002622.
    expect(relationshipRow(affinis)).toEqual({
      resourceID: "visitwort:visit:41",
      resourceRelationshipID: "visitwort:visit:41:visits-flowers-of",
      relationshipOfResourceID: "http://purl.obolibrary.org/obo/RO_0002622",
      relationshipOfResource: "visits flowers of",
      relatedResourceID: "Salix discolor",
      relationshipAccordingTo: "Sorrel Pike",
      relationshipEstablishedDate: "2025-05-12T10:30:00Z",
      relationshipRemarks: "Plant determination: corrected; qualifier cf.; Visitwort checklist taxon 12",
    });
  });
});

describe("tab-separated fields", () => {
  it("turn tabs and line breaks inside a value into spaces, so a row stays one line of its columns", () => {
    // meta.xml declares fieldsEnclosedBy="" (no quoting), so nothing else could protect them (common practice, no source).
    expect(tsvField("Fen\tnorth\r\nside")).toBe("Fen north side");
    expect(tsvField(null)).toBe("");
    expect(tsvField(-89.45)).toBe("-89.45");
    const line = tsvLine(valuesOf(OCCURRENCE_TERMS, occurrenceRow({ ...affinis, siteName: "Tab\there\nand there", recorderName: "A\tB" }, coordinator, "P")));
    expect(line.endsWith("\n")).toBe(true);
    expect(line.slice(0, -1)).not.toMatch(/[\r\n]/);
    expect(line.split("\t")).toHaveLength(OCCURRENCE_TERMS.length);
    expect(line).toContain("\tTab here and there\t");
  });
});

describe("the CSV", () => {
  it("quotes fields as RFC 4180 asks", () => {
    // RFC 4180 §2.6–2.7: fields with commas, quotes or line breaks are quoted, quotes doubled; records end in CRLF.
    const line = csvLine(valuesOf(OCCURRENCE_TERMS, occurrenceRow({ ...affinis, siteName: 'Fen, "north"' }, coordinator, "P")));
    expect(line).toContain(',"Fen, ""north""",');
    expect(line).toContain(',"""visited flowers of"":""Salix discolor"""\r\n');
    expect(line.endsWith("\r\n")).toBe(true);
  });
});

describe("eml.xml", () => {
  it("names the programme as creator and contact, with the date, an abstract and a rights placeholder", () => {
    // EML 2.1.1 dataset elements title, creator, pubDate, abstract, intellectualRights, contact (from memory).
    const xml = emlXml({ programmeName: "Rivers & Meadows", publishedAt: new Date("2026-12-05T10:00:00Z"), selection: "caste: queen", occurrences: 3, relationships: 2, generalised: true });
    expect(xml).toContain('xmlns:eml="eml://ecoinformatics.org/eml-2.1.1"');
    expect(xml).toContain("<creator><organizationName>Rivers &amp; Meadows</organizationName></creator>");
    expect(xml).toContain("<contact><organizationName>Rivers &amp; Meadows</organizationName></contact>");
    expect(xml).toContain("<pubDate>2026-12-05</pubDate>");
    expect(xml).toMatch(/<abstract>[\s\S]*3 occurrences and 2 relationships[\s\S]*caste: queen[\s\S]*generalised[\s\S]*<\/abstract>/);
    expect(xml).toMatch(/<intellectualRights>\s*<para>Not yet licensed/);
    expect(tagsBalance(xml)).toBe(true);
    // EML 2.1.1 order within <dataset> (from memory).
    const order = ["<title", "<creator>", "<pubDate>", "<language>", "<abstract>", "<intellectualRights>", "<contact>"].map((tag) => xml.indexOf(tag));
    expect(order).toEqual([...order].sort((a, b) => a - b));
  });
});
