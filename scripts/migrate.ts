/** Runs the committed migrations against the database chosen by VISITWORT_DB (app, test, e2e). */
import { MikroORM } from "@mikro-orm/postgresql";
import config from "../mikro-orm.config.ts";

const orm = await MikroORM.init(config);
try {
  const applied = await orm.migrator.up();
  const target = process.env.VISITWORT_DB ?? "app";
  console.log(`· ${target} database: ${applied.length ? `applied ${applied.map((m) => m.name).join(", ")}` : "schema up to date"}`);
} finally {
  await orm.close(true);
}
