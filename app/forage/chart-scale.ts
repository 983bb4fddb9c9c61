// Axes and number formats for the forage charts and tables. Pure module.

/**
 * The smallest 1-2-5 number (0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1, 2, …) at or above the largest
 * value, so every bar in a chart shares one axis that ends on a round figure. Shares never need
 * more than 1; nothing (or only zeros) gives 1.
 */
export function niceAxisMax(values: readonly number[], { cap }: { cap?: number } = {}): number {
  const largest = Math.max(0, ...values.filter((v) => Number.isFinite(v)));
  if (largest <= 0) return cap ?? 1;
  const power = Math.pow(10, Math.floor(Math.log10(largest)));
  // toPrecision: 2 × 0.1 must be 0.2, not 0.20000000000000001.
  const nice = [1, 2, 5, 10].map((m) => Number((m * power).toPrecision(6))).find((candidate) => candidate >= largest - 1e-12)!;
  return cap !== undefined ? Math.min(cap, nice) : nice;
}

/** Tick values from 0 to an axis maximum made by niceAxisMax: four or five even steps. */
export function axisTicks(max: number): number[] {
  if (!(max > 0)) return [0];
  const mantissa = Number((max / Math.pow(10, Math.floor(Math.log10(max)))).toPrecision(6));
  const steps = mantissa === 2 ? 4 : 5;
  return Array.from({ length: steps + 1 }, (_, i) => Number(((max * i) / steps).toPrecision(6)));
}

const NBSP = "\u00a0";

/**
 * A proportion as a percentage: one decimal below 10 %, whole numbers above (an interval of a
 * few visits is not precise to a tenth of a percent anyway). "12 %", "4.5 %", "0 %".
 */
export function formatPercent(proportion: number): string {
  if (!Number.isFinite(proportion)) return "—";
  const percent = proportion * 100;
  const text = percent === 0 ? "0" : percent < 10 ? percent.toFixed(1) : percent.toFixed(0);
  return `${text}${NBSP}%`;
}

/** An axis label: as few decimals as the tick needs ("5 %", "2.5 %", "0.2 %"). */
export function formatPercentTick(proportion: number): string {
  return `${Number((proportion * 100).toPrecision(6))}${NBSP}%`;
}

/** "4.5–12 %": an interval of two proportions. */
export function formatPercentInterval(low: number, high: number): string {
  return `${formatPercent(low).replace(`${NBSP}%`, "")}–${formatPercent(high)}`;
}

/** A ratio or index with two decimals; a sign on Jacobs' D so that "+0.40" reads as preferred. */
export function formatNumber(value: number | null, { signed = false }: { signed?: boolean } = {}): string {
  if (value === null || !Number.isFinite(value)) return "—";
  const rounded = Number(value.toFixed(2));
  if (rounded === 0) return "0.00";
  const text = Math.abs(rounded).toFixed(2);
  // U+2212, the minus sign: a hyphen is shorter than the plus and screen readers may skip it.
  return rounded < 0 ? `\u2212${text}` : signed ? `+${text}` : text;
}
