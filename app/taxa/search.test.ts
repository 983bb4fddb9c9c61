import { distance } from "fastest-levenshtein";
import { describe, expect, it } from "vitest";
import { DEFAULT_CHECKLIST_FILES } from "~/db/seed.server";
import { loadChecklists } from "./checklist-import.server";
import { createTaxonIndex, normaliseName } from "./search";

const plants = loadChecklists(DEFAULT_CHECKLIST_FILES).plants.map((row, i) => ({ id: i + 1, ...row }));
const index = createTaxonIndex(plants);

/** The name of a taxon closest to the query, by Levenshtein distance. */
function closestName(taxon: (typeof plants)[number], query: string) {
  const names = [taxon.scientificName, ...taxon.vernacularNames, ...taxon.synonyms];
  return Math.min(...names.map((name) => distance(normaliseName(name), normaliseName(query))));
}

// Misspellings people make: a dropped, doubled, swapped or wrong letter, in common names,
// scientific names and old synonyms. Each is checked against the reference edit distance
// (fastest-levenshtein, npm) so the list cannot drift into exact names or unrelated words.
const misspellings: [query: string, intended: string, edits: number][] = [
  ["bloodrot", "Sanguinaria canadensis", 1], // dropped letter
  ["pusy willow", "Salix discolor", 1], // dropped letter
  ["dandelon", "Taraxacum officinale", 1], // dropped letter
  ["red mapel", "Acer rubrum", 2], // transposed letters
  ["Zizia aurae", "Zizia aurea", 2], // transposed letters
  ["Lupinis perennis", "Lupinus perennis", 1], // wrong letter
  ["wild bergammot", "Monarda fistulosa", 1], // doubled letter
  ["virginia bluebels", "Mertensia virginica", 1], // dropped letter
  ["Solidago speciossa", "Solidago speciosa", 1], // doubled letter
  ["Aster novae-anglia", "Symphyotrichum novae-angliae", 1], // old synonym, dropped letter
  ["prairie smok", "Geum triflorum", 1], // dropped letter
  ["Mertensia virgnica", "Mertensia virginica", 1], // dropped letter
];

describe("fuzzy search of the plant checklist", () => {
  it.each(misspellings)("finds %s → %s in the top three", (query, intended, edits) => {
    const taxon = plants.find((p) => p.scientificName === intended);
    expect(taxon, `${intended} is on the checklist`).toBeDefined();
    // fastest-levenshtein: the query really is `edits` edits away from one of the taxon's names.
    expect(closestName(taxon!, query)).toBe(edits);
    const top3 = index.search(query, 3).map((hit) => hit.taxon.scientificName);
    expect(top3).toContain(intended);
  });

  it("puts an exact common name first", () => {
    expect(index.search("bloodroot", 5)[0]?.taxon.scientificName).toBe("Sanguinaria canadensis");
  });

  it("says when the match was a synonym", () => {
    const hit = index.search("Aster novae-angliae", 1)[0];
    expect(hit?.taxon.scientificName).toBe("Symphyotrichum novae-angliae");
    expect(hit?.matchedField).toBe("synonym");
  });

  it("finds nothing for letters that spell no plant", () => {
    expect(index.search("qxzvjk")).toEqual([]);
  });

  it("returns only results within a few edits of the name they matched", () => {
    // Every top-three hit must contain a stretch of its matched name no more than 40 % of the
    // query's length in edits away from the query (fastest-levenshtein), the tolerance the
    // search promises; anything looser would be noise.
    for (const [query] of misspellings) {
      const q = normaliseName(query);
      for (const hit of index.search(query, 3)) {
        expect(closestStretch(normaliseName(hit.matchedName), q), `${query} → ${hit.matchedName}`).toBeLessThanOrEqual(Math.ceil(q.length * 0.4));
      }
    }
  });
});

/** The smallest edit distance between the query and any stretch of the name of about its length. */
function closestStretch(name: string, query: string): number {
  let best = distance(name, query);
  for (let length = Math.max(1, query.length - 2); length <= query.length + 2; length++) {
    for (let from = 0; from + length <= name.length; from++) {
      best = Math.min(best, distance(name.slice(from, from + length), query));
    }
  }
  return best;
}
