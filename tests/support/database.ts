import { MikroORM } from "@mikro-orm/postgresql";
import { afterAll, beforeAll, beforeEach } from "vitest";
import config from "../../mikro-orm.config.ts";
import { DEFAULT_SEASON_WINDOWS } from "../../app/forage/seasons.ts";

/**
 * The real PostgreSQL test database (VISITWORT_DB=test, migrated by npm test). Each test file
 * opens its own ORM and empties the tables it needs.
 */
export async function openTestOrm(): Promise<MikroORM> {
  if (process.env.VISITWORT_DB !== "test") throw new Error("Integration tests run against VISITWORT_DB=test only");
  return MikroORM.init({ ...config, debug: false });
}

/**
 * Empties every table, restarting ids, in one statement, then puts back the default season
 * windows, which the migration wrote and the rollup trigger needs, as a fresh database has them.
 */
export async function emptyAllTables(orm: MikroORM) {
  const tables = Object.values(orm.getMetadata().getAll())
    .filter((meta) => !meta.abstract && !meta.embeddable && meta.tableName)
    .map((meta) => `"${meta.tableName}"`);
  const connection = orm.em.getConnection();
  await connection.execute(`TRUNCATE ${tables.join(", ")} RESTART IDENTITY CASCADE`);
  const values = DEFAULT_SEASON_WINDOWS.map((w) => `('${w.band}', '${w.name}', '${w.start}', '${w.end}', now())`).join(", ");
  await connection.execute(`INSERT INTO season_window (band, name, start, "end", updated_at) VALUES ${values}`);
}

/**
 * For a test file: opens the ORM once, empties every table before each test, closes at the end.
 * `receive` is handed the ORM when it is open.
 */
export function useEmptyTestDatabase(receive: (orm: MikroORM) => void) {
  let orm: MikroORM;
  beforeAll(async () => {
    orm = await openTestOrm();
    receive(orm);
  });
  afterAll(async () => {
    await orm?.close(true);
  });
  beforeEach(async () => {
    await emptyAllTables(orm);
  });
}
