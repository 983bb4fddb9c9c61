// Saved planting lists: save, read, swap, rename, share, revoke, delete, CSV.
//
// Who may do what. Lists are programme work, so any planner may open any list (the route
// guards ask for the planner role; a coordinator passes every role check). Only the list's
// owner or a coordinator changes or deletes it. Anyone holding a list's share link sees a
// read-only copy without an account; revoking the link ends that.

import { randomBytes } from "node:crypto";
import { LockMode, type EntityManager } from "@mikro-orm/postgresql";
import { z } from "zod";
import type { CurrentUser } from "../auth/current-user.server.ts";
import { PlantingList, PlantingListItem, PlantTaxon, User } from "../entities/index.ts";
import { csvField } from "../forage/csv.ts";
import { MONTH_NAMES } from "../taxa/bloom.ts";
import { GROWTH_FORMS } from "../taxa/checklist-schema.ts";
import { coverageOptionsOf, isAllowed } from "./coverage.ts";
import { describePlan, type PlanSettings, type PlanStockOffer, type PlanView } from "./plan.ts";
import { planningGround, settingsOf } from "./plan.server.ts";
import { stockOffersFor } from "./planting.server.ts";
import { MAX_LIST_SIZE, recommendationInput, type RecommendationOptions } from "./recommend.ts";
import { applySwap, SwapRefused } from "./swap.ts";
import { STOCK_AVAILABILITY_LABELS, STOCK_FORM_LABELS } from "./vocabulary.ts";

type Viewer = Pick<CurrentUser, "id" | "roles">;

/** No list with that id (or that share link): the pages answer 404. */
export class PlantingListNotFound extends Error {
  constructor() {
    super("There is no planting list here.");
    this.name = "PlantingListNotFound";
  }
}

/** A change that was refused: 403 when it is not the viewer's to make, 400 when the input is wrong. */
export class PlantingListRefused extends Error {
  constructor(
    message: string,
    readonly status: 400 | 403,
    readonly fields?: Record<string, string[]>,
  ) {
    super(message);
    this.name = "PlantingListRefused";
  }
}

export const listName = z
  .string({ message: "Give the list a name" })
  .trim()
  .min(1, "Give the list a name")
  .max(200, "At most 200 characters for the name");

function parseName(value: unknown): string {
  const parsed = listName.safeParse(value ?? "");
  if (!parsed.success) {
    const message = parsed.error.issues[0]?.message ?? "Give the list a name";
    throw new PlantingListRefused(message, 400, { name: [message] });
  }
  return parsed.data;
}

export function mayChange(viewer: Viewer, list: { owner: { id: number } }): boolean {
  return list.owner.id === viewer.id || viewer.roles.includes("coordinator");
}

function requireChange(viewer: Viewer, list: { owner: { id: number } }) {
  if (!mayChange(viewer, list)) {
    throw new PlantingListRefused("Only the planner who saved this list, or a coordinator, can change it.", 403);
  }
}

/** Row ids arrive as text from routes; anything but a positive whole number is no list. */
function listIdOf(value: unknown): number {
  const id = typeof value === "number" ? value : Number(value);
  if (!Number.isInteger(id) || id < 1 || id > 2_147_483_647) throw new PlantingListNotFound();
  return id;
}

export interface SaveListInput {
  name: unknown;
  options: RecommendationOptions;
  /** In the list's order. */
  items: readonly { taxonId: number; reason: string }[];
}

/**
 * Saves a named list with its settings and species in one transaction. Every species must be
 * on the checklist and allowed by the settings (never invasive; native when the list is
 * native-only; one of its growth forms), since the list may have been built in another tab
 * before the checklist changed.
 */
export async function saveList(em: EntityManager, owner: Pick<CurrentUser, "id">, input: SaveListInput): Promise<{ id: number }> {
  const name = parseName(input.name);
  const ids = input.items.map((item) => item.taxonId);
  if (ids.length === 0) throw new PlantingListRefused("The list has no species to save.", 400);
  if (ids.length > MAX_LIST_SIZE) throw new PlantingListRefused(`At most ${MAX_LIST_SIZE} species in one list.`, 400);
  if (new Set(ids).size !== ids.length) throw new PlantingListRefused("A species appears twice in the list.", 400);
  const { options } = input;
  return em.transactional(async (tx) => {
    const taxa = new Map((await tx.find(PlantTaxon, { id: { $in: ids } })).map((t) => [t.id, t]));
    for (const id of ids) {
      const taxon = taxa.get(id);
      if (!taxon) throw new PlantingListRefused("A species of the list is no longer on the checklist; build the list again.", 400);
      if (!isAllowed(taxon, options)) {
        throw new PlantingListRefused(`${taxon.scientificName} is not allowed by the list's settings (invasive, introduced on a native-only list, or another growth form).`, 400);
      }
    }
    const list = tx.create(PlantingList, {
      owner: tx.getReference(User, owner.id),
      name,
      band: options.band,
      seasonStart: options.months.start,
      seasonEnd: options.months.end,
      minPerMonth: options.minPerMonth,
      sizeLimit: options.size ?? null,
      growthForms: [...options.forms],
      nativeOnly: options.nativeOnly,
      notes: "",
      shareToken: null,
    });
    input.items.forEach((item, position) => {
      tx.create(PlantingListItem, { list, plantTaxon: taxa.get(item.taxonId)!, position, reason: item.reason });
    });
    await tx.flush();
    return { id: list.id };
  });
}

/** A saved list's settings in the recommendation's terms (what the list was made with). */
export function optionsOfList(list: PlantingList): RecommendationOptions {
  return recommendationInput.parse({
    band: list.band,
    months: `${list.seasonStart}-${list.seasonEnd}`,
    minPerMonth: list.minPerMonth,
    size: list.sizeLimit ?? undefined,
    forms: list.growthForms.length > 0 ? list.growthForms : [...GROWTH_FORMS],
    nativeOnly: list.nativeOnly,
  });
}

const settingsOfList = (list: PlantingList): PlanSettings => settingsOf(optionsOfList(list));

async function itemsOf(em: EntityManager, listId: number) {
  return em.find(PlantingListItem, { list: listId }, { orderBy: { position: "asc", id: "asc" } });
}

export interface SavedListView {
  id: number;
  name: string;
  notes: string;
  ownerName: string;
  createdAt: string;
  updatedAt: string;
  /** Only for those who may change the list (the owner, a coordinator). */
  shareToken: string | null;
  shared: boolean;
  canChange: boolean;
  plan: PlanView;
}

async function viewOf(em: EntityManager, list: PlantingList, { alternatives, ownerName }: { alternatives: boolean; ownerName: string }) {
  const settings = settingsOfList(list);
  const [{ candidates, earlySpringMonths }, items] = await Promise.all([planningGround(em, list.band), itemsOf(em.fork(), list.id)]);
  const byId = new Map(candidates.map((c) => [c.id, c]));
  // Items point at checklist rows (delete is restricted), so every one is among the candidates.
  const listed = items.flatMap((item) => {
    const taxon = byId.get(item.plantTaxon.id);
    return taxon ? [{ taxon, reason: item.reason }] : [];
  });
  const offers = await stockOffersFor(em.fork(), listed.map((e) => e.taxon.id));
  return {
    id: list.id,
    name: list.name,
    notes: list.notes,
    ownerName,
    createdAt: list.createdAt.toISOString(),
    updatedAt: list.updatedAt.toISOString(),
    plan: describePlan(settings, earlySpringMonths, listed, candidates, offers, { alternatives }),
  };
}

/** A saved list for a planner: 404 when missing; alternatives for swapping only for those who may change it. */
export async function loadList(em: EntityManager, viewer: Viewer, listIdValue: unknown, { alternatives = true }: { alternatives?: boolean } = {}): Promise<SavedListView> {
  const list = await em.findOne(PlantingList, { id: listIdOf(listIdValue) }, { populate: ["owner"] });
  if (!list) throw new PlantingListNotFound();
  const canChange = mayChange(viewer, list);
  const view = await viewOf(em, list, { alternatives: alternatives && canChange, ownerName: list.owner.name });
  return { ...view, shareToken: canChange ? (list.shareToken ?? null) : null, shared: list.shareToken != null, canChange };
}

/** Share links are 32 random bytes, base64url: 43 characters of A–Z a–z 0–9 - _. */
const SHARE_TOKEN = /^[A-Za-z0-9_-]{43}$/;

export interface SharedListView {
  name: string;
  notes: string;
  updatedAt: string;
  plan: PlanView;
}

/**
 * The read-only copy behind a share link, for anyone holding it: no owner, no e-mail, no
 * alternatives. A token of the wrong shape is not looked up.
 */
export async function findSharedList(em: EntityManager, token: string): Promise<SharedListView> {
  if (!SHARE_TOKEN.test(token)) throw new PlantingListNotFound();
  const list = await em.findOne(PlantingList, { shareToken: token });
  if (!list) throw new PlantingListNotFound();
  const view = await viewOf(em, list, { alternatives: false, ownerName: "" });
  return { name: view.name, notes: view.notes, updatedAt: view.updatedAt, plan: view.plan };
}

/**
 * Runs a change with the list's row locked (FOR UPDATE), so two changes to one list do not
 * interleave: a swap is checked against the list as it is, not as it was when the page loaded.
 */
async function changeList<T>(em: EntityManager, viewer: Viewer, listIdValue: unknown, change: (tx: EntityManager, list: PlantingList) => Promise<T>): Promise<T> {
  const id = listIdOf(listIdValue);
  return em.transactional(async (tx) => {
    const list = await tx.findOne(PlantingList, { id }, { lockMode: LockMode.PESSIMISTIC_WRITE });
    if (!list) throw new PlantingListNotFound();
    requireChange(viewer, list);
    const result = await change(tx, list);
    await tx.flush();
    return result;
  });
}

/**
 * Replaces one species of a saved list with another in the same place, when the swap keeps
 * the list's coverage (app/planting/swap.ts), judged on the checklist and evidence of now.
 */
export async function swapListItem(em: EntityManager, viewer: Viewer, listId: unknown, fromTaxonId: number, toTaxonId: number): Promise<{ from: string; to: string }> {
  return changeList(em, viewer, listId, async (tx, list) => {
    const items = await itemsOf(tx, list.id);
    const { candidates, earlySpringMonths } = await planningGround(tx, list.band);
    const byId = new Map(candidates.map((c) => [c.id, c]));
    const listed = items.flatMap((item) => (byId.has(item.plantTaxon.id) ? [byId.get(item.plantTaxon.id)!] : []));
    let alternative;
    try {
      ({ alternative } = applySwap(coverageOptionsOf(optionsOfList(list), earlySpringMonths), listed, fromTaxonId, toTaxonId, candidates));
    } catch (error) {
      if (error instanceof SwapRefused) throw new PlantingListRefused(error.message, 400);
      throw error;
    }
    const item = items.find((i) => i.plantTaxon.id === fromTaxonId)!;
    item.plantTaxon = tx.getReference(PlantTaxon, toTaxonId);
    item.reason = alternative.reason;
    // The list's own row changes too, so "last changed" tells readers of a shared link.
    list.updatedAt = new Date();
    return { from: byId.get(fromTaxonId)!.scientificName, to: alternative.taxon.scientificName };
  });
}

export async function renameList(em: EntityManager, viewer: Viewer, listId: unknown, name: unknown): Promise<void> {
  const newName = parseName(name);
  await changeList(em, viewer, listId, async (_tx, list) => {
    list.name = newName;
  });
}

/**
 * Opens a share link: a random token of 256 bits (node:crypto randomBytes; at least 128 bits
 * makes guessing hopeless — common practice, no source), URL-safe. A list already shared keeps
 * its link, so a link already handed out keeps working.
 */
export async function shareList(em: EntityManager, viewer: Viewer, listId: unknown): Promise<string> {
  return changeList(em, viewer, listId, async (_tx, list) => {
    const token = list.shareToken ?? randomBytes(32).toString("base64url");
    list.shareToken = token;
    return token;
  });
}

/** Closes the share link: the old address answers 404 from now on. */
export async function revokeShare(em: EntityManager, viewer: Viewer, listId: unknown): Promise<void> {
  await changeList(em, viewer, listId, async (_tx, list) => {
    list.shareToken = null;
  });
}

/** Deletes the list and its species (the items go with it: ON DELETE CASCADE). */
export async function deleteList(em: EntityManager, viewer: Viewer, listId: unknown): Promise<void> {
  await changeList(em, viewer, listId, async (tx, list) => {
    tx.remove(list);
  });
}

export interface SavedListSummary {
  id: number;
  name: string;
  ownerName: string;
  mine: boolean;
  band: string;
  species: number;
  shared: boolean;
  updatedAt: string;
}

/** Every saved list of the programme, the latest changed first (lists are shared work). */
export async function listSavedLists(em: EntityManager, viewer: Viewer, limit = 50): Promise<SavedListSummary[]> {
  const lists = await em.find(PlantingList, {}, { populate: ["owner"], orderBy: { updatedAt: "desc", id: "desc" }, limit });
  if (lists.length === 0) return [];
  const counts = await em
    .getConnection()
    .execute<{ list_id: number; n: string }[]>(`select list_id, count(*) as n from planting_list_item where list_id in (${lists.map(() => "?").join(",")}) group by list_id`, lists.map((l) => l.id));
  const count = new Map(counts.map((row) => [Number(row.list_id), Number(row.n)]));
  return lists.map((list) => ({
    id: list.id,
    name: list.name,
    ownerName: list.owner.name,
    mine: list.owner.id === viewer.id,
    band: list.band,
    species: count.get(list.id) ?? 0,
    shared: list.shareToken != null,
    updatedAt: list.updatedAt.toISOString(),
  }));
}

// CSV ------------------------------------------------------------------------------------------

export const LIST_CSV_COLUMNS = [
  "position",
  "scientificName",
  "vernacularName",
  "family",
  "growthForm",
  "regionalStatus",
  "bloomMonths",
  "earlySpringRank",
  "earlySpringVisits",
  "earlySpringShareLow",
  "earlySpringShareHigh",
  "fewRecords",
  "stockedBy",
  "reason",
] as const;

/**
 * A spreadsheet opens a cell that starts with = + - @ (or a tab or CR) as a formula; nursery
 * names and reasons are typed by people, so such cells get a leading apostrophe (OWASP, "CSV
 * Injection").
 */
function safeText(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

function describeOffer(offer: PlanStockOffer): string {
  const parts = [STOCK_FORM_LABELS[offer.form].toLowerCase(), STOCK_AVAILABILITY_LABELS[offer.availability].toLowerCase()];
  if (offer.availabilityNote) parts.push(offer.availabilityNote);
  parts.push(offer.grownWithoutSystemicInsecticides ? "declared grown without systemic insecticides" : "no insecticide-free declaration");
  return `${offer.nurseryName} (${parts.join(", ")})`;
}

function bloomWords(start: number, end: number): string {
  return start === end ? MONTH_NAMES[start - 1]! : `${MONTH_NAMES[start - 1]}–${MONTH_NAMES[end - 1]}`;
}

/** The list as CSV (RFC 4180, CRLF), one row per species in the list's order. */
export function planCsv(plan: PlanView): string {
  const rows = plan.species.map((s, index) => [
    String(index + 1),
    s.scientificName,
    s.vernacularName ?? "",
    s.family,
    s.growthForm,
    s.regionalStatus,
    bloomWords(s.bloomStart, s.bloomEnd),
    s.evidence ? String(s.evidence.rank) : "",
    s.evidence ? String(s.evidence.visits) : "",
    s.evidence ? s.evidence.wilsonLow.toFixed(4) : "",
    s.evidence ? s.evidence.wilsonHigh.toFixed(4) : "",
    s.evidence ? (s.evidence.fewRecords ? "yes" : "no") : "",
    s.offers.map(describeOffer).join(" | "),
    s.reason,
  ]);
  return [LIST_CSV_COLUMNS as readonly string[], ...rows].map((row) => row.map((cell) => csvField(safeText(cell))).join(",") + "\r\n").join("");
}

export async function listCsv(em: EntityManager, viewer: Viewer, listId: unknown): Promise<{ name: string; csv: string }> {
  const view = await loadList(em, viewer, listId, { alternatives: false });
  return { name: view.name, csv: planCsv(view.plan) };
}

/** GET /api/planting/lists/:id: the list, its settings, species with evidence and offers, and coverage. No e-mail addresses, no share token. */
export function listApiBody(view: SavedListView) {
  const { plan } = view;
  return {
    id: view.id,
    name: view.name,
    notes: view.notes,
    owner: { name: view.ownerName },
    createdAt: view.createdAt,
    updatedAt: view.updatedAt,
    shared: view.shared,
    band: plan.settings.band,
    months: plan.settings.months,
    minPerMonth: plan.settings.minPerMonth,
    size: plan.settings.size,
    forms: plan.settings.forms,
    nativeOnly: plan.settings.nativeOnly,
    earlySpringMonths: plan.earlySpringMonths,
    species: plan.species.map((s, index) => ({
      position: index + 1,
      id: s.id,
      scientificName: s.scientificName,
      vernacularName: s.vernacularName,
      family: s.family,
      growthForm: s.growthForm,
      regionalStatus: s.regionalStatus,
      bloomStart: s.bloomStart,
      bloomEnd: s.bloomEnd,
      reason: s.reason,
      monthsCovered: s.monthsCovered,
      evidence: s.evidence,
      stockedBy: s.offers.map(({ nurseryName, form, availability, availabilityNote, sourceRegion, grownWithoutSystemicInsecticides }) => ({
        nurseryName,
        form,
        availability,
        availabilityNote,
        sourceRegion,
        grownWithoutSystemicInsecticides,
      })),
    })),
    perMonth: plan.perMonth,
    unmet: plan.unmet,
  };
}
