/**
 * The demo programme's field records: an invented partnership, its sites on both sides of
 * 42° N, invented volunteers, and a few hundred visits over four seasons, drawn by a fixed-seed
 * generator so every run makes the same data. Nothing here describes real people or real
 * sites; the taxa are real, the visits are not.
 */
import type { EntityManager } from "@mikro-orm/postgresql";
import { BeeTaxon, Determination, Photo, PlantTaxon, Site, User, Visit } from "../../app/entities/index.ts";
import { hashPassword } from "../../app/auth/password.server.ts";
import { newSecret } from "../../app/auth/tokens.server.ts";
import { bloomMonths } from "../../app/taxa/bloom.ts";
import type { Caste, DeterminationStatus } from "../../app/visits/vocabulary.ts";
import { DEMO_ACCOUNTS } from "../../app/db/demo-seed.server.ts";

export const DEMO_PARTNERSHIP = "Two Rivers Bumble Bee Watch";

export const DEMO_SITES = [
  // South of 42° N
  { name: "Hollow Oak Savanna", decimalLatitude: 41.4127, decimalLongitude: -88.2391, habitat: "oak savanna with spring ephemerals", isoRegionCode: "US-IL" },
  { name: "Cattail Bend Fen", decimalLatitude: 41.6572, decimalLongitude: -86.9018, habitat: "calcareous fen and sedge meadow", isoRegionCode: "US-IN" },
  { name: "Quarry Ridge Prairie", decimalLatitude: 41.2235, decimalLongitude: -83.6644, habitat: "restored tallgrass prairie", isoRegionCode: "US-OH" },
  { name: "Millrace Woodlot", decimalLatitude: 41.8813, decimalLongitude: -87.9920, habitat: "mesic woodland edge and shrub thicket", isoRegionCode: "US-IL" },
  // North of 42° N
  { name: "Birch Hollow Barrens", decimalLatitude: 44.3571, decimalLongitude: -89.8112, habitat: "pine barrens with blueberry heath", isoRegionCode: "US-WI" },
  { name: "Tamarack Edge Meadow", decimalLatitude: 43.0844, decimalLongitude: -85.1127, habitat: "wet meadow beside a tamarack swamp", isoRegionCode: "US-MI" },
  { name: "Sandhill Crane Marsh", decimalLatitude: 42.6213, decimalLongitude: -89.0365, habitat: "marsh margin and old field", isoRegionCode: "US-WI" },
  { name: "Cedar Bluff Glade", decimalLatitude: 45.0458, decimalLongitude: -93.4177, habitat: "dry bluff prairie above a river", isoRegionCode: "US-MN" },
];

const VOLUNTEERS = [
  { email: "odile.fenwick@volunteers.visitwort.test", name: "Odile Fenwick" },
  { email: "bram.ostrander@volunteers.visitwort.test", name: "Bram Ostrander" },
  { email: "keziah.lund@volunteers.visitwort.test", name: "Keziah Lund" },
  { email: "tobiah.merrow@volunteers.visitwort.test", name: "Tobiah Merrow" },
];

/** mulberry32: a tiny, well-mixed 32-bit generator; the same seed gives the same demo. */
export function seededRandom(seed: number) {
  let state = seed >>> 0;
  const next = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    next,
    int: (min: number, max: number) => min + Math.floor(next() * (max - min + 1)),
    pick: <T>(items: readonly T[]) => items[Math.floor(next() * items.length)]!,
    weighted: <T>(items: readonly { item: T; weight: number }[]) => {
      const total = items.reduce((sum, i) => sum + i.weight, 0);
      let roll = next() * total;
      for (const entry of items) {
        roll -= entry.weight;
        if (roll <= 0) return entry.item;
      }
      return items[items.length - 1]!.item;
    },
    uuid: () => {
      const hex = Array.from({ length: 32 }, () => Math.floor(next() * 16).toString(16));
      hex[12] = "4";
      hex[16] = ((parseInt(hex[16]!, 16) & 0x3) | 0x8).toString(16);
      const s = hex.join("");
      return `${s.slice(0, 8)}-${s.slice(8, 12)}-${s.slice(12, 16)}-${s.slice(16, 20)}-${s.slice(20)}`;
    },
  };
}

// Forage the demo leans towards, so the forage ranking has something to find: willows, fruit
// shrubs and spring ephemerals for queens; bergamot, asters and goldenrods later (Mola et al.
// 2021, BioScience 71; Wolf et al. 2022, Natural Areas Journal 42 — as a tendency, not data).
const FAVOURED = new Map<string, number>([
  ["Salix discolor", 9], ["Salix humilis", 6], ["Prunus americana", 6], ["Prunus virginiana", 5], ["Vaccinium angustifolium", 7],
  ["Mertensia virginica", 6], ["Lonicera canadensis", 5], ["Ribes americanum", 4], ["Amelanchier laevis", 4], ["Zizia aurea", 3],
  ["Taraxacum officinale", 4], ["Monarda fistulosa", 8], ["Symphyotrichum novae-angliae", 7], ["Solidago speciosa", 5],
  ["Eutrochium maculatum", 4], ["Pycnanthemum virginianum", 4], ["Trifolium pratense", 3], ["Agastache foeniculum", 4],
]);

const BEES = new Map<string, number>([
  ["Bombus impatiens", 30], ["Bombus bimaculatus", 14], ["Bombus griseocollis", 12], ["Bombus vagans", 8], ["Bombus ternarius", 6],
  ["Bombus rufocinctus", 5], ["Bombus fervidus", 4], ["Bombus perplexus", 4], ["Bombus pensylvanicus", 3], ["Bombus affinis", 2],
  ["Bombus borealis", 2], ["Bombus citrinus", 1],
]);

function casteFor(month: number, random: ReturnType<typeof seededRandom>): Caste {
  // Queens alone in spring; workers through summer; males and new queens late (common practice, no source).
  if (month <= 5) return random.next() < 0.9 ? "queen" : "unknown";
  if (month <= 7) return random.weighted([{ item: "worker" as const, weight: 8 }, { item: "queen" as const, weight: 1 }, { item: "unknown" as const, weight: 1 }]);
  return random.weighted([{ item: "worker" as const, weight: 4 }, { item: "male" as const, weight: 3 }, { item: "queen" as const, weight: 2 }]);
}

export interface DemoVisitsSummary {
  sites: number;
  visits: number;
  photos: number;
}

/**
 * Creates the demo sites, volunteers and visits when the demo recorder has no visits yet.
 * `storePhoto` uploads a generated photo's bytes (skipped when storage is not running).
 */
export async function seedDemoVisits(
  em: EntityManager,
  options: { count?: number; storePhoto?: (key: string, bytes: Uint8Array) => Promise<void>; makePhoto?: (seed: number) => Uint8Array } = {},
): Promise<DemoVisitsSummary> {
  const demoRecorder = await em.findOne(User, { email: DEMO_ACCOUNTS.find((a) => a.roles[0] === "recorder")!.email });
  const botanist = await em.findOne(User, { email: DEMO_ACCOUNTS.find((a) => a.roles[0] === "botanist")!.email });
  const verifier = await em.findOne(User, { email: DEMO_ACCOUNTS.find((a) => a.roles[0] === "bee_verifier")!.email });
  if (!demoRecorder || !botanist || !verifier) return { sites: 0, visits: 0, photos: 0 };
  if (await em.count(Visit, { recorder: demoRecorder })) return { sites: 0, visits: 0, photos: 0 };

  const random = seededRandom(20260420);
  const count = options.count ?? 360;
  const sites: Site[] = [];
  for (const site of DEMO_SITES) {
    sites.push((await em.findOne(Site, { name: site.name })) ?? em.create(Site, { ...site, coordinateUncertaintyInMeters: 250 }));
  }
  const unusable = await hashPassword(newSecret());
  const recorders: User[] = [demoRecorder];
  for (const volunteer of VOLUNTEERS) {
    recorders.push(
      (await em.findOne(User, { email: volunteer.email })) ??
        em.create(User, { ...volunteer, passwordHash: unusable, roles: ["recorder"], status: "active", emailConfirmedAt: new Date(), lastSignInAt: null }),
    );
  }
  // Ids first: photo keys carry their recorder's id.
  await em.flush();
  const plants = await em.find(PlantTaxon, {}, { orderBy: { id: "asc" } });
  const bees = await em.find(BeeTaxon, {}, { orderBy: { id: "asc" } });
  const beeChoices = bees.filter((b) => BEES.has(b.scientificName)).map((b) => ({ item: b, weight: BEES.get(b.scientificName)! }));

  let photos = 0;
  for (let i = 0; i < count; i++) {
    const year = random.pick([2022, 2023, 2024, 2025]);
    // More visits in April and May: queen season is what the programme watches most.
    const month = random.weighted([4, 5, 6, 7, 8, 9].map((m) => ({ item: m, weight: m <= 5 ? 5 : 2 })));
    const day = random.int(1, 28);
    const site = random.pick(sites);
    const north = site.decimalLatitude >= 42;
    // Northern queens come out later (common practice, no source): no April visits far north.
    const effectiveMonth = north && month === 4 && day < 20 ? 5 : month;
    const inBloom = plants.filter((p) => p.regionalStatus !== "invasive" && bloomMonths(p.bloomStart, p.bloomEnd).has(effectiveMonth));
    const plant = random.weighted(inBloom.map((p) => ({ item: p, weight: FAVOURED.get(p.scientificName) ?? 0.3 })));
    const bee = random.weighted(beeChoices);
    const caste = casteFor(effectiveMonth, random);
    const hour = random.int(8, 17);
    const minute = random.int(0, 59);
    const local = `${year}-${String(effectiveMonth).padStart(2, "0")}-${String(day).padStart(2, "0")}T${String(hour).padStart(2, "0")}:${String(minute).padStart(2, "0")}:00`;
    // Central and Eastern daylight time; the demo sites sit in those zones in summer.
    const offset = site.decimalLongitude > -86 ? "-04:00" : "-05:00";
    const recorder = i === 0 ? demoRecorder : i % 3 === 0 ? demoRecorder : random.pick(recorders);
    const notIdentified = random.next() < 0.05;
    const visit = em.create(Visit, {
      recorder,
      clientSubmissionId: random.uuid(),
      eventDate: new Date(`${local}${offset}`),
      eventLocalDate: local.slice(0, 10),
      eventTimeZone: offset === "-04:00" ? "America/Detroit" : "America/Chicago",
      // Within a few hundred metres of the site's centre.
      decimalLatitude: Number((site.decimalLatitude + (random.next() - 0.5) * 0.006).toFixed(6)),
      decimalLongitude: Number((site.decimalLongitude + (random.next() - 0.5) * 0.008).toFixed(6)),
      coordinateUncertaintyInMeters: random.pick([10, 15, 30, 50, 100]),
      site,
      behavior: random.weighted([
        { item: "nectar_foraging" as const, weight: 6 },
        { item: "pollen_collecting" as const, weight: 4 },
        { item: "nest_searching" as const, weight: effectiveMonth <= 5 ? 2 : 0.1 },
        { item: "resting" as const, weight: 0.5 },
      ]),
      habitatNotes: "",
      occurrenceRemarks: "",
      beeIdentificationConfidence: random.pick(["certain", "probable", "probable", "unsure"] as const),
      plantTaxon: notIdentified ? null : plant,
      plantStatus: "proposed",
      beeTaxon: bee,
      caste,
      beeStatus: "proposed",
    });
    const recordedAt = new Date(visit.eventDate.getTime() + 3600_000);
    em.create(Determination, { visit, subject: "plant", plantTaxon: visit.plantTaxon ?? null, beeTaxon: null, caste: null, identifiedBy: recorder, dateIdentified: recordedAt, status: "proposed", remarks: notIdentified ? "Plant not identified by the recorder" : "" });
    em.create(Determination, { visit, subject: "bee", plantTaxon: null, beeTaxon: bee, caste, identifiedBy: recorder, dateIdentified: recordedAt, status: "proposed" });

    // Most older records have been checked; the newest season is partly waiting.
    const checked = random.next() < (year < 2025 ? 0.85 : 0.45);
    if (checked) {
      const later = new Date(recordedAt.getTime() + random.int(1, 30) * 86400_000);
      const plantOutcome: DeterminationStatus = notIdentified ? "corrected" : random.next() < 0.9 ? "confirmed" : "corrected";
      const determinedPlant = plantOutcome === "confirmed" ? plant : random.pick(inBloom);
      em.create(Determination, { visit, subject: "plant", plantTaxon: determinedPlant, beeTaxon: null, caste: null, identifiedBy: botanist, dateIdentified: later, status: plantOutcome, remarks: plantOutcome === "corrected" ? "From the photo" : "" });
      visit.plantTaxon = determinedPlant;
      visit.plantStatus = plantOutcome;
      const beeOutcome: DeterminationStatus = random.next() < 0.88 ? "confirmed" : random.next() < 0.7 ? "corrected" : "cannot_be_determined";
      const determinedBee = beeOutcome === "corrected" ? random.weighted(beeChoices) : beeOutcome === "cannot_be_determined" ? null : bee;
      em.create(Determination, { visit, subject: "bee", plantTaxon: null, beeTaxon: determinedBee, caste: beeOutcome === "cannot_be_determined" ? null : caste, identifiedBy: verifier, dateIdentified: later, status: beeOutcome, remarks: beeOutcome === "cannot_be_determined" ? "Face not visible in the photos" : "" });
      visit.beeTaxon = determinedBee;
      visit.beeStatus = beeOutcome;
    }

    if (options.makePhoto && (i === 0 || notIdentified || random.next() < 0.12)) {
      const subject = notIdentified ? ("plant" as const) : random.pick(["bee", "plant"] as const);
      const key = `visits/u${recorder.id}/${random.uuid()}.bin`;
      const bytes = options.makePhoto(i);
      em.create(Photo, { visit, subject, storageKey: key, contentType: "image/jpeg", byteSize: bytes.byteLength, views: subject === "bee" ? ["side"] : [] });
      photos++;
      if (options.storePhoto) await options.storePhoto(key, bytes);
    }
    // Visit 1 is the demo recorder's: the access tests and the README point at it.
    if (i === 0) await em.flush();
  }
  await em.flush();
  return { sites: sites.length, visits: count, photos };
}
