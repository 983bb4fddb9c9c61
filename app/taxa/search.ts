import Fuse, { type FuseResultMatch, type IFuseOptions } from "fuse.js";

/** What the search needs of a taxon; works for plants and bees, in the browser and on the server. */
export interface SearchableTaxon {
  id: number;
  scientificName: string;
  vernacularNames: string[];
  synonyms?: string[];
}

export type MatchedField = "scientificName" | "vernacularName" | "synonym";

export interface TaxonHit<T extends SearchableTaxon> {
  taxon: T;
  /** The name that matched, and which kind of name it is (shown so a synonym hit is not puzzling). */
  matchedName: string;
  matchedField: MatchedField;
  /** 0 is an exact match; larger is further away. */
  score: number;
}

const FIELD_OF_KEY: Record<string, MatchedField> = {
  scientificName: "scientificName",
  vernacularNames: "vernacularName",
  synonyms: "synonym",
};

const fuseOptions: IFuseOptions<SearchableTaxon> = {
  keys: [
    { name: "scientificName", weight: 1 },
    { name: "vernacularNames", weight: 1 },
    { name: "synonyms", weight: 0.7 },
  ],
  includeScore: true,
  includeMatches: true,
  // Names are short: where in the name the typo sits should not matter.
  ignoreLocation: true,
  // Lets through a transposed, dropped or doubled letter in a word of five or more letters.
  threshold: 0.4,
  minMatchCharLength: 2,
};

export const normaliseName = (text: string) =>
  text.normalize("NFD").replace(/\p{Diacritic}/gu, "").toLowerCase().replace(/[^a-z0-9×]+/g, " ").trim();

interface NameEntry<T> {
  taxon: T;
  name: string;
  normalised: string;
  field: MatchedField;
}

/**
 * A search index over a checklist. Exact and prefix matches of any name come first (what a
 * person who knows the name expects); fuzzy matches by fuse.js fill the rest, so that a
 * misspelt name still finds its taxon.
 */
export function createTaxonIndex<T extends SearchableTaxon>(taxa: readonly T[]) {
  const fuse = new Fuse<SearchableTaxon>([...taxa], fuseOptions);
  const names: NameEntry<T>[] = taxa.flatMap((taxon) => [
    { taxon, name: taxon.scientificName, normalised: normaliseName(taxon.scientificName), field: "scientificName" as const },
    ...taxon.vernacularNames.map((name) => ({ taxon, name, normalised: normaliseName(name), field: "vernacularName" as const })),
    ...(taxon.synonyms ?? []).map((name) => ({ taxon, name, normalised: normaliseName(name), field: "synonym" as const })),
  ]);

  function literalHits(query: string): TaxonHit<T>[] {
    const best = new Map<number, TaxonHit<T>>();
    for (const entry of names) {
      const position = entry.normalised.indexOf(query);
      if (position === -1) continue;
      const wordStart = position === 0 || entry.normalised[position - 1] === " ";
      // 0 for the whole name, then prefixes, then word starts, then anywhere inside.
      const score = entry.normalised === query ? 0 : position === 0 ? 0.001 : wordStart ? 0.002 : 0.003;
      const previous = best.get(entry.taxon.id);
      if (!previous || score < previous.score) {
        best.set(entry.taxon.id, { taxon: entry.taxon, matchedName: entry.name, matchedField: entry.field, score });
      }
    }
    return [...best.values()];
  }

  function fuzzyHits(query: string): TaxonHit<T>[] {
    return fuse.search(query).map((result) => {
      const match = bestMatch(result.matches);
      return {
        taxon: result.item as T,
        matchedName: match?.value ?? result.item.scientificName,
        matchedField: FIELD_OF_KEY[match?.key ?? "scientificName"] ?? "scientificName",
        // Keep fuzzy scores behind every literal hit.
        score: 0.01 + (result.score ?? 1),
      };
    });
  }

  return {
    size: taxa.length,
    search(rawQuery: string, limit = 20): TaxonHit<T>[] {
      const query = normaliseName(rawQuery);
      if (query.length === 0) return [];
      const hits = new Map<number, TaxonHit<T>>();
      for (const hit of [...literalHits(query), ...(query.length >= 3 ? fuzzyHits(query) : [])]) {
        const previous = hits.get(hit.taxon.id);
        if (!previous || hit.score < previous.score) hits.set(hit.taxon.id, hit);
      }
      return [...hits.values()]
        .sort((a, b) => a.score - b.score || a.taxon.scientificName.localeCompare(b.taxon.scientificName))
        .slice(0, limit);
    },
  };
}

function bestMatch(matches: readonly FuseResultMatch[] | undefined) {
  if (!matches || matches.length === 0) return undefined;
  // The match covering the most characters is the name the person was typing.
  return [...matches].sort((a, b) => covered(b) - covered(a))[0];
}

const covered = (match: FuseResultMatch) => match.indices.reduce((sum, [from, to]) => sum + (to - from + 1), 0);
