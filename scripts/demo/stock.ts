/**
 * The demo nursery's stock list: a dozen native spring and summer plants, so planners see
 * offers beside their planting lists and the nursery page has something to show. Invented
 * like the rest of the demo programme: the plants are real, the nursery, its sources and its
 * declarations are not.
 */
import type { EntityManager } from "@mikro-orm/postgresql";
import { PlantTaxon, StockItem, User } from "../../app/entities/index.ts";
import { DEMO_ACCOUNTS } from "../../app/db/demo-seed.server.ts";
import type { StockAvailability, StockForm } from "../../app/planting/vocabulary.ts";

export const DEMO_NURSERY_EMAIL = DEMO_ACCOUNTS.find((account) => account.roles.length === 1 && account.roles[0] === "nursery")!.email;

interface DemoStock {
  scientificName: string;
  form: StockForm;
  sourceRegion: string;
  availability: StockAvailability;
  availabilityNote: string;
  grownWithoutSystemicInsecticides: boolean;
}

// Some of the species the default recommendation lists in both bands are stocked and some
// are not, so the nursery's "what to grow" view shows both kinds. Sources are written the
// way a small grower might put them; none names a real place or business.
export const DEMO_STOCK: readonly DemoStock[] = [
  { scientificName: "Salix discolor", form: "container", sourceRegion: "Cuttings from our own stool beds, grown from local wild plants", availability: "now", availabilityNote: "Two-litre pots", grownWithoutSystemicInsecticides: true },
  { scientificName: "Mertensia virginica", form: "plug", sourceRegion: "Seed from a floodplain woodland about 60 km from the nursery", availability: "season", availabilityNote: "From late March", grownWithoutSystemicInsecticides: true },
  { scientificName: "Heliopsis helianthoides", form: "plug", sourceRegion: "Seed from a roadside prairie remnant in the county", availability: "now", availabilityNote: "", grownWithoutSystemicInsecticides: true },
  { scientificName: "Heliopsis helianthoides", form: "seed", sourceRegion: "Seed from a roadside prairie remnant in the county", availability: "now", availabilityNote: "By the gram", grownWithoutSystemicInsecticides: true },
  { scientificName: "Campanula rotundifolia", form: "seed", sourceRegion: "Seed from a sandstone bluff within 100 km", availability: "now", availabilityNote: "Small packets only", grownWithoutSystemicInsecticides: false },
  { scientificName: "Zizia aurea", form: "plug", sourceRegion: "Seed from our own seed-production beds", availability: "now", availabilityNote: "", grownWithoutSystemicInsecticides: true },
  { scientificName: "Geranium maculatum", form: "container", sourceRegion: "Divisions of plants rescued from a building site nearby", availability: "now", availabilityNote: "", grownWithoutSystemicInsecticides: true },
  { scientificName: "Penstemon digitalis", form: "plug", sourceRegion: "Seed from a wet meadow about 40 km away", availability: "season", availabilityNote: "From June", grownWithoutSystemicInsecticides: false },
  { scientificName: "Amelanchier laevis", form: "container", sourceRegion: "Bought-in liners, origin not known", availability: "season", availabilityNote: "Autumn planting season", grownWithoutSystemicInsecticides: false },
  { scientificName: "Lupinus perennis", form: "seed", sourceRegion: "Seed from a sand prairie in the region", availability: "now", availabilityNote: "", grownWithoutSystemicInsecticides: true },
  { scientificName: "Monarda fistulosa", form: "plug", sourceRegion: "Seed from our own seed-production beds", availability: "now", availabilityNote: "", grownWithoutSystemicInsecticides: true },
  { scientificName: "Phlox pilosa", form: "plug", sourceRegion: "", availability: "season", availabilityNote: "From May", grownWithoutSystemicInsecticides: false },
];

/**
 * Adds the demo stock entries the demo nursery does not have yet (by plant and form). Entries
 * it already has are left as they are, edits included; re-running adds nothing. Plants missing
 * from the checklist, or not native to it, are skipped: the demo never offers anything else.
 */
export async function seedDemoStock(em: EntityManager): Promise<number> {
  const nursery = await em.findOne(User, { email: DEMO_NURSERY_EMAIL });
  if (!nursery) return 0;
  const taxa = await em.find(PlantTaxon, { scientificName: { $in: [...new Set(DEMO_STOCK.map((entry) => entry.scientificName))] }, regionalStatus: "native" });
  const byName = new Map(taxa.map((taxon) => [taxon.scientificName, taxon]));
  const held = new Set((await em.find(StockItem, { nursery })).map((item) => `${item.plantTaxon.id}:${item.form}`));
  let created = 0;
  for (const { scientificName, ...entry } of DEMO_STOCK) {
    const taxon = byName.get(scientificName);
    if (!taxon || held.has(`${taxon.id}:${entry.form}`)) continue;
    em.create(StockItem, { ...entry, nursery, plantTaxon: taxon });
    created++;
  }
  await em.flush();
  return created;
}
