import type { EntityManager } from "@mikro-orm/postgresql";
import { BeeTaxon, PlantTaxon } from "../entities/index.ts";
import type { BeeTaxonRecord, PlantTaxonRecord } from "./taxon-record.ts";

export function toPlantTaxonRecord(taxon: PlantTaxon): PlantTaxonRecord {
  return {
    id: taxon.id,
    scientificName: taxon.scientificName,
    scientificNameAuthorship: taxon.scientificNameAuthorship,
    family: taxon.family,
    genus: taxon.genus,
    taxonRank: taxon.taxonRank,
    vernacularNames: taxon.vernacularNames,
    synonyms: taxon.synonyms,
    regionalStatus: taxon.regionalStatus,
    establishmentMeans: taxon.regionalStatus === "native" ? "native" : "introduced",
    degreeOfEstablishment: taxon.regionalStatus === "invasive" ? "invasive" : null,
    growthForm: taxon.growthForm,
    bloomStart: taxon.bloomStart,
    bloomEnd: taxon.bloomEnd,
    sourceNote: taxon.sourceNote,
  };
}

export function toBeeTaxonRecord(taxon: BeeTaxon): BeeTaxonRecord {
  return {
    id: taxon.id,
    scientificName: taxon.scientificName,
    scientificNameAuthorship: taxon.scientificNameAuthorship,
    subgenus: taxon.subgenus,
    vernacularNames: taxon.vernacularNames,
    sensitive: taxon.sensitive,
    sensitivityNote: taxon.sensitivityNote,
  };
}

/** The whole plant checklist in alphabetical order of scientific name. */
export async function listPlantTaxa(em: EntityManager): Promise<PlantTaxonRecord[]> {
  const taxa = await em.find(PlantTaxon, {}, { orderBy: { scientificName: "asc" } });
  return taxa.map(toPlantTaxonRecord);
}

export async function findPlantTaxon(em: EntityManager, id: number): Promise<PlantTaxonRecord | null> {
  const taxon = await em.findOne(PlantTaxon, { id });
  return taxon ? toPlantTaxonRecord(taxon) : null;
}

export async function listBeeTaxa(em: EntityManager): Promise<BeeTaxonRecord[]> {
  const taxa = await em.find(BeeTaxon, {}, { orderBy: { scientificName: "asc" } });
  return taxa.map(toBeeTaxonRecord);
}
