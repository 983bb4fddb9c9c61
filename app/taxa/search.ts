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
 * How many candidates a query gets at most (long ones get fewer, see PASSES_AT_FULL_CAP).
 * fuse.js's cost grows with the names it is given, so this bounds a keystroke's cost whatever
 * the size of the checklist: on a 10,000-taxon checklist it keeps the 95th percentile well
 * under 8 ms on the 2-core development machine (see "Benchmarks" in DEVELOPERS.md), with room
 * to spare for every taxon that shares most of its letter groups with the query.
 */
export const DEFAULT_CANDIDATE_CAP = 300;

export interface TaxonIndexOptions {
  /** `Infinity` lets fuse.js rank the whole checklist: the reference the narrowing is measured against. */
  candidateCap?: number;
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

/** A name in fuse.js's index record of a taxon: its text, its place in its list, its length norm. */
type FuseName = { v: string; i?: number; n: number };
/** fuse.js's index record of a taxon: its place in the collection, its names by key. */
type FuseRecord = { i: number; $: Record<number, FuseName | FuseName[]> };

/** Added to fuse.js's score so that every fuzzy hit ranks behind every literal one (those score 0 to 0.003). */
const FUZZY_FLOOR = 0.01;

/**
 * Up to this length the query is cut into letter pairs rather than triples: two swapped letters
 * in the middle of a six-letter query break all four of its triples but only three of its five
 * pairs.
 */
const PAIRS_UP_TO = 6;

/**
 * fuse.js goes over a name once for each number of edits it still allows, up to 0.4 × the
 * query's length, so a query's cost is about its candidates times its passes. Queries of up to
 * nine letters (at most four passes) get `candidateCap` candidates; longer ones proportionally
 * fewer, which they can afford: many letter triples tell the close names from the rest.
 */
const PASSES_AT_FULL_CAP = 4;

/**
 * A search index over a checklist. Exact and prefix matches of any name come first (what a
 * person who knows the name expects); fuzzy matches by fuse.js fill the rest, so that a
 * misspelt name still finds its taxon.
 *
 * fuse.js compares the query with every name it is given, so it is given only candidates: the
 * taxa with a name sharing the most letter pairs or triples with the query, and of those only
 * the names close enough for fuse.js to match (matchableRecords; that step loses nothing).
 * fuse.js scores a taxon from its own names alone, and ties keep its order, so each candidate
 * gets the score and place it would get among the whole checklist (the tests check). What the
 * narrowing can lose is a taxon fuse.js would have matched that is not a candidate, and that
 * can happen: fuse.js allows edits up to 0.4 × the query's length, enough for a slip to leave
 * a name sharing one letter pair with a five-letter query ("shrap" and "sharp" share only
 * "sh"), or none, and when more taxa than the cap share as many letter groups as that name,
 * the cap cuts it. Such matches are the weakest fuse.js finds (most edits for their length)
 * and usually rank below taxa that share more letters. The benchmark (scripts/bench/picker.ts)
 * measures the loss: misspellings whose taxon plain fuse.js puts in its top three and we do
 * not, and queries whose top three or top ten differ from fuse.js ranking the whole checklist.
 */
export function createTaxonIndex<T extends SearchableTaxon>(taxa: readonly T[], options: TaxonIndexOptions = {}) {
  const candidateCap = options.candidateCap ?? DEFAULT_CANDIDATE_CAP;
  const names: NameEntry<T>[] = taxa.flatMap((taxon, taxonIndex) => [
    { taxon, taxonIndex, name: taxon.scientificName, normalised: normaliseName(taxon.scientificName), field: "scientificName" as const },
    ...taxon.vernacularNames.map((name) => ({ taxon, taxonIndex, name, normalised: normaliseName(name), field: "vernacularName" as const })),
    ...(taxon.synonyms ?? []).map((name) => ({ taxon, taxonIndex, name, normalised: normaliseName(name), field: "synonym" as const })),
  ]);
  const positionOf = new Map(taxa.map((taxon, i) => [taxon.id, i]));
  // Literal hits that tie read best in alphabetical order; fuzzy hits that tie keep fuse.js's
  // order (the checklist's), so that narrowing never reorders what fuse.js would have ranked.
  const byRank = (a: TaxonHit<T>, b: TaxonHit<T>) =>
    a.score - b.score ||
    (a.score < FUZZY_FLOOR
      ? a.taxon.scientificName.localeCompare(b.taxon.scientificName)
      : positionOf.get(a.taxon.id)! - positionOf.get(b.taxon.id)!);
  const pairs = gramIndex(names, 2);
  const triples = gramIndex(names, 3);
  // fuse.js's own record of every taxon (each name with its length norm), made once, so that a
  // query's small fuse.js is assembled from records instead of reading every name again. Beside
  // each name, the text fuse.js compares (lowercased, nothing more), for the screen below.
  const fullIndex = Fuse.createIndex(taxonFuseOptions.keys ?? [], taxa);
  const fuseNamesOf = fullIndex.records.map((record) =>
    Object.entries(record.$ ?? {}).flatMap(([key, value]) =>
      (Array.isArray(value) ? value : [value]).map((name: FuseName) => ({
        key: Number(key),
        listed: Array.isArray(value),
        name,
        text: name.v.toLowerCase(),
      })),
    ),
  );
  // A checklist no longer than the cap has nothing to narrow.
  const wholeFuse = candidateCap >= taxa.length ? new Fuse<SearchableTaxon>(taxa, taxonFuseOptions, fullIndex) : undefined;

  // Counters reused by every query rather than allocated per keystroke; all zero between queries.
  const sharedByName = new Uint16Array(names.length);
  const taxonOfName = Int32Array.from(names, (entry) => entry.taxonIndex);
  const bestByTaxon = new Uint16Array(taxa.length);
  const totalByTaxon = new Uint16Array(taxa.length);

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

  /** Letter pairs for short queries, triples for longer ones, and the index of names by them. */
  function gramsFor(query: string) {
    return query.length > PAIRS_UP_TO ? { size: 3, index: triples } : { size: 2, index: pairs };
  }

  /** A name containing the query contains each of its letter groups, so the rarest group's names are enough to look at. */
  function namesThatMayContain(query: string): Iterable<NameEntry<T>> {
    const { size, index } = gramsFor(query);
    if (query.length < size) return names;
    let rarest: number[] | undefined;
    for (const gram of gramsOf(query, size)) {
      const list = index.get(gram);
      if (!list) return [];
      if (!rarest || list.length < rarest.length) rarest = list;
    }
    return Array.from(rarest ?? [], (entry) => names[entry]!);
  }

  function capFor(queryLength: number): number {
    const passes = Math.floor((taxonFuseOptions.threshold ?? 0.6) * queryLength) + 1;
    return Math.min(candidateCap, Math.floor((candidateCap * PASSES_AT_FULL_CAP) / passes));
  }

  /**
   * The taxa whose best name shares the most letter groups with the query, at most
   * `capFor(query.length)`. Among taxa whose best names share equally many, those whose other
   * names share more come first: fuse.js multiplies the scores of every name that matches, so
   * a taxon matching in several names ranks higher than one matching equally well in one.
   */
  function candidates(query: string): number[] {
    const cap = capFor(query.length);
    const { size, index } = gramsFor(query);
    const grams = gramsOf(query, size);
    const touchedNames: number[] = [];
    for (const gram of grams) {
      const list = index.get(gram);
      if (!list) continue;
      for (let i = 0; i < list.length; i++) {
        const entry = list[i]!;
        const shared = sharedByName[entry]!;
        if (shared === 0) touchedNames.push(entry);
        sharedByName[entry] = shared + 1;
      }
    }
    const touchedTaxa: number[] = [];
    for (let i = 0; i < touchedNames.length; i++) {
      const entry = touchedNames[i]!;
      const shared = sharedByName[entry]!;
      sharedByName[entry] = 0;
      const taxonIndex = taxonOfName[entry]!;
      if (bestByTaxon[taxonIndex] === 0) touchedTaxa.push(taxonIndex);
      if (shared > bestByTaxon[taxonIndex]!) bestByTaxon[taxonIndex] = shared;
      totalByTaxon[taxonIndex] = totalByTaxon[taxonIndex]! + shared;
    }
    const byBest: number[][] = Array.from({ length: grams.size + 1 }, () => []);
    for (const taxonIndex of touchedTaxa) byBest[bestByTaxon[taxonIndex]!]!.push(taxonIndex);
    const chosen: number[] = [];
    for (let best = grams.size; best >= 1 && chosen.length < cap; best--) {
      const tied = byBest[best]!;
      if (chosen.length + tied.length > cap) {
        // Only the group cut by the cap needs an order; the checklist's breaks the last ties
        // so that the same query always gets the same candidates.
        tied.sort((a, b) => totalByTaxon[b]! - totalByTaxon[a]! || a - b);
        tied.length = cap - chosen.length;
      }
      chosen.push(...tied);
    }
    for (const taxonIndex of touchedTaxa) {
      bestByTaxon[taxonIndex] = 0;
      totalByTaxon[taxonIndex] = 0;
    }
    return chosen;
  }

  /**
   * fuse.js's records of the candidates, each keeping only the names fuse.js can match. fuse.js
   * matches a name only if some stretch of it is within 0.4 × the query's length edits of the
   * query, and scores a taxon by its matching names alone, so leaving out the other names (and
   * taxa left with none) changes nothing in its results and spares it its slowest work: a name
   * that does not match costs it a pass for every edit it allows. fuse.js cuts queries over 32
   * letters into pieces and matches on any piece; those keep every name.
   */
  function matchableRecords(query: string, chosen: readonly number[]) {
    const bits = query.length <= MAX_SCREENED_LENGTH ? patternBits(query) : undefined;
    const threshold = taxonFuseOptions.threshold ?? 0.6;
    const docs: SearchableTaxon[] = [];
    const kept: FuseRecord[] = [];
    for (const taxonIndex of chosen) {
      const names: FuseRecord["$"] = {};
      let any = false;
      for (const { key, listed, name, text } of fuseNamesOf[taxonIndex]!) {
        // The same test as fuse.js's: edits per letter of the query at most the threshold.
        if (bits && fewestEdits(bits, query.length, text) / query.length > threshold) continue;
        if (listed) ((names[key] ??= []) as FuseName[]).push(name);
        else names[key] = name;
        any = true;
      }
      if (any) {
        kept.push({ i: docs.length, $: names });
        docs.push(taxa[taxonIndex]!);
      }
    }
    return { docs, records: kept };
  }

  function fuseFor(query: string): Fuse<SearchableTaxon> {
    if (wholeFuse) return wholeFuse;
    const { docs, records } = matchableRecords(query, candidates(query));
    return new Fuse<SearchableTaxon>(docs, taxonFuseOptions, Fuse.parseIndex({ keys: fullIndex.keys, records }));
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
          score: FUZZY_FLOOR + (result.score ?? 1),
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
      return [...hits.values()].sort(byRank).slice(0, limit);
    },
  };
}

/** Myers' algorithm keeps a column of the edit-distance table in the bits of one 32-bit integer. */
export const MAX_SCREENED_LENGTH = 31;

/** For each letter of the pattern, the positions where it occurs, as bits. */
export function patternBits(pattern: string): Map<string, number> {
  const bits = new Map<string, number>();
  for (let i = 0; i < pattern.length; i++) bits.set(pattern[i]!, (bits.get(pattern[i]!) ?? 0) | (1 << i));
  return bits;
}

/**
 * The fewest insertions, deletions and substitutions that turn the pattern (of `length` letters,
 * at most MAX_SCREENED_LENGTH) into some stretch of the text: Myers' bit-parallel algorithm
 * for approximate string matching (J. ACM 46(3), 1999), named as in the paper. Each letter of
 * the text moves one column of the edit-distance table along, held as the vertical steps up
 * (pv) and down (mv) between its cells.
 */
export function fewestEdits(bits: Map<string, number>, length: number, text: string): number {
  const last = 1 << (length - 1);
  let pv = (1 << length) - 1;
  let mv = 0;
  let edits = length;
  let fewest = length;
  for (let j = 0; j < text.length; j++) {
    const eq = bits.get(text[j]!) ?? 0;
    const xv = eq | mv;
    const xh = (((eq & pv) + pv) ^ pv) | eq;
    let ph = mv | ~(xh | pv);
    let mh = pv & xh;
    if (ph & last) edits++;
    else if (mh & last) edits--;
    // A match may start anywhere in the text: the top row stays 0, so no step carries into it.
    ph <<= 1;
    mh <<= 1;
    pv = mh | ~(xv | ph);
    mv = ph & xv;
    if (edits < fewest) fewest = edits;
  }
  return fewest;
}

function gramsOf(text: string, size: number): Set<string> {
  const grams = new Set<string>();
  for (let i = 0; i + size <= text.length; i++) grams.add(text.slice(i, i + size));
  return grams;
}

/** For each letter group, the names (positions in `names`, ascending) that contain it, each once. */
function gramIndex(names: readonly { normalised: string }[], size: number): Map<string, number[]> {
  const lists = new Map<string, number[]>();
  names.forEach(({ normalised }, entry) => {
    for (let i = 0; i + size <= normalised.length; i++) {
      const gram = normalised.slice(i, i + size);
      const list = lists.get(gram);
      if (!list) lists.set(gram, [entry]);
      // Names are added in order, so a gram seen before in this name ends its list.
      else if (list[list.length - 1] !== entry) list.push(entry);
    }
  });
  return lists;
}

function bestMatch(matches: readonly FuseResultMatch[] | undefined) {
  if (!matches || matches.length === 0) return undefined;
  // The match covering the most characters is the name the person was typing.
  return [...matches].sort((a, b) => covered(b) - covered(a))[0];
}

const covered = (match: FuseResultMatch) => match.indices.reduce((sum, [from, to]) => sum + (to - from + 1), 0);
