/**
 * Seeds the database chosen by VISITWORT_DB: the checklists always; the demo programme
 * (accounts, later sites and visits) unless VISITWORT_DEMO=off. Idempotent.
 */
import { MikroORM } from "@mikro-orm/postgresql";
import config from "../mikro-orm.config.ts";
import { seedChecklists } from "../app/db/seed.server.ts";
import { seedDemoAccounts } from "../app/db/demo-seed.server.ts";
import { ChecklistError } from "../app/taxa/checklist-import.server.ts";

const orm = await MikroORM.init(config);
try {
  const summary = await seedChecklists(orm.em.fork());
  console.log(`· seeded checklists: ${summary.plantsCreated} new plant taxa, ${summary.beesCreated} new bee taxa`);
  if (process.env.VISITWORT_DEMO !== "off") {
    const accounts = await seedDemoAccounts(orm.em.fork());
    console.log(`· demo programme: ${accounts} new demo accounts`);
  }
} catch (error) {
  if (error instanceof ChecklistError) {
    console.error(error.message);
    process.exitCode = 1;
  } else throw error;
} finally {
  await orm.close(true);
}
