import { Link } from "react-router";
import { axisTicks, formatNumber, formatPercent, formatPercentInterval, formatPercentTick } from "~/forage/chart-scale";
import type { RankingItem } from "~/forage/forage-api";

const pct = (value: number, max: number) => `${Math.min(100, Math.max(0, (value / max) * 100))}%`;

/**
 * A share and its 95 % interval on the shared axis 0..max: a line from the lower to the upper
 * limit and a dot at the share. "Few records" rows get a dashed line and a hollow dot, so they
 * stand apart in greyscale too. Hidden from screen readers; the numbers beside it say the same.
 */
export function IntervalBar({ item, max, height = 18 }: { item: RankingItem; max: number; height?: number }) {
  const middle = height / 2;
  return (
    <svg width="100%" height={height} aria-hidden="true" focusable="false" className="block overflow-visible" data-testid="interval-bar">
      {axisTicks(max).map((tick) => (
        <line key={tick} x1={pct(tick, max)} x2={pct(tick, max)} y1={0} y2={height} stroke="#24231f" strokeOpacity={tick === 0 ? 0.35 : 0.1} />
      ))}
      <line
        x1={pct(item.wilsonLow, max)}
        x2={pct(item.wilsonHigh, max)}
        y1={middle}
        y2={middle}
        stroke={item.fewRecords ? "#55524a" : "#2f472b"}
        strokeWidth={3}
        strokeLinecap="round"
        strokeDasharray={item.fewRecords ? "4 3" : undefined}
      />
      <circle cx={pct(item.share, max)} cy={middle} r={5} fill={item.fewRecords ? "#ffffff" : "#2f472b"} stroke="#24231f" strokeWidth={1.5} />
    </svg>
  );
}

/** Tick labels for the shared axis, placed over the same percentages as the bars' grid lines. */
export function IntervalAxis({ max }: { max: number }) {
  const ticks = axisTicks(max);
  return (
    <div className="relative h-5 text-xs text-ink-soft" aria-hidden="true">
      {ticks.map((tick, index) => (
        <span
          key={tick}
          className={`absolute top-0 whitespace-nowrap ${index === 0 ? "" : index === ticks.length - 1 ? "-translate-x-full" : "-translate-x-1/2"}`}
          style={{ left: pct(tick, max) }}
        >
          {formatPercentTick(tick)}
        </span>
      ))}
    </div>
  );
}

/** "few records", in words and with a dashed outline to match the dashed interval. */
export function FewRecordsFlag() {
  return <span className="inline-block whitespace-nowrap rounded-full border border-dashed border-clay px-2 py-0.5 text-xs font-semibold text-ink">few records</span>;
}

function ShareText({ item }: { item: RankingItem }) {
  return (
    <span className="whitespace-nowrap">
      <strong>{formatPercent(item.share)}</strong>{" "}
      <span className="text-xs text-ink-soft">
        <span className="sr-only">95 % interval </span>({formatPercentInterval(item.wilsonLow, item.wilsonHigh)})
      </span>
    </span>
  );
}

/** The top plants as horizontal interval bars on one axis, above the full table. */
export function RankingChart({ items, max, caption }: { items: readonly RankingItem[]; max: number; caption: string }) {
  return (
    <figure className="rounded-lg border border-ink/10 bg-white/60 p-3" data-testid="ranking-chart">
      <figcaption className="mb-2 text-sm">
        <span className="font-semibold">{caption}</span>
        <span className="block text-ink-soft">
          Dot: share of visits. Line: its 95 % interval. Dashed line and hollow dot: few records.
        </span>
      </figcaption>
      {/* The chart repeats the first rows of the table below; screen readers get it there. */}
      <div aria-hidden="true">
        <div className="grid grid-cols-1 gap-x-3 sm:grid-cols-[minmax(0,13rem)_minmax(0,1fr)_5.5rem]">
          <span className="hidden sm:block" />
          <IntervalAxis max={max} />
          <span className="hidden sm:block" />
        </div>
        <ol className="space-y-1.5 sm:space-y-1">
          {items.map((item) => (
            <li key={item.plant.id} className="grid grid-cols-[minmax(0,1fr)_auto] items-center gap-x-3 sm:grid-cols-[minmax(0,13rem)_minmax(0,1fr)_5.5rem]" data-testid="ranking-chart-row">
              <span className="truncate text-sm">
                <span className="text-ink-soft">{item.rank}.</span> <i>{item.plant.scientificName}</i>
              </span>
              <span className="col-span-2 row-start-2 sm:col-span-1 sm:row-start-1 sm:col-start-2">
                <IntervalBar item={item} max={max} />
              </span>
              <span className="text-right text-xs tabular-nums sm:col-start-3 sm:row-start-1">{formatPercent(item.share)}</span>
            </li>
          ))}
        </ol>
      </div>
    </figure>
  );
}

/** The full ranking: a table on wide screens, a list of cards on phones (same content). */
export function RankingResults({ items, max, withSelection, caption }: { items: readonly RankingItem[]; max: number; withSelection: boolean; caption: string }) {
  return (
    <>
      <div className="hidden overflow-x-auto rounded-lg border border-ink/10 bg-white/60 md:block">
        <table className="w-full text-left text-sm" data-testid="ranking-table">
          <caption className="px-3 py-2 text-left text-ink-soft">{caption}</caption>
          <thead className="bg-paper-deep/70 align-bottom">
            <tr>
              <th scope="col" className="px-2 py-2 text-right">Rank</th>
              <th scope="col" className="min-w-44 px-2 py-2">Plant</th>
              <th scope="col" className="px-2 py-2 text-right">Visits</th>
              <th scope="col" className="w-44 px-2 py-2">
                Share of visits
                <span className="block text-xs font-normal text-ink-soft">with 95 % interval</span>
              </th>
              <th scope="col" className="px-2 py-2 text-right">Sites</th>
              <th scope="col" className="px-2 py-2 text-right">Years</th>
              <th scope="col" className="px-2 py-2 text-right">Recorders</th>
              <th scope="col" className="px-2 py-2">Evidence</th>
              {withSelection && (
                <>
                  <th scope="col" className="px-2 py-2">
                    Selection ratio
                    <span className="block text-xs font-normal text-ink-soft">with interval</span>
                  </th>
                  <th scope="col" className="whitespace-nowrap px-2 py-2 text-right">Jacobs’ D</th>
                </>
              )}
            </tr>
          </thead>
          <tbody className="divide-y divide-ink/10">
            {items.map((item) => (
              <tr key={item.plant.id} className="align-top" data-testid="ranking-row">
                <td className="px-2 py-2 text-right tabular-nums">{item.rank}</td>
                <th scope="row" className="px-2 py-2 font-normal">
                  <Link to={`/checklist/${item.plant.id}`}>
                    <i>{item.plant.scientificName}</i>
                  </Link>
                  <span className="block text-xs text-ink-soft">{item.plant.family}</span>
                </th>
                <td className="px-2 py-2 text-right">{item.visits}</td>
                <td className="px-2 py-2">
                  <ShareText item={item} />
                  <span className="mt-1 block px-1.5">
                    <IntervalBar item={item} max={max} height={14} />
                  </span>
                </td>
                <td className="px-2 py-2 text-right">{item.sites}</td>
                <td className="px-2 py-2 text-right">{item.years}</td>
                <td className="px-2 py-2 text-right">{item.recorders}</td>
                <td className="px-2 py-2">{item.fewRecords ? <FewRecordsFlag /> : <span className="text-ink-soft">enough</span>}</td>
                {withSelection && (
                  <>
                    <td className="px-2 py-2">
                      <SelectionText item={item} />
                    </td>
                    <td className="px-2 py-2 text-right">{item.jacobsD === null ? (
                        <>
                          <span aria-hidden="true" className="text-ink-soft">—</span>
                          <span className="sr-only">no flower counts</span>
                        </>
                      ) : (
                        formatNumber(item.jacobsD, { signed: true })
                      )}</td>
                  </>
                )}
              </tr>
            ))}
          </tbody>
        </table>
      </div>

      <ol className="space-y-2 md:hidden" aria-label={caption} data-testid="ranking-cards">
        {items.map((item) => (
          <li key={item.plant.id} className="rounded-lg border border-ink/10 bg-white/60 p-3" data-testid="ranking-card">
            <div className="flex items-baseline gap-2">
              <span className="text-lg font-semibold tabular-nums text-ink-soft">{item.rank}.</span>
              <span className="min-w-0 flex-1">
                <Link to={`/checklist/${item.plant.id}`} className="font-medium">
                  <i>{item.plant.scientificName}</i>
                </Link>
                <span className="block text-xs text-ink-soft">{item.plant.family}</span>
              </span>
              {item.fewRecords && <FewRecordsFlag />}
            </div>
            <p className="mt-2 text-sm">
              <span className="text-ink-soft">Share of visits: </span>
              <ShareText item={item} />
            </p>
            <span className="mt-1 block px-1.5">
              <IntervalBar item={item} max={max} height={14} />
            </span>
            <p className="mt-2 text-sm tabular-nums text-ink-soft">
              {item.visits} {item.visits === 1 ? "visit" : "visits"} · {item.sites} {item.sites === 1 ? "site" : "sites"} · {item.years} {item.years === 1 ? "year" : "years"} · {item.recorders}{" "}
              {item.recorders === 1 ? "recorder" : "recorders"}
            </p>
            {withSelection && item.selectionRatio !== null && (
              <p className="mt-1 text-sm">
                <span className="text-ink-soft">Selection ratio: </span>
                <SelectionText item={item} />
                <span className="whitespace-nowrap">
                  <span className="text-ink-soft"> · Jacobs’ D: </span>
                  {formatNumber(item.jacobsD, { signed: true })}
                </span>
              </p>
            )}
          </li>
        ))}
      </ol>
    </>
  );
}

function SelectionText({ item }: { item: RankingItem }) {
  if (item.selectionRatio === null) return <NoFlowerCounts />;
  return (
    <span className="whitespace-nowrap">
      <strong>{formatNumber(item.selectionRatio)}</strong>{" "}
      <span className="text-xs text-ink-soft">
        <span className="sr-only">interval </span>({formatNumber(item.selectionLow)}–{item.selectionHigh === null ? "no upper limit" : formatNumber(item.selectionHigh)})
      </span>
    </span>
  );
}

function NoFlowerCounts() {
  return (
    <span className="text-xs text-ink-soft" title="No flowers of this plant were counted at these sites in this window">
      no flower counts
    </span>
  );
}
