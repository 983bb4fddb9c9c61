/** The controlled values of planting lists and nursery stock. Pure module. */

export const STOCK_FORMS = ["plug", "container", "seed"] as const;
export type StockForm = (typeof STOCK_FORMS)[number];
export const STOCK_FORM_LABELS: Record<StockForm, string> = { plug: "Plugs", container: "Container plants", seed: "Seed" };

export const STOCK_AVAILABILITIES = ["now", "season"] as const;
export type StockAvailability = (typeof STOCK_AVAILABILITIES)[number];
export const STOCK_AVAILABILITY_LABELS: Record<StockAvailability, string> = { now: "Available now", season: "Later in the season" };
