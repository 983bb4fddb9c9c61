/** Months as numbers 1–12, as the checklists store them. */
export const MONTH_NAMES = [
  "January", "February", "March", "April", "May", "June",
  "July", "August", "September", "October", "November", "December",
] as const;
export const MONTH_INITIALS = ["J", "F", "M", "A", "M", "J", "J", "A", "S", "O", "N", "D"] as const;

/**
 * April and May: when bumble-bee queens leave hibernation and found nests in the region's
 * south and north bands alike (common practice, no source; editable season windows come later).
 */
export const EARLY_SPRING_MONTHS = [4, 5];

/** The set of months a taxon is in bloom; a range that wraps past December is allowed. */
export function bloomMonths(start: number, end: number): Set<number> {
  const months = new Set<number>();
  if (start <= end) for (let m = start; m <= end; m++) months.add(m);
  else {
    for (let m = start; m <= 12; m++) months.add(m);
    for (let m = 1; m <= end; m++) months.add(m);
  }
  return months;
}

export function describeBloom(start: number, end: number): string {
  const from = MONTH_NAMES[start - 1];
  const to = MONTH_NAMES[end - 1];
  return start === end ? `Blooms in ${from}` : `Blooms ${from} to ${to}`;
}

export function bloomsInEarlySpring(start: number, end: number): boolean {
  const months = bloomMonths(start, end);
  return EARLY_SPRING_MONTHS.some((m) => months.has(m));
}
