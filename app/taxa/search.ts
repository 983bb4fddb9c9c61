import Fuse, { type FuseIndex, type FuseResultMatch, type IFuseOptions } from "fuse.js";

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

/** Exported so that tests and the benchmark can compare with plain fuse.js set up the same way. */
export const taxonFuseOptions: IFuseOptions<SearchableTaxon> = {
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

/**
 * How many taxa fuse.js ranks per query at most. fuse.js costs about the same per name, so this
 * bounds a keystroke's cost whatever the size of the checklist; 300 keeps a 10,000-taxon
 * checklist well under 8 ms per query on a small machine (see "Benchmarks" in DEVELOPERS.md)
 * while leaving room for every taxon that shares most of its letter groups with the query.
 */
export const DEFAULT_CANDIDATE_CAP = 300;

export interface TaxonIndexOptions {
  /** `Infinity` lets fuse.js rank the whole checklist: the reference the narrowing is measured against. */
  candidateCap?: number;
  minShare?: number;
}

export const normaliseName = (text: string) =>
  text.normalize("NFD").replace(/\p{Diacritic}/gu, "").toLowerCase().replace(/[^a-z0-9×]+/g, " ").trim();

interface NameEntry<T> {
  taxon: T;
  /** Position of the taxon in the checklist, to count per taxon in typed arrays. */
  taxonIndex: number;
  name: string;
  normalised: string;
  field: MatchedField;
}

/** Up to this query length the query is cut into letter pairs rather than triples: a four-letter query has only two triples. */
const PAIRS_UP_TO = 4;

/**
 * A search index over a checklist. Exact and prefix matches of any name come first (what a
 * person who knows the name expects); fuzzy matches by fuse.js fill the rest, so that a
 * misspelt name still finds its taxon.
 *
 * fuse.js compares the query with every name it is given, so it is given only candidates: the
 * taxa with a name sharing the most letter pairs or triples with the query. fuse.js scores each
 * taxon from its own names alone, so a candidate gets the same score and rank it would get
 * among the whole checklist; what the narrowing can lose is a taxon that fuse.js would have
 * matched but that is not a candidate. That can happen in theory: within the threshold of 0.4
 * a five-letter query may carry two edits, enough to break every triple it shares with the
 * name, and a taxon sharing no pair or triple is never a candidate; and when more than the cap
 * share as many groups as a good hit, some of them are cut. Such hits are the weakest fuse.js
 * finds (most edits for their length) and rank below the candidates that share more; the
 * benchmark (scripts/bench/picker.ts) and the tests count the queries whose results differ from
 * fuse.js over the whole checklist and the misspellings whose taxon drops out of the top three.
 */
export function createTaxonIndex<T extends SearchableTaxon>(taxa: readonly T[], options: TaxonIndexOptions = {}) {
  const candidateCap = options.candidateCap ?? DEFAULT_CANDIDATE_CAP;
  const minShare = options.minShare ?? 0;
  const names: NameEntry<T>[] = taxa.flatMap((taxon, taxonIndex) => [
    { taxon, taxonIndex, name: taxon.scientificName, normalised: normaliseName(taxon.scientificName), field: "scientificName" as const },
    ...taxon.vernacularNames.map((name) => ({ taxon, taxonIndex, name, normalised: normaliseName(name), field: "vernacularName" as const })),
    ...(taxon.synonyms ?? []).map((name) => ({ taxon, taxonIndex, name, normalised: normaliseName(name), field: "synonym" as const })),
  ]);
  const pairs = gramIndex(names, 2);
  const triples = gramIndex(names, 3);
  // fuse.js's own record of every taxon (names and their length norms), made once, so that a
  // query's small fuse.js is assembled from records instead of reading every name again.
  const fullIndex = Fuse.createIndex(taxonFuseOptions.keys ?? [], taxa);
  const records = fullIndex.records;
  const wholeFuse = candidateCap >= taxa.length ? new Fuse<SearchableTaxon>(taxa, taxonFuseOptions, fullIndex) : undefined;

  // Counters reused by every query rather than allocated per keystroke; all zero between queries.
  const sharedByName = new Uint16Array(names.length);
  const bestByTaxon = new Uint16Array(taxa.length);
  const totalByTaxon = new Uint16Array(taxa.length);
  const MODE = process.env.MODE ?? "A";

  function literalHits(query: string): TaxonHit<T>[] {
    const best = new Map<number, TaxonHit<T>>();
    for (const entry of namesThatMayContain(query)) {
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

  /** A name containing the query contains each of its letter groups, so the rarest group's names are enough to look at. */
  function namesThatMayContain(query: string): Iterable<NameEntry<T>> {
    const index = query.length > PAIRS_UP_TO ? triples : pairs;
    const size = query.length > PAIRS_UP_TO ? 3 : 2;
    if (query.length < size) return names;
    let rarest: Int32Array | undefined;
    for (const gram of gramsOf(query, size)) {
      const list = index.get(gram);
      if (!list) return [];
      if (!rarest || list.length < rarest.length) rarest = list;
    }
    return Array.from(rarest ?? [], (entry) => names[entry]!);
  }

  /** The taxa whose best name shares the most letter groups with the query, best first, at most `candidateCap`. */
  function candidates(query: string): number[] {
    const size = query.length > PAIRS_UP_TO ? 3 : 2;
    const index = size === 3 ? triples : pairs;
    const grams = gramsOf(query, size);
    const touchedNames: number[] = [];
    for (const gram of grams) {
      for (const entry of index.get(gram) ?? []) {
        if (sharedByName[entry]++ === 0) touchedNames.push(entry);
      }
    }
    // fuse.js scores each name on its own, so a taxon counts by its best name, not by the
    // letters its names share between them.
    const touchedTaxa: number[] = [];
    for (const entry of touchedNames) {
      const shared = sharedByName[entry]!;
      sharedByName[entry] = 0;
      const taxonIndex = names[entry]!.taxonIndex;
      if (bestByTaxon[taxonIndex] === 0) touchedTaxa.push(taxonIndex);
      if (shared > bestByTaxon[taxonIndex]!) bestByTaxon[taxonIndex] = shared;
      totalByTaxon[taxonIndex] += shared;
    }
    const byShared: number[][] = Array.from({ length: grams.size + 1 }, () => []);
    if (MODE !== "A") {
      const key = (t: number) => MODE === "B" ? bestByTaxon[t]! * 1000 + totalByTaxon[t]! : totalByTaxon[t]! * 1000 + bestByTaxon[t]!;
      const sorted = touchedTaxa.sort((a, b) => key(b) - key(a) || a - b).slice(0, candidateCap);
      for (const t of touchedTaxa) { bestByTaxon[t] = 0; totalByTaxon[t] = 0; }
      return sorted;
    }
    for (const taxonIndex of touchedTaxa) {
      byShared[bestByTaxon[taxonIndex]!]!.push(taxonIndex);
      bestByTaxon[taxonIndex] = 0;
      totalByTaxon[taxonIndex] = 0;
    }
    const chosen: number[] = [];
    const floor = Math.max(1, Math.ceil(grams.size * minShare));
    for (let shared = grams.size; shared >= floor && chosen.length < candidateCap; shared--) {
      // Within a tie, checklist order: the same query always gets the same candidates.
      const tied = byShared[shared]!.sort((a, b) => a - b);
      chosen.push(...tied.slice(0, candidateCap - chosen.length));
    }
    return chosen;
  }

  function fuseFor(query: string): Fuse<SearchableTaxon> {
    if (wholeFuse) return wholeFuse;
    const chosen = candidates(query);
    const subset: FuseIndex<SearchableTaxon> = Fuse.parseIndex({
      keys: fullIndex.keys,
      records: chosen.map((taxonIndex, i) => ({ ...records[taxonIndex]!, i })),
    });
    return new Fuse<SearchableTaxon>(
      chosen.map((taxonIndex) => taxa[taxonIndex]!),
      taxonFuseOptions,
      subset,
    );
  }

  function fuzzyHits(query: string): TaxonHit<T>[] {
    return fuseFor(query)
      .search(query)
      .map((result) => {
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
      const literal = literalHits(query);
      // Every literal hit scores below every fuzzy one, so with `limit` of them fuzzy hits
      // could only be cut again.
      const fuzzy = query.length >= 3 && literal.length < limit ? fuzzyHits(query) : [];
      const hits = new Map<number, TaxonHit<T>>();
      for (const hit of [...literal, ...fuzzy]) {
        const previous = hits.get(hit.taxon.id);
        if (!previous || hit.score < previous.score) hits.set(hit.taxon.id, hit);
      }
      return [...hits.values()]
        .sort((a, b) => a.score - b.score || a.taxon.scientificName.localeCompare(b.taxon.scientificName))
        .slice(0, limit);
    },
  };
}

function gramsOf(text: string, size: number): Set<string> {
  const grams = new Set<string>();
  for (let i = 0; i + size <= text.length; i++) grams.add(text.slice(i, i + size));
  return grams;
}

/** For each letter group, the names (positions in `names`) that contain it, each once. */
function gramIndex(names: readonly { normalised: string }[], size: number): Map<string, Int32Array> {
  const lists = new Map<string, number[]>();
  names.forEach(({ normalised }, entry) => {
    for (const gram of gramsOf(normalised, size)) {
      const list = lists.get(gram);
      if (list) list.push(entry);
      else lists.set(gram, [entry]);
    }
  });
  return new Map([...lists].map(([gram, list]) => [gram, Int32Array.from(list)]));
}

function bestMatch(matches: readonly FuseResultMatch[] | undefined) {
  if (!matches || matches.length === 0) return undefined;
  // The match covering the most characters is the name the person was typing.
  return [...matches].sort((a, b) => covered(b) - covered(a))[0];
}

const covered = (match: FuseResultMatch) => match.indices.reduce((sum, [from, to]) => sum + (to - from + 1), 0);
