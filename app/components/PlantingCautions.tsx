/**
 * The planting cautions (DESIGN.md, "Cautions to show"), one text for every page that shows a
 * planting list: the planting page, a saved list, its print view and its shared copy.
 */
export const PLANTING_CAUTIONS = [
  "Check your state’s or province’s noxious-weed and invasive-plant rules before planting; they can name species this list allows.",
  "Ask nurseries for stock grown without systemic insecticides such as neonicotinoids, which can reach nectar and pollen and harm the bees this planting is for. A declaration shown here is the nursery’s own word, not a test result.",
  "Prefer local ecotypes: seed and plants raised from sources in your own region.",
  "Site preparation, and any herbicide use for it or to clear invasive plants, follows the product label — which is the law — and qualified local advice.",
] as const;

export function PlantingCautions({ compact = false }: { compact?: boolean }) {
  return (
    <section
      aria-labelledby="planting-cautions-heading"
      data-testid="planting-cautions"
      className={`rounded-lg border-l-4 border-clay bg-clay/5 ${compact ? "p-2 text-xs print:break-inside-avoid" : "p-4 text-sm"}`}
    >
      <h2 id="planting-cautions-heading" className={compact ? "text-sm" : "text-lg"}>
        Before you plant
      </h2>
      <ul className={`list-disc pl-5 ${compact ? "mt-1 space-y-0.5" : "mt-2 space-y-1"}`}>
        {PLANTING_CAUTIONS.map((caution) => (
          <li key={caution}>{caution}</li>
        ))}
      </ul>
      {!compact && (
        <p className="mt-2">
          More in <a href="/cautions">the cautions for the field and for planting</a>.
        </p>
      )}
    </section>
  );
}
