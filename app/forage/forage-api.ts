// The forage API as the pages read it: response shapes and one fetch that turns the API's
// `{ error, fields? }` into an Error carrying that message. Shared with the browser; no
// database or request inside.

import type { Band, SeasonName } from "./seasons";
import type { Caste } from "~/visits/vocabulary";
export type { MatrixResponse } from "./matrix-grid";

/** GET /api/forage/ranking */
export interface RankingResponse {
  window: {
    name: SeasonName | null;
    months: number[] | null;
    band: Band | "all";
    ranges: { band: Band; start: string; end: string }[];
  };
  totalVisits: number;
  items: RankingItem[];
}

export interface RankingItem {
  rank: number;
  plant: { id: number; scientificName: string; family: string };
  visits: number;
  share: number;
  wilsonLow: number;
  wilsonHigh: number;
  sites: number;
  years: number;
  recorders: number;
  fewRecords: boolean;
  selectionRatio: number | null;
  selectionLow: number | null;
  selectionHigh: number | null;
  jacobsD: number | null;
}

/** GET /api/forage/season */
export interface SeasonResponse {
  bands: {
    band: Band;
    windows: { name: SeasonName; start: string; end: string }[];
    months: ({ month: number } & Record<Caste, number>)[];
  }[];
}

/** A refusal from the API (or no answer at all), with the message to show. */
export class ForageApiError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly fields: Record<string, string[]> = {},
  ) {
    super(message);
    this.name = "ForageApiError";
  }
}

/** GETs JSON from our own API with the session cookie; a refusal throws ForageApiError. */
export async function fetchForage<T>(url: string, signal?: AbortSignal): Promise<T> {
  let response: Response;
  try {
    response = await fetch(url, { headers: { Accept: "application/json" }, credentials: "same-origin", signal });
  } catch (error) {
    if (signal?.aborted) throw error;
    throw new ForageApiError("The server could not be reached. Check the connection and try again.", 0);
  }
  if (response.ok) return (await response.json()) as T;
  let body: { error?: unknown; fields?: unknown } = {};
  try {
    body = await response.json();
  } catch {
    // Not our JSON (a proxy's error page, say): fall back to the status.
  }
  const message = typeof body.error === "string" && body.error ? body.error : `The server answered ${response.status}. Try again in a moment.`;
  const fields = body.fields && typeof body.fields === "object" ? (body.fields as Record<string, string[]>) : {};
  throw new ForageApiError(message, response.status, fields);
}
