import type { MikroORM } from "@mikro-orm/postgresql";
import { parse } from "csv-parse/sync";
import { beforeEach, describe, expect, it } from "vitest";
import { createUser } from "~/auth/accounts.server";
import type { Role } from "~/auth/roles";
import { seedChecklists } from "~/db/seed.server";
import { PlantTaxon, PlantingList, PlantingListItem, StockItem, User } from "~/entities";
import { listCoverage, coverageOptionsOf } from "~/planting/coverage";
import {
  deleteList,
  findSharedList,
  LIST_CSV_COLUMNS,
  listApiBody,
  listCsv,
  listSavedLists,
  loadList,
  PlantingListNotFound,
  PlantingListRefused,
  renameList,
  revokeShare,
  saveList,
  shareList,
  swapListItem,
} from "~/planting/lists.server";
import { draftPlan, planningGround } from "~/planting/plan.server";
import { recommendationInput } from "~/planting/recommend";
import { swapAlternatives } from "~/planting/swap";
import { useEmptyTestDatabase } from "../support/database";

let orm: MikroORM;
useEmptyTestDatabase((opened) => (orm = opened));

type Person = { id: number; roles: Role[] };
let owner: Person;
let otherPlanner: Person;
let coordinator: Person;

const NORTH = recommendationInput.parse({ band: "north" });

async function person(email: string, name: string, roles: Role[]): Promise<Person> {
  const user = await createUser(orm.em.fork(), { email, name, password: "a long enough password", roles });
  return { id: user.id, roles };
}

/** The north band's default recommendation, saved by `owner`. */
async function savedNorthList(name = "Fen edge 2027") {
  const draft = await draftPlan(orm.em.fork(), NORTH, []);
  const { id } = await saveList(orm.em.fork(), owner, { name, options: NORTH, items: draft.items });
  return { id, draft };
}

/** Whether the promise is refused with this class (and status), returning the message. */
async function refusal(promise: Promise<unknown>, status?: number): Promise<string> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof PlantingListRefused) {
      if (status !== undefined) expect(error.status).toBe(status);
      return error.message;
    }
    if (error instanceof PlantingListNotFound) return "not found";
    throw error;
  }
  return "accepted";
}

const count = async (entity: "list" | "item") => (entity === "list" ? orm.em.fork().count(PlantingList, {}) : orm.em.fork().count(PlantingListItem, {}));

beforeEach(async () => {
  await seedChecklists(orm.em.fork());
  owner = await person("ivy@example.org", "Ivy Planner", ["planner"]);
  otherPlanner = await person("oak@example.org", "Oak Planner", ["planner"]);
  coordinator = await person("lead@example.org", "Lead Coordinator", ["coordinator"]);
});

describe("saving and loading", () => {
  it("saves the recommendation in order with its settings, and any planner can open it", async () => {
    const { id, draft } = await savedNorthList();
    expect(draft.items.length).toBeGreaterThan(0);
    const asOther = await loadList(orm.em.fork(), otherPlanner, id);
    expect(asOther.name).toBe("Fen edge 2027");
    expect(asOther.ownerName).toBe("Ivy Planner");
    expect(asOther.plan.species.map((s) => s.id)).toEqual(draft.items.map((i) => i.taxonId));
    expect(asOther.plan.species.map((s) => s.reason)).toEqual(draft.items.map((i) => i.reason));
    expect(asOther.plan.settings).toEqual({ band: "north", months: { start: 4, end: 9 }, minPerMonth: 3, size: null, forms: NORTH.forms, nativeOnly: true });
    // The draft met every month (the recommendation's contract), so the saved list does too.
    expect(asOther.plan.unmet).toEqual([]);
    expect(asOther.plan.perMonth).toEqual(draft.view.perMonth);
    // Lists are programme work: any planner reads; only the owner or a coordinator changes (issue 7).
    expect(asOther.canChange).toBe(false);
    expect(asOther.plan.species.every((s) => s.alternatives.length === 0)).toBe(true);
    expect((await loadList(orm.em.fork(), owner, id)).canChange).toBe(true);
    expect((await loadList(orm.em.fork(), coordinator, id)).canChange).toBe(true);
    expect((await loadList(orm.em.fork(), owner, id)).plan.species.some((s) => s.alternatives.length > 0)).toBe(true);
  });

  it("says 'not found' for a missing or malformed id", async () => {
    expect(await refusal(loadList(orm.em.fork(), owner, 999_999))).toBe("not found");
    expect(await refusal(loadList(orm.em.fork(), owner, "12abc"))).toBe("not found");
    expect(await refusal(loadList(orm.em.fork(), owner, "99999999999"))).toBe("not found");
  });

  it("refuses a list without a name, and writes nothing", async () => {
    const draft = await draftPlan(orm.em.fork(), NORTH, []);
    expect(await refusal(saveList(orm.em.fork(), owner, { name: "   ", options: NORTH, items: draft.items }), 400)).toBe("Give the list a name");
    expect(await refusal(saveList(orm.em.fork(), owner, { name: "x".repeat(201), options: NORTH, items: draft.items }), 400)).toMatch(/At most 200/);
    expect(await refusal(saveList(orm.em.fork(), owner, { name: "Empty", options: NORTH, items: [] }), 400)).toMatch(/no species/);
    expect(await count("list")).toBe(0);
  });

  it("refuses, all or nothing, a list holding an invasive or a non-native species", async () => {
    // Invasive taxa are never recommended (app/planting/recommend.ts header); a native-only list holds natives only.
    const draft = await draftPlan(orm.em.fork(), NORTH, []);
    const em = orm.em.fork();
    const invasive = await em.findOneOrFail(PlantTaxon, { regionalStatus: "invasive" });
    const introduced = await em.findOneOrFail(PlantTaxon, { regionalStatus: "introduced" });
    const withInvasive = [...draft.items, { taxonId: invasive.id, reason: "" }];
    expect(await refusal(saveList(orm.em.fork(), owner, { name: "Bad", options: { ...NORTH, nativeOnly: false }, items: withInvasive }), 400)).toContain(invasive.scientificName);
    expect(await refusal(saveList(orm.em.fork(), owner, { name: "Bad", options: NORTH, items: [{ taxonId: introduced.id, reason: "" }] }), 400)).toContain(introduced.scientificName);
    expect(await refusal(saveList(orm.em.fork(), owner, { name: "Twice", options: NORTH, items: [draft.items[0]!, draft.items[0]!] }), 400)).toMatch(/twice/);
    expect(await count("list")).toBe(0);
    expect(await count("item")).toBe(0);
  });

  it("lists saved lists for the planting page, the latest first, with species counts", async () => {
    const first = await savedNorthList("First");
    const second = await savedNorthList("Second");
    const lists = await listSavedLists(orm.em.fork(), otherPlanner);
    expect(lists.map((l) => l.id)).toEqual([second.id, first.id]);
    expect(lists[0]).toMatchObject({ name: "Second", ownerName: "Ivy Planner", mine: false, band: "north", species: second.draft.items.length, shared: false });
  });
});

describe("swapping", () => {
  it("swaps an item in its place, keeps every month met, and records why", async () => {
    const { id, draft } = await savedNorthList();
    const view = await loadList(orm.em.fork(), owner, id);
    const target = view.plan.species[view.plan.species.length - 1]!;
    const alternative = target.alternatives[0]!;
    const result = await swapListItem(orm.em.fork(), owner, id, target.id, alternative.id);
    expect(result).toEqual({ from: target.scientificName, to: alternative.scientificName });
    const after = await loadList(orm.em.fork(), owner, id);
    const ids = draft.items.map((i) => i.taxonId);
    ids[ids.length - 1] = alternative.id;
    expect(after.plan.species.map((s) => s.id)).toEqual(ids);
    expect(after.plan.species.at(-1)!.reason).toMatch(new RegExp(`^Swapped in for ${target.scientificName}`));
    // A swap keeps every season month at or above the minimum it met (app/planting/swap.ts header).
    expect(after.plan.unmet).toEqual([]);
  });

  it("refuses a swap that would leave a month short, and one by a planner who is not the owner", async () => {
    const { id } = await savedNorthList();
    const view = await loadList(orm.em.fork(), owner, id);
    const { candidates, earlySpringMonths } = await planningGround(orm.em.fork(), "north");
    const target = view.plan.species[0]!;
    const listed = view.plan.species.map((s) => candidates.find((c) => c.id === s.id)!);
    const fits = new Set(swapAlternatives(coverageOptionsOf(NORTH, earlySpringMonths), listed, target.id, candidates).map((a) => a.taxon.id));
    // A native that flowers only outside the first species' months cannot replace it without a short month.
    const misfit = candidates.find((c) => c.regionalStatus === "native" && !fits.has(c.id) && !listed.some((l) => l.id === c.id) && c.bloomStart >= 7)!;
    expect(await refusal(swapListItem(orm.em.fork(), owner, id, target.id, misfit.id), 400)).toMatch(/would fall below 3/);
    const fit = [...fits][0]!;
    expect(await refusal(swapListItem(orm.em.fork(), otherPlanner, id, target.id, fit), 403)).toMatch(/Only the planner who saved this list/);
    expect(await refusal(swapListItem(orm.em.fork(), coordinator, id, target.id, fit))).toBe("accepted");
    expect(listCoverage(coverageOptionsOf(NORTH, earlySpringMonths), (await loadList(orm.em.fork(), owner, id)).plan.species.map((s) => candidates.find((c) => c.id === s.id)!), candidates).unmet).toEqual([]);
  });

  it("lets only one of two simultaneous swaps of the same species through (the list's row is locked)", async () => {
    const { id, draft } = await savedNorthList();
    const target = (await loadList(orm.em.fork(), owner, id)).plan.species.at(-1)!;
    const [a, b] = target.alternatives;
    expect(b).toBeDefined();
    const outcomes = await Promise.all([refusal(swapListItem(orm.em.fork(), owner, id, target.id, a!.id)), refusal(swapListItem(orm.em.fork(), owner, id, target.id, b!.id))]);
    expect(outcomes.filter((o) => o === "accepted")).toHaveLength(1);
    expect(outcomes.find((o) => o !== "accepted")).toMatch(/not on the list any more/);
    const after = (await loadList(orm.em.fork(), owner, id)).plan.species.map((s) => s.id);
    expect(after).toHaveLength(draft.items.length);
    expect(after.filter((taxonId) => taxonId === a!.id || taxonId === b!.id)).toHaveLength(1);
  });

  it("applies swaps carried in the planting page's address in order, and reports one that no longer fits", async () => {
    const plain = await draftPlan(orm.em.fork(), NORTH, []);
    const last = plain.view.species.at(-1)!;
    const alternative = last.alternatives[0]!;
    const draft = await draftPlan(orm.em.fork(), NORTH, [
      { from: last.id, to: alternative.id },
      // The species was swapped out already: stale.
      { from: last.id, to: last.alternatives[1]!.id },
    ]);
    expect(draft.swaps).toEqual([{ from: last.id, to: alternative.id }]);
    expect(draft.swapProblems).toEqual(["That species is not on the list any more."]);
    expect(draft.items.at(-1)).toEqual({ taxonId: alternative.id, reason: expect.stringMatching(/^Swapped in for /) });
    expect(draft.view.unmet).toEqual([]);
  });
});

describe("renaming, sharing and deleting", () => {
  it("renames for the owner only", async () => {
    const { id } = await savedNorthList();
    await renameList(orm.em.fork(), owner, id, "  North meadow strip  ");
    expect((await loadList(orm.em.fork(), owner, id)).name).toBe("North meadow strip");
    expect(await refusal(renameList(orm.em.fork(), owner, id, ""), 400)).toBe("Give the list a name");
    expect(await refusal(renameList(orm.em.fork(), otherPlanner, id, "Mine now"), 403)).toMatch(/Only the planner/);
  });

  it("shares with a random URL-safe token of at least 128 bits, keeps it when shared again, and revokes it", async () => {
    const { id } = await savedNorthList();
    const token = await shareList(orm.em.fork(), owner, id);
    // 43 base64url characters carry 258 bits of which 256 are random (RFC 4648 §5; the brief asks for ≥ 128 bits).
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(Buffer.from(token, "base64url")).toHaveLength(32);
    expect(await shareList(orm.em.fork(), owner, id)).toBe(token);
    const other = await savedNorthList("Another");
    expect(await shareList(orm.em.fork(), owner, other.id)).not.toBe(token);

    const shared = await findSharedList(orm.em.fork(), token);
    expect(shared.name).toBe("Fen edge 2027");
    expect(shared.plan.species.length).toBeGreaterThan(0);
    // The read-only copy names no one: no owner, no e-mail (issue 7).
    expect(JSON.stringify(shared)).not.toMatch(/@|Ivy Planner|ownerName/);
    expect(shared.plan.species.every((s) => s.alternatives.length === 0)).toBe(true);
    // The share token is shown to those who may change the list, not to other planners.
    expect((await loadList(orm.em.fork(), otherPlanner, id)).shareToken).toBeNull();
    expect((await loadList(orm.em.fork(), otherPlanner, id)).shared).toBe(true);
    expect((await loadList(orm.em.fork(), owner, id)).shareToken).toBe(token);

    expect(await refusal(revokeShare(orm.em.fork(), otherPlanner, id), 403)).toMatch(/Only the planner/);
    await revokeShare(orm.em.fork(), owner, id);
    expect(await refusal(findSharedList(orm.em.fork(), token))).toBe("not found");
    expect(await refusal(findSharedList(orm.em.fork(), "not-a-real-token"))).toBe("not found");
    expect(await refusal(findSharedList(orm.em.fork(), "x' or '1'='1"))).toBe("not found");
  });

  it("deletes the list with its items, for the owner or a coordinator only", async () => {
    const { id } = await savedNorthList();
    expect(await refusal(deleteList(orm.em.fork(), otherPlanner, id), 403)).toMatch(/Only the planner/);
    await deleteList(orm.em.fork(), coordinator, id);
    expect(await count("list")).toBe(0);
    expect(await count("item")).toBe(0);
    expect(await refusal(deleteList(orm.em.fork(), owner, id))).toBe("not found");
    expect(await refusal(loadList(orm.em.fork(), owner, id))).toBe("not found");
  });
});

describe("CSV and JSON of a list", () => {
  it("writes one row per species with evidence columns and who stocks it, quoted as RFC 4180 asks", async () => {
    const { id, draft } = await savedNorthList();
    const em = orm.em.fork();
    // A nursery whose name holds a comma, quotes and a leading "=": the cell must be quoted and must not become a formula.
    const nursery = await createUser(em, { email: "grower@example.org", name: '=Marsh, "Wild" Plants', password: "a long enough password", roles: ["nursery"] });
    const first = draft.items[0]!.taxonId;
    em.create(StockItem, {
      nursery: em.getReference(User, nursery.id),
      plantTaxon: em.getReference(PlantTaxon, first),
      form: "plug",
      sourceRegion: "Driftless Area",
      availability: "now",
      availabilityNote: "",
      grownWithoutSystemicInsecticides: true,
    });
    await em.flush();

    const { name, csv } = await listCsv(orm.em.fork(), otherPlanner, id);
    expect(name).toBe("Fen edge 2027");
    // RFC 4180 §2: CRLF after every record, the last too.
    expect(csv.endsWith("\r\n")).toBe(true);
    expect(csv.split("\r\n")[0]).toBe(LIST_CSV_COLUMNS.join(","));
    const rows = parse(csv, { columns: true }) as Record<string, string>[];
    expect(rows).toHaveLength(draft.items.length);
    expect(rows.map((r) => r.position)).toEqual(draft.items.map((_, i) => String(i + 1)));
    const taxon = await orm.em.fork().findOneOrFail(PlantTaxon, { id: first });
    expect(rows[0]).toMatchObject({ scientificName: taxon.scientificName, family: taxon.family, growthForm: taxon.growthForm, regionalStatus: "native" });
    expect(rows[0]!.bloomMonths).toMatch(/^[A-Z][a-z]+(–[A-Z][a-z]+)?$/);
    // OWASP "CSV Injection": a cell starting with = is prefixed with an apostrophe.
    expect(rows[0]!.stockedBy).toBe(`'=Marsh, "Wild" Plants (plugs, available now, declared grown without systemic insecticides)`);
    expect(csv).toContain(`"'=Marsh, ""Wild"" Plants (plugs`);
    // No visits in this database: no early-spring evidence, so the evidence cells are empty.
    expect(rows[0]).toMatchObject({ earlySpringRank: "", earlySpringVisits: "", earlySpringShareLow: "", earlySpringShareHigh: "", fewRecords: "" });
  });

  it("gives the API's JSON without e-mail addresses or the share token", async () => {
    const { id, draft } = await savedNorthList();
    const token = await shareList(orm.em.fork(), owner, id);
    const body = listApiBody(await loadList(orm.em.fork(), owner, id, { alternatives: false }));
    expect(body).toMatchObject({ id, name: "Fen edge 2027", owner: { name: "Ivy Planner" }, shared: true, band: "north", months: { start: 4, end: 9 }, minPerMonth: 3 });
    expect(body.species.map((s) => s.id)).toEqual(draft.items.map((i) => i.taxonId));
    expect(body.perMonth).toHaveLength(6);
    const text = JSON.stringify(body);
    expect(text).not.toContain("@");
    expect(text).not.toContain(token);
  });
});
