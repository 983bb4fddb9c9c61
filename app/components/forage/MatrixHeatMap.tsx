import { useMemo } from "react";
import { HeatMap, type ComputedCell } from "@nivo/heatmap";
import { classOf, EMPTY_CELL_COLOUR, type CountClass } from "~/forage/colour-scale";
import type { MatrixGrid } from "~/forage/matrix-grid";

interface Datum {
  x: string;
  y: number | null;
}

const CELL = 28;
const LABEL_FONT = 12;
// Rough width of a character of 12 px system sans in italics; names are measured before the
// page has fonts, so this errs wide.
const CHAR_WIDTH = 6.6;
const MAX_LABEL_CHARS = 30;

const shorten = (name: string) => (name.length > MAX_LABEL_CHARS ? `${name.slice(0, MAX_LABEL_CHARS - 1)}…` : name);

/**
 * The matrix as a heat map: plants down the side, bees or months across, each cell coloured
 * by its count class and carrying the number. The chart is sized from the data (one fixed cell
 * size) and scrolls sideways inside its box on narrow screens.
 */
export function MatrixHeatMap({ grid, classes, rows, label }: { grid: MatrixGrid; classes: readonly CountClass[]; rows: MatrixGrid["rows"]; label: string }) {
  const data = useMemo(
    () =>
      rows.map((row) => ({
        id: row.plant,
        data: grid.columns.map((column, i) => ({ x: column.key, y: row.values[i]! > 0 ? row.values[i]! : null })),
      })),
    [grid, rows],
  );
  const columnLabels = useMemo(() => new Map(grid.columns.map((c) => [c.key, c.shortLabel])), [grid]);
  const columnNames = useMemo(() => new Map(grid.columns.map((c) => [c.key, c.label])), [grid]);

  const longestPlant = Math.max(0, ...rows.map((r) => shorten(r.plant).length));
  const beeColumns = grid.view === "bee-plant";
  const longestColumn = Math.max(0, ...grid.columns.map((c) => shorten(c.shortLabel).length));
  const margin = {
    top: beeColumns ? Math.ceil(longestColumn * CHAR_WIDTH) + 16 : 30,
    right: 12,
    bottom: 8,
    left: Math.ceil(longestPlant * CHAR_WIDTH) + 14,
  };
  const width = margin.left + grid.columns.length * CELL + margin.right;
  const height = margin.top + rows.length * CELL + margin.bottom;

  const colourOf = (value: number | null) => (value ? classOf(classes, value)?.colour ?? EMPTY_CELL_COLOUR : EMPTY_CELL_COLOUR);
  const textOf = (value: number | null) => (value ? classOf(classes, value)?.textColour ?? "#24231f" : "#24231f");

  return (
    <div className="overflow-x-auto rounded-lg border border-ink/10 bg-white/60 p-2" data-testid="forage-heatmap">
      <div style={{ width, height }}>
        <HeatMap<Datum, object>
          data={data}
          width={width}
          height={height}
          margin={margin}
          animate={false}
          xInnerPadding={0.06}
          yInnerPadding={0.06}
          colors={(cell) => colourOf(cell.value)}
          emptyColor={EMPTY_CELL_COLOUR}
          borderWidth={0}
          enableLabels
          label={(cell) => (cell.value ? String(cell.value) : "")}
          labelTextColor={(cell) => textOf(cell.value)}
          hoverTarget="cell"
          inactiveOpacity={1}
          axisLeft={{ tickSize: 0, tickPadding: 6, format: (value: string) => shorten(value) }}
          axisTop={{
            tickSize: 0,
            tickPadding: 6,
            tickRotation: beeColumns ? -90 : 0,
            format: (value: string) => shorten(columnLabels.get(value) ?? value),
          }}
          theme={{
            text: { fontFamily: "system-ui, sans-serif", fontSize: LABEL_FONT, fill: "#24231f" },
            axis: { ticks: { text: { fontSize: LABEL_FONT, fill: "#24231f", fontStyle: beeColumns ? "italic" : "normal" } } },
            labels: { text: { fontSize: 11, fontWeight: 600 } },
          }}
          tooltip={({ cell }: { cell: ComputedCell<Datum> }) => (
            <div className="rounded-md border border-ink/15 bg-white px-2 py-1 text-sm shadow">
              <i>{cell.serieId}</i>
              <br />
              {beeColumns ? <i>{columnNames.get(String(cell.data.x))}</i> : columnNames.get(String(cell.data.x))}:{" "}
              <strong>{cell.value ?? 0}</strong> {cell.value === 1 ? "visit" : "visits"}
            </div>
          )}
          role="img"
          ariaLabel={label}
        />
      </div>
    </div>
  );
}

/** The count classes as swatches, lightest to darkest, with "no visits" first. */
export function HeatLegend({ classes }: { classes: readonly CountClass[] }) {
  return (
    <figure className="text-sm">
      <figcaption className="mb-1 font-semibold">Visits per cell</figcaption>
      <ul className="flex flex-wrap gap-x-3 gap-y-1" data-testid="heat-legend">
        <li className="flex items-center gap-1.5">
          <span className="inline-block h-4 w-6 rounded-sm border border-ink/25" style={{ background: EMPTY_CELL_COLOUR }} />
          none
        </li>
        {classes.map((c) => (
          <li key={c.label} className="flex items-center gap-1.5">
            <span className="inline-block h-4 w-6 rounded-sm border border-ink/10" style={{ background: c.colour }} />
            {c.label}
          </li>
        ))}
      </ul>
      <p className="mt-1 text-xs text-ink-soft">Darker means more visits; every cell also carries its number.</p>
    </figure>
  );
}
