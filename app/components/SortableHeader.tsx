import { flexRender, type Header } from "@tanstack/react-table";

/** A table header cell that sorts when its button is pressed, and says how it is sorted. */
export function SortableHeader<Row>({ header, sortable = header.column.getCanSort() }: { header: Header<Row, unknown>; sortable?: boolean }) {
  const sorted = header.column.getIsSorted();
  const label = flexRender(header.column.columnDef.header, header.getContext());
  return (
    <th className="px-3 py-2 font-semibold" aria-sort={sorted ? (sorted === "asc" ? "ascending" : "descending") : undefined}>
      {sortable ? (
        <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex min-h-11 items-center gap-1">
          {label}
          <span aria-hidden="true">{sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}</span>
        </button>
      ) : (
        label
      )}
    </th>
  );
}
