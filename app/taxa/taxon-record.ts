import type { GrowthForm, RegionalStatus, TaxonRank } from "./checklist-schema";

/**
 * A plant taxon as pages and the JSON API show it. Field names follow Darwin Core where it
 * has a term: establishmentMeans (native / introduced) and degreeOfEstablishment (invasive)
 * say what our single regionalStatus says, for tools that read the standard.
 */
export interface PlantTaxonRecord {
  id: number;
  scientificName: string;
  scientificNameAuthorship: string;
  family: string;
  genus: string;
  taxonRank: TaxonRank;
  vernacularNames: string[];
  synonyms: string[];
  regionalStatus: RegionalStatus;
  establishmentMeans: "native" | "introduced";
  degreeOfEstablishment: "invasive" | null;
  growthForm: GrowthForm;
  bloomStart: number;
  bloomEnd: number;
  sourceNote: string;
}

export interface BeeTaxonRecord {
  id: number;
  scientificName: string;
  scientificNameAuthorship: string;
  subgenus: string;
  vernacularNames: string[];
  sensitive: boolean;
  sensitivityNote: string;
}

export const REGIONAL_STATUS_LABELS: Record<RegionalStatus, string> = {
  native: "Native",
  introduced: "Introduced",
  invasive: "Invasive",
};
