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
  pool: {
    min: 0,
    max: 10,
    // The forage rollups' aggregates sort some 100,000 rows; PostgreSQL's default 4 MB of sort
    // memory sends that to disk. Per connection, so it holds on any server the app is pointed at.
    afterCreate(connection: { query(sql: string, done: (error?: Error) => void): void }, done: (error: Error | undefined, connection: unknown) => void) {
      connection.query("SET work_mem = '32MB'", (error) => done(error, connection));
    },
  },
});
