import { useMemo, useState } from "react";
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { SortableHeader } from "~/components/SortableHeader";
import type { GridRow, MatrixGrid } from "~/forage/matrix-grid";

const column = createColumnHelper<GridRow>();

/**
 * The matrix's numbers as a table, for screen readers, for copying, and for anyone who would
 * rather read figures than shades. Every column sorts; plants are row headers.
 */
export function MatrixTable({ grid, caption }: { grid: MatrixGrid; caption: string }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "total", desc: true }]);
  const columns = useMemo(
    () => [
      column.accessor("plant", {
        id: "plant",
        header: "Plant",
        sortingFn: "text",
        sortDescFirst: false,
        cell: (info) => <i>{info.getValue()}</i>,
      }),
      ...grid.columns.map((gridColumn, index) =>
        column.accessor((row) => row.values[index]!, {
          id: `column-${index}`,
          header: () => (gridColumn.scientificName ? <i className="font-semibold">{gridColumn.label}</i> : <span title={gridColumn.label}>{gridColumn.shortLabel}</span>),
          sortDescFirst: true,
          cell: (info) => <span className={info.getValue() === 0 ? "text-ink-soft/70" : ""}>{info.getValue()}</span>,
        }),
      ),
      column.accessor("total", { id: "total", header: "Total", sortDescFirst: true, cell: (info) => <strong>{info.getValue()}</strong> }),
    ],
    [grid],
  );
  const table = useReactTable({
    data: grid.rows,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    enableSortingRemoval: false,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });

  return (
    <div className="overflow-x-auto rounded-lg border border-ink/10 bg-white/60" data-testid="forage-matrix-table">
      <table className="min-w-full text-left text-sm">
        {/* The table may be wider than the screen; the caption stays in view while it scrolls. */}
        <caption className="text-left text-sm text-ink-soft">
          <span className="sticky left-0 block w-[min(calc(100vw-2.5rem),62rem)] px-3 py-2">{caption}</span>
        </caption>
        <thead className="bg-paper-deep/70 align-bottom">
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => (
                <SortableHeader key={header.id} header={header} />
              ))}
            </tr>
          ))}
        </thead>
        <tbody className="divide-y divide-ink/10">
          {table.getRowModel().rows.map((row) => (
            <tr key={row.id}>
              {row.getVisibleCells().map((cell, index) =>
                index === 0 ? (
                  <th key={cell.id} scope="row" className="sticky left-0 max-w-[9.5rem] bg-paper px-3 py-1.5 font-normal sm:max-w-none sm:whitespace-nowrap">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </th>
                ) : (
                  <td key={cell.id} className="px-3 py-1.5 text-right">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ),
              )}
            </tr>
          ))}
        </tbody>
        <tfoot className="border-t-2 border-ink/20">
          <tr>
            <th scope="row" className="sticky left-0 bg-paper px-3 py-1.5">
              All plants
            </th>
            {grid.columnTotals.map((total, index) => (
              <td key={index} className="px-3 py-1.5 text-right font-semibold">
                {total}
              </td>
            ))}
            <td className="px-3 py-1.5 text-right font-bold">{grid.total}</td>
          </tr>
        </tfoot>
      </table>
    </div>
  );
}
