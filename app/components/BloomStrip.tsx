import { EARLY_SPRING_MONTHS, MONTH_INITIALS, MONTH_NAMES, bloomMonths, describeBloom } from "~/taxa/bloom";

/**
 * Twelve narrow cells, January to December: months in bloom filled moss, the early-spring
 * window (queen emergence) outlined in pollen.
 */
export function BloomStrip({ start, end, size = "sm" }: { start: number; end: number; size?: "sm" | "lg" }) {
  const inBloom = bloomMonths(start, end);
  const cell = size === "lg" ? "h-7 w-6 text-[0.7rem]" : "h-4 w-3 text-[0.55rem]";
  return (
    <div role="img" aria-label={describeBloom(start, end)} className="inline-flex gap-px" title={describeBloom(start, end)}>
      {MONTH_INITIALS.map((initial, index) => {
        const month = index + 1;
        const blooming = inBloom.has(month);
        const earlySpring = EARLY_SPRING_MONTHS.includes(month);
        return (
          <span
            key={month}
            data-month={MONTH_NAMES[index]}
            data-bloom={blooming ? "yes" : "no"}
            className={`flex items-end justify-center rounded-[2px] leading-none ${cell} ${
              blooming ? "bg-moss text-paper" : "bg-ink/8 text-ink-soft"
            } ${earlySpring ? "ring-2 ring-pollen ring-inset" : ""}`}
          >
            {size === "lg" ? initial : null}
          </span>
        );
      })}
    </div>
  );
}
