/**
 * The taxon picker's search on a large checklist: our narrowed search beside plain fuse.js over
 * the whole list, measured in the same run. The checklist is the seeded plants padded with
 * generated names, and the queries are generated too, all from fixed seeds, so every run
 * searches the same names for the same strings.
 */
import Fuse from "fuse.js";
import { DEFAULT_CHECKLIST_FILES } from "../../app/db/seed.server.ts";
import { loadChecklists } from "../../app/taxa/checklist-import.server.ts";
import { createTaxonIndex, normaliseName, taxonFuseOptions, type SearchableTaxon } from "../../app/taxa/search.ts";
import type { Bench, BenchOutcome, BenchSize } from "./run.ts";

/** The budget for one search on a 10,000-taxon checklist on the 2-core development machine. */
export const P95_BUDGET_MS = 8;

const SIZES: Record<BenchSize, { taxa: number; queries: number; warmUp: number }> = {
  full: { taxa: 10_000, queries: 320, warmUp: 20 },
  smoke: { taxa: 1_000, queries: 30, warmUp: 3 },
};

const CHECKLIST_SEED = 0x5eed_2024;
const QUERY_SEED = 0x0b0b_0001;

export interface BenchTaxon extends SearchableTaxon {
  synonyms: string[];
}

/** mulberry32: a 32-bit generator small enough to write here; the same seed gives the same sequence everywhere. */
export function mulberry32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const pick = <V>(random: () => number, list: readonly V[]): V => list[Math.floor(random() * list.length)]!;

/** The seeded plant checklist (data/plants.csv), numbered from 1 like the database does. */
export function seededPlants(): BenchTaxon[] {
  return loadChecklists(DEFAULT_CHECKLIST_FILES).plants.map((row, i) => ({
    id: i + 1,
    scientificName: row.scientificName,
    vernacularNames: row.vernacularNames,
    synonyms: row.synonyms,
  }));
}

// Syllables and word parts for names that look like a flora's without being anyone's.
const ONSETS = ["ac", "al", "am", "an", "ar", "bal", "cal", "car", "cen", "cor", "dar", "del", "er", "fal", "gal", "hal", "hel", "il", "lam", "lan", "lep", "lin", "mal", "mar", "mel", "mor", "nar", "nem", "or", "pal", "pel", "per", "phy", "pol", "ran", "rho", "sal", "scl", "ser", "tal", "ter", "tri", "ul", "val", "ver", "zan"];
const MIDDLES = ["a", "e", "i", "o", "u", "ab", "ad", "ag", "am", "en", "er", "ic", "il", "im", "on", "or", "ost", "ul", "yn"];
const GENUS_ENDINGS = ["ia", "us", "um", "a", "is", "ella", "opsis", "anthus", "aria", "ina", "odon", "ago", "ea", "ium"];
const EPITHET_ENDINGS = ["ensis", "ata", "oides", "ifolia", "iflora", "ica", "ana", "alis", "osa", "ina", "ella", "ii", "ata", "ens"];
const LATIN_EPITHETS = ["alba", "rubra", "montana", "palustris", "vulgaris", "minor", "major", "hirsuta", "glabra", "pratensis", "sylvatica", "lutea", "nana", "repens", "elegans", "gracilis", "borealis", "australis", "occidentalis", "orientalis", "villosa", "pilosa", "stricta", "nodosa", "crispa"];
const ADJECTIVES = ["downy", "hairy", "smooth", "marsh", "prairie", "woodland", "golden", "pale", "dwarf", "tall", "creeping", "nodding", "spotted", "western", "eastern", "northern", "southern", "sand", "rock", "swamp", "meadow", "hill", "shore", "bog", "early", "late", "slender", "broad", "narrow", "fringed", "sticky", "silky", "purple", "yellow", "white", "blue", "scarlet", "hoary", "lesser", "greater", "mountain", "valley"];
const NOUN_HEADS = ["bell", "star", "moon", "sun", "fox", "bear", "bird", "hare", "wolf", "elk", "toad", "snake", "stone", "cloud", "frost", "fire", "salt", "owl", "crow", "deer", "goose", "lark", "mole", "rain", "sky", "horn", "lamp", "pipe", "thread", "comb"];
const NOUN_TAILS = ["wort", "weed", "bane", "flower", "bloom", "root", "leaf", "berry", "grass", "thorn", "cup", "seed", "mint", "cress", "rush", "vetch", "tail", "foot", "beard", "cap", "bush", "vine", "sedge", "spur", "plume"];

/**
 * The given checklist padded to `size` taxa with generated binomials and common names. Names
 * are unique across the whole list (as the checklist import requires of scientific names, and
 * so that a misspelling has one intended taxon); each genus gets a handful of species and
 * some taxa an older name in another genus, as in a real flora.
 */
export function paddedChecklist(seeded: readonly BenchTaxon[], size: number, seed = CHECKLIST_SEED): BenchTaxon[] {
  const random = mulberry32(seed);
  const taken = new Set(seeded.flatMap((t) => [t.scientificName, ...t.vernacularNames, ...t.synonyms].map(normaliseName)));
  const unique = (make: () => string) => {
    for (;;) {
      const name = make();
      const key = normaliseName(name);
      if (!taken.has(key)) {
        taken.add(key);
        return name;
      }
    }
  };
  const word = (endings: readonly string[]) =>
    pick(random, ONSETS) + (random() < 0.6 ? pick(random, MIDDLES) : "") + pick(random, endings);
  const genera = Array.from({ length: Math.max(8, Math.ceil(size / 6)) }, () => {
    const genus = word(GENUS_ENDINGS);
    return genus[0]!.toUpperCase() + genus.slice(1);
  });
  const epithet = () => (random() < 0.35 ? pick(random, LATIN_EPITHETS) : word(EPITHET_ENDINGS));
  const commonName = () => {
    const noun = pick(random, NOUN_HEADS) + pick(random, NOUN_TAILS);
    return random() < 0.2 ? `${pick(random, ADJECTIVES)} ${pick(random, ADJECTIVES)} ${noun}` : `${pick(random, ADJECTIVES)} ${noun}`;
  };

  const taxa = [...seeded];
  let id = Math.max(0, ...seeded.map((t) => t.id));
  while (taxa.length < size) {
    const scientificName = unique(() => `${pick(random, genera)} ${epithet()}`);
    const vernacularNames = Array.from({ length: 1 + Math.floor(random() * 3) }, () => unique(commonName));
    const synonyms = random() < 0.2 ? [unique(() => `${pick(random, genera)} ${scientificName.split(" ")[1]}`)] : [];
    taxa.push({ id: ++id, scientificName, vernacularNames, synonyms });
  }
  return taxa;
}

export interface BenchQuery {
  kind: "prefix" | "whole" | "misspelt name" | "misspelt word";
  text: string;
  /** For a misspelling, the taxon whose name was misspelt. */
  intendedId?: number;
}

export const isMisspelling = (query: BenchQuery) => query.kind === "misspelt name" || query.kind === "misspelt word";

/**
 * Queries as people type them: the first letters of a name, a whole name, a whole name with
 * one slip, or one word with one slip. A slip is a letter dropped, doubled or swapped with its
 * neighbour, in a word of five or more letters and not its first letter (the slips the fuzzy
 * threshold is meant to forgive). A single word is one that names no other taxon ("bloodroot",
 * not "willow"), so that the taxon it was taken from is the one a person wants.
 */
export function benchQueries(taxa: readonly BenchTaxon[], count: number, seed = QUERY_SEED): BenchQuery[] {
  const random = mulberry32(seed);
  const allNames = (t: BenchTaxon) => [t.scientificName, ...t.vernacularNames, ...t.synonyms].map(normaliseName);
  const names = new Set(taxa.flatMap(allNames));
  const taxaByWord = new Map<string, number>();
  for (const taxon of taxa) {
    for (const word of new Set(allNames(taxon).flatMap((name) => name.split(" ")))) taxaByWord.set(word, (taxaByWord.get(word) ?? 0) + 1);
  }
  const queries: BenchQuery[] = [];
  while (queries.length < count) {
    const taxon = pick(random, taxa);
    const roll = random();
    const name =
      roll < 0.5 || taxon.vernacularNames.length === 0
        ? taxon.scientificName
        : roll < 0.9 || taxon.synonyms.length === 0
          ? pick(random, taxon.vernacularNames)
          : pick(random, taxon.synonyms);
    const slot = queries.length % 4;
    if (slot === 0) {
      const length = Math.min(name.length, 3 + Math.floor(random() * 6));
      queries.push({ kind: "prefix", text: name.slice(0, length) });
    } else if (slot === 1) {
      queries.push({ kind: "whole", text: name });
    } else {
      const own = normaliseName(name).split(" ").filter((word) => word.length >= 5 && taxaByWord.get(word) === 1);
      const typed = slot === 2 ? name : own.length > 0 ? pick(random, own) : undefined;
      const text = typed && misspell(typed, random);
      if (text && !names.has(normaliseName(text))) {
        queries.push({ kind: slot === 2 ? "misspelt name" : "misspelt word", text, intendedId: taxon.id });
      }
    }
  }
  return queries;
}

function misspell(name: string, random: () => number): string | undefined {
  const positions: number[] = [];
  for (const match of name.matchAll(/[A-Za-z]{5,}/g)) {
    for (let i = match.index + 1; i < match.index + match[0].length - 1; i++) positions.push(i);
  }
  if (positions.length === 0) return undefined;
  const at = pick(random, positions);
  const operation = Math.floor(random() * 3);
  if (operation === 0) return name.slice(0, at) + name.slice(at + 1);
  if (operation === 1) return name.slice(0, at) + name[at] + name.slice(at);
  if (name[at] === name[at + 1]) return undefined;
  return name.slice(0, at) + name[at + 1] + name[at] + name.slice(at + 2);
}

export interface Latency {
  p50: number;
  p95: number;
  max: number;
}

/** Share of misspellings whose taxon is in the top three: all, and split by what was misspelt. */
export interface TopThree {
  top3HitRate: number;
  wholeNames: number;
  singleWords: number;
}

export interface PickerBenchResult {
  taxa: number;
  queries: number;
  misspellings: number;
  /** Time to build our index once, in ms (the checklist page does it once per load). */
  buildMs: number;
  ours: Latency & TopThree;
  plainFuse: Latency & TopThree;
  /** Misspellings whose taxon plain fuse.js puts in its top three and we do not. */
  misspellingsLost: number;
  /** Queries whose top ten, and whose top three, differ from the same search with fuse.js ranking the whole checklist. */
  queriesDifferingFromWholeList: number;
  topThreesDifferingFromWholeList: number;
}

/** Nearest-rank percentile. */
const percentile = (sorted: readonly number[], p: number) =>
  sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!;

function latency(samples: number[]): Latency {
  const sorted = [...samples].sort((a, b) => a - b);
  return { p50: percentile(sorted, 50), p95: percentile(sorted, 95), max: sorted[sorted.length - 1]! };
}

function timeEach<R>(queries: readonly BenchQuery[], warmUp: number, run: (query: string) => R) {
  for (const query of queries.slice(0, warmUp)) run(query.text);
  const samples: number[] = [];
  const results: R[] = [];
  for (const query of queries) {
    const start = performance.now();
    results.push(run(query.text));
    samples.push(performance.now() - start);
  }
  return { samples, results };
}

export function runPickerBench(size: BenchSize): PickerBenchResult {
  const { taxa: taxonCount, queries: queryCount, warmUp } = SIZES[size];
  const taxa = paddedChecklist(seededPlants(), taxonCount);
  const queries = benchQueries(taxa, queryCount);

  // Each contender is built just before it is timed, so neither runs beside the other's heap.
  const buildStart = performance.now();
  const index = createTaxonIndex(taxa);
  const buildMs = performance.now() - buildStart;
  const ours = timeEach(queries, warmUp, (q) => index.search(q, 10).map((hit) => hit.taxon.id));
  const plain = new Fuse(taxa, taxonFuseOptions);
  const baseline = timeEach(queries, warmUp, (q) => plain.search(q, { limit: 10 }).map((result) => result.item.id));
  // Untimed: the reference for what narrowing changes, fuse.js over everything behind the same literal pass.
  const wholeList = createTaxonIndex(taxa, { candidateCap: Infinity });
  const reference = queries.map((q) => wholeList.search(q.text, 10).map((hit) => hit.taxon.id));

  const misspelt = queries.flatMap((query, i) => (isMisspelling(query) ? [{ query, i }] : []));
  const inTopThree = (results: number[][]) => misspelt.map(({ query, i }) => results[i]!.slice(0, 3).includes(query.intendedId!));
  const oursFound = inTopThree(ours.results);
  const plainFound = inTopThree(baseline.results);
  const rates = (found: boolean[]): TopThree => {
    const rate = (kind?: BenchQuery["kind"]) => {
      const counted = found.filter((_, j) => !kind || misspelt[j]!.query.kind === kind);
      return counted.filter(Boolean).length / counted.length;
    };
    return { top3HitRate: rate(), wholeNames: rate("misspelt name"), singleWords: rate("misspelt word") };
  };
  const misspellingsLost = plainFound.filter((found, j) => found && !oursFound[j]).length;
  const differing = (top: number) =>
    queries.filter((_, i) => ours.results[i]!.slice(0, top).join() !== reference[i]!.slice(0, top).join()).length;

  return {
    taxa: taxa.length,
    queries: queries.length,
    misspellings: misspelt.length,
    buildMs,
    ours: { ...latency(ours.samples), ...rates(oursFound) },
    plainFuse: { ...latency(baseline.samples), ...rates(plainFound) },
    misspellingsLost,
    queriesDifferingFromWholeList: differing(10),
    topThreesDifferingFromWholeList: differing(3),
  };
}

const ms = (value: number) => `${value.toFixed(2)} ms`;
const percent = (rate: number) => `${(rate * 100).toFixed(1)} %`;
const row = (label: string, f: Latency & TopThree) =>
  `${label.padEnd(17)}${ms(f.p50).padEnd(11)}${ms(f.p95).padEnd(11)}${ms(f.max).padEnd(11)}` +
  `${percent(f.top3HitRate)} (${percent(f.wholeNames)}, ${percent(f.singleWords)})`;

/** The figures as printed by `npm run bench`; budgets are checked only on the full size. */
export function reportPickerBench(r: PickerBenchResult, checkBudgets: boolean): BenchOutcome {
  const lines = [
    `${r.taxa} taxa, ${r.queries} queries (${r.misspellings} misspellings), index built in ${ms(r.buildMs)}`,
    `                 p50        p95        max        top-3 hits on misspellings (whole names, single words)`,
    row("ours", r.ours),
    row("plain fuse.js", r.plainFuse),
    `plain fuse.js / ours: p50 ×${(r.plainFuse.p50 / r.ours.p50).toFixed(1)}, p95 ×${(r.plainFuse.p95 / r.ours.p95).toFixed(1)}`,
    `misspellings plain fuse.js finds and we miss: ${r.misspellingsLost}`,
    `queries whose results differ from fuse.js ranking the whole list: top ten ${r.queriesDifferingFromWholeList}, ` +
      `top three ${r.topThreesDifferingFromWholeList}, of ${r.queries}`,
  ];
  const failures: string[] = [];
  if (checkBudgets) {
    if (r.ours.p95 > P95_BUDGET_MS) failures.push(`p95 ${ms(r.ours.p95)} is over the budget of ${ms(P95_BUDGET_MS)}`);
    if (r.ours.top3HitRate < r.plainFuse.top3HitRate) {
      failures.push(`top-3 hit rate ${percent(r.ours.top3HitRate)} is below plain fuse.js's ${percent(r.plainFuse.top3HitRate)}`);
    }
  }
  return { lines, failures };
}

export const pickerBench: Bench = {
  name: "taxon picker search",
  run: (size) => reportPickerBench(runPickerBench(size), size === "full"),
};
