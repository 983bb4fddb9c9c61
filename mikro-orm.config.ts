import { defineConfig } from "@mikro-orm/postgresql";
import { Migrator } from "@mikro-orm/migrations";
import { entities } from "./app/entities/index.ts";
import { databaseUrl } from "./app/db/database-url.server.ts";

/**
 * One configuration for the app, the migration CLI and the seeder. The app passes the
 * migrations it bundled itself (file discovery does not work inside a Vite build); the CLI
 * finds them in migrations/.
 */
export default defineConfig({
  clientUrl: databaseUrl(),
  entities,
  extensions: [Migrator],
  migrations: {
    path: "./migrations",
    pathTs: "./migrations",
    glob: "Migration*.ts",
    // New migrations are diffed against the migrated database itself (npm run db:up &&
    // npm run db:migrate first), not a snapshot file that hand-written steps leave stale.
    snapshot: false,
    transactional: true,
    allOrNothing: true,
    emit: "ts",
  },
  // Entities are defined with defineEntity: no reflection, no decorators.
  discovery: { warnWhenNoEntities: true },
  debug: process.env.VISITWORT_SQL_DEBUG === "1",
  pool: { min: 0, max: 10 },
});
