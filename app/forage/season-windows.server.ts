import type { EntityManager } from "@mikro-orm/postgresql";
import { SeasonWindow } from "../entities/index.ts";
import { BANDS, SEASON_NAMES, seasonWindowsSchema, type SeasonWindow as SeasonWindowRecord } from "./seasons.ts";

/** The programme's season windows, north band first, each band's seasons in the year's order. */
export async function listSeasonWindows(em: EntityManager): Promise<SeasonWindowRecord[]> {
  const rows = await em.find(SeasonWindow, {});
  const order = (w: { band: string; name: string }) =>
    BANDS.indexOf(w.band as (typeof BANDS)[number]) * 10 + SEASON_NAMES.indexOf(w.name as (typeof SEASON_NAMES)[number]);
  return rows
    .map((row) => ({ band: row.band, name: row.name, start: row.start, end: row.end }))
    .sort((a, b) => order(a) - order(b));
}

/** A refused change of the windows; nothing was written. */
export class SeasonWindowsRefused extends Error {
  constructor(
    message: string,
    readonly fields: Record<string, string[]>,
  ) {
    super(message);
    this.name = "SeasonWindowsRefused";
  }
}

/**
 * Replaces every window and refiles every visit under the new seasons in one transaction: the
 * rollup keeps no day of the month, so a moved boundary can only be honoured by a rebuild.
 * Visits written meanwhile wait on the rebuild's lock rather than being filed by old windows.
 * The caller checks the coordinator role.
 */
export async function saveSeasonWindows(em: EntityManager, input: unknown): Promise<{ windows: SeasonWindowRecord[]; rebuiltMs: number }> {
  const parsed = seasonWindowsSchema.safeParse(input);
  if (!parsed.success) {
    const fields: Record<string, string[]> = {};
    for (const issue of parsed.error.issues) {
      const [index, field] = issue.path;
      const window = typeof index === "number" ? (input as SeasonWindowRecord[])[index] : undefined;
      const key = window ? `${window.band}.${window.name}.${String(field ?? "start")}` : "windows";
      (fields[key] ??= []).push(issue.message);
    }
    throw new SeasonWindowsRefused("The season windows were not saved: " + parsed.error.issues.map((i) => i.message).join("; ") + ".", fields);
  }
  const started = performance.now();
  await em.transactional(async (tx) => {
    for (const window of parsed.data) {
      await tx.nativeUpdate(SeasonWindow, { band: window.band, name: window.name }, { start: window.start, end: window.end, updatedAt: new Date() });
    }
    await tx.getConnection().execute("select forage_count_rebuild()", [], "all", tx.getTransactionContext());
  });
  return { windows: await listSeasonWindows(em), rebuiltMs: performance.now() - started };
}
