import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { BANDS, SEASON_NAMES } from "../forage/seasons.ts";

/**
 * One season of the bumble-bee year in one band, as the programme's coordinator set it. The
 * rollup trigger reads this table to file each visit under its season; changing a window
 * rebuilds the rollup (app/forage/forage.server.ts).
 */
export const SeasonWindow = defineEntity({
  name: "SeasonWindow",
  tableName: "season_window",
  uniques: [{ name: "season_window_band_name_unique", properties: ["band", "name"] }],
  properties: {
    id: p.integer().primary().autoincrement(),
    band: p.enum([...BANDS]),
    name: p.enum([...SEASON_NAMES]),
    // "MM-DD", inclusive; end before start runs over New Year.
    start: p.string().length(5),
    end: p.string().length(5),
    updatedAt: p.datetime().onCreate(() => new Date()).onUpdate(() => new Date()),
  },
});

export type SeasonWindow = InferEntity<typeof SeasonWindow>;
