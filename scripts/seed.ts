/**
 * Seeds the database chosen by VISITWORT_DB: the checklists always; the demo programme
 * (accounts, later sites and visits) unless VISITWORT_DEMO=off. Idempotent.
 */
import { MikroORM } from "@mikro-orm/postgresql";
import config from "../mikro-orm.config.ts";
import { seedChecklists } from "../app/db/seed.server.ts";
import { seedDemoAccounts } from "../app/db/demo-seed.server.ts";
import { ChecklistError } from "../app/taxa/checklist-import.server.ts";
import { seedDemoVisits } from "./demo/visits.ts";
import { seedDemoFloralCounts } from "./demo/floral-counts.ts";
import { seedDemoStock } from "./demo/stock.ts";
import { putPhotoBytes, storageStatus } from "../app/storage/s3.server.ts";
import { makeJpegWithExif } from "../tests/support/photos.ts";

const orm = await MikroORM.init(config);
try {
  const summary = await seedChecklists(orm.em.fork());
  console.log(`· seeded checklists: ${summary.plantsCreated} new plant taxa, ${summary.beesCreated} new bee taxa`);
  if (process.env.VISITWORT_DEMO !== "off") {
    const accounts = await seedDemoAccounts(orm.em.fork());
    // Photo bytes go to storage when it runs (npm start starts it first); the records stand either way.
    let storage = await storageStatus();
    // npm start starts the storage fake alongside; give it a few seconds to listen.
    for (let tries = 0; !storage.ok && process.env.VISITWORT_EXPECT_STORAGE && tries < 20; tries++) {
      await new Promise((resolve) => setTimeout(resolve, 500));
      storage = await storageStatus();
    }
    const visits = await seedDemoVisits(orm.em.fork(), {
      makePhoto: (seed) => makeJpegWithExif({ width: 480, height: 360, pattern: "petals", quality: 70, description: `Visitwort demo photo ${seed}` }),
      storePhoto: storage.ok ? (key, bytes) => putPhotoBytes(key, bytes, "image/jpeg") : undefined,
    });
    console.log(
      `· demo programme: ${accounts} new demo accounts, ${visits.visits} new visits at ${visits.sites} sites, ${visits.photos} photos` +
        (visits.photos && !storage.ok ? " (photo files not stored: photo storage is not running)" : ""),
    );
    const flowers = await seedDemoFloralCounts(orm.em.fork());
    console.log(`· demo floral counts: ${flowers.surveys} new surveys, ${flowers.counts} new counts`);
    console.log(`· demo nursery stock: ${await seedDemoStock(orm.em.fork())} new stock entries`);
  }
} catch (error) {
  if (error instanceof ChecklistError) {
    console.error(error.message);
    process.exitCode = 1;
  } else throw error;
} finally {
  await orm.close(true);
}
