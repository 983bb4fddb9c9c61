import type { Band } from "../forage/seasons.ts";
import type { StockAvailability, StockForm } from "../planting/vocabulary.ts";
import type { RegionalStatus } from "../taxa/checklist-schema.ts";

/**
 * Stock entries, import previews and the "what to grow" view as the pages and the JSON API
 * receive them. Pure module: the server fills these, the browser draws them.
 */

export interface StockTaxon {
  id: number;
  scientificName: string;
  vernacularName: string | null;
  family: string;
  regionalStatus: RegionalStatus;
  bloomStart: number;
  bloomEnd: number;
}

export interface StockListEntry {
  id: number;
  taxon: StockTaxon;
  form: StockForm;
  sourceRegion: string;
  availability: StockAvailability;
  availabilityNote: string;
  grownWithoutSystemicInsecticides: boolean;
  updatedAt: string;
}

export interface PlantSuggestion {
  scientificName: string;
  vernacularName: string | null;
}

export interface StockImportProblem {
  /** The file's line (1 is the header); 0 when the problem is the file as a whole. */
  line: number;
  column?: string;
  reason: string;
  /** For a name not on the checklist: the closest names that are. */
  suggestions?: PlantSuggestion[];
}

export type StockChangeField = "sourceRegion" | "availability" | "availabilityNote" | "grownWithoutSystemicInsecticides";

export interface StockImportRow {
  line: number;
  taxonId: number;
  /** The checklist's accepted name (the file may have used a synonym, see `givenName`). */
  scientificName: string;
  givenName: string;
  form: StockForm;
  availability: StockAvailability;
  grownWithoutSystemicInsecticides: boolean;
  status: "new" | "changed" | "unchanged";
  changes: StockChangeField[];
}

export interface StockImportPreview {
  rows: StockImportRow[];
  problems: StockImportProblem[];
  counts: { new: number; changed: number; unchanged: number; problems: number };
}

export interface WhatToGrowSpecies extends StockTaxon {
  reason: string;
  stocked: boolean;
  /** The forms this nursery offers it in, plugs first. */
  forms: StockForm[];
}

export interface WhatToGrowBand {
  band: Band;
  earlySpringMonths: number[];
  species: WhatToGrowSpecies[];
  stockedCount: number;
  /** Season months the checklist cannot fill, with the reason. */
  unmet: { month: number; why: string }[];
}

/** The words for a stock entry's declaration, the same on the page, in the table and in exports. */
export const DECLARATION_LABEL = "Grown without systemic insecticides such as neonicotinoids";
