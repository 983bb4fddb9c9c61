import { useMemo } from "react";
import { Form, Link, useNavigation, useSearchParams } from "react-router";
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import type { Route } from "./+types/visits";
import { SortableHeader } from "~/components/SortableHeader";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { listVisits, type VisitListRow } from "~/visits/visits.server";
import { visitListQuery, VISIT_SORT_KEYS } from "~/visits/list-query";
import { listBeeTaxa, listPlantTaxa } from "~/taxa/taxa.server";
import { listSites } from "~/visits/sites.server";
import { CASTE_LABELS, CASTES, DETERMINATION_STATUS_LABELS, DETERMINATION_STATUSES, type DeterminationStatus } from "~/visits/vocabulary";
import { MONTH_NAMES } from "~/taxa/bloom";

export const meta: Route.MetaFunction = () => [{ title: "Visits · Visitwort" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["recorder"] });
  const em = context.get(entityManagerContext);
  const parsed = visitListQuery.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  const query = parsed.success ? parsed.data : visitListQuery.parse({});
  const { page, pageSize, sort, order, ...filters } = query;
  const [result, bees, plants, sites] = await Promise.all([
    listVisits(em, user, { filters, sort, descending: order === "desc", page, pageSize }),
    listBeeTaxa(em),
    listPlantTaxa(em),
    listSites(em),
  ]);
  return {
    ...result,
    query,
    allRecorders: user.roles.includes("coordinator"),
    bees: bees.map((b) => ({ id: b.id, scientificName: b.scientificName })),
    plants: plants.map((p) => ({ id: p.id, scientificName: p.scientificName })),
    sites,
  };
}

const STATUS_STYLE: Record<DeterminationStatus, string> = {
  proposed: "border-ink/30 text-ink-soft",
  confirmed: "border-moss bg-moss/10 text-moss-deep",
  corrected: "border-heather bg-heather/10 text-heather",
  cannot_be_determined: "border-clay bg-clay/10 text-ink",
};

export function StatusTag({ status, label }: { status: DeterminationStatus; label?: string }) {
  return (
    <span className={`inline-block whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-semibold ${STATUS_STYLE[status]}`}>
      {label ? `${label}: ` : ""}
      {DETERMINATION_STATUS_LABELS[status]}
    </span>
  );
}

const column = createColumnHelper<VisitListRow>();

export default function Visits({ loaderData }: Route.ComponentProps) {
  const { rows, total, query } = loaderData;
  const [searchParams, setSearchParams] = useSearchParams();
  const loading = useNavigation().state === "loading";
  const pages = Math.max(1, Math.ceil(total / query.pageSize));
  const filtersInUse = ["bee", "plant", "caste", "status", "month", "site"].some((key) => query[key as keyof typeof query] !== undefined);

  const columns = useMemo(
    () => [
      column.accessor("firstPhotoId", {
        header: () => <span className="sr-only">Photo</span>,
        enableSorting: false,
        cell: (info) =>
          info.getValue() ? (
            <img src={`/photos/${info.getValue()}`} alt="" loading="lazy" className="h-12 w-12 rounded object-cover" />
          ) : (
            <span className="block h-12 w-12 rounded bg-ink/5" />
          ),
      }),
      column.accessor("eventDate", {
        id: "eventDate",
        header: "Date",
        cell: (info) => (
          <Link to={`/visits/${info.row.original.id}`} className="font-semibold">
            {info.row.original.eventLocalDate}
          </Link>
        ),
      }),
      column.accessor("plantName", {
        id: "plant",
        header: "Plant",
        cell: (info) =>
          info.getValue() ? (
            <span>
              <i>{info.getValue()}</i>
              <span className="block text-xs text-ink-soft">{info.row.original.plantVernacular}</span>
            </span>
          ) : (
            <span className="text-ink-soft">not identified</span>
          ),
      }),
      column.accessor("beeName", {
        id: "bee",
        header: "Bee",
        cell: (info) => (
          <span>
            <i>{info.getValue()}</i>
            <span className="block text-xs text-ink-soft">{CASTE_LABELS[info.row.original.caste]}</span>
          </span>
        ),
      }),
      column.accessor("siteName", { id: "site", header: "Site", cell: (info) => info.getValue() ?? "—" }),
      column.accessor("plantStatus", {
        id: "plantStatus",
        header: "Verification",
        cell: (info) => (
          <span className="flex flex-col items-start gap-1">
            <StatusTag status={info.getValue()} label="Plant" />
            <StatusTag status={info.row.original.beeStatus} label="Bee" />
          </span>
        ),
      }),
      ...(loaderData.allRecorders ? [column.accessor("recorderName", { id: "recorder", header: "Recorder", enableSorting: false })] : []),
    ],
    [loaderData.allRecorders],
  );

  const sorting: SortingState = [{ id: query.sort, desc: query.order === "desc" }];
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    manualSorting: true,
    manualPagination: true,
    pageCount: pages,
    enableSortingRemoval: false,
    onSortingChange: (updater) => {
      const next = typeof updater === "function" ? updater(sorting) : updater;
      const first = next[0];
      if (!first) return;
      const params = new URLSearchParams(searchParams);
      params.set("sort", first.id);
      params.set("order", first.desc ? "desc" : "asc");
      params.delete("page");
      setSearchParams(params);
    },
    getCoreRowModel: getCoreRowModel(),
  });

  const pageLink = (page: number) => {
    const params = new URLSearchParams(searchParams);
    params.set("page", String(page));
    return `?${params}`;
  };

  return (
    <div className="space-y-5">
      <header className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-3xl">{loaderData.allRecorders ? "All visits" : "Your visits"}</h1>
          <p className="text-ink-soft">{total} {total === 1 ? "visit" : "visits"}</p>
        </div>
        <Link to="/visits/new" className="inline-flex min-h-12 items-center rounded-md bg-moss px-5 font-semibold text-paper no-underline hover:bg-moss-deep">
          Record a visit
        </Link>
      </header>

      <details open={filtersInUse || undefined} className="group rounded-lg border border-ink/10 bg-white/40 p-3 sm:border-0 sm:bg-transparent sm:p-0 sm:[&>summary]:hidden" data-filters>
      <summary className="min-h-11 cursor-pointer py-2 font-semibold">Filter{filtersInUse ? " (in use)" : ""}</summary>
      <Form method="get" className="mt-2 grid grid-cols-2 gap-2 sm:mt-0 sm:grid-cols-3 lg:grid-cols-6" aria-label="Filter visits">
        <input type="hidden" name="sort" value={query.sort} />
        <input type="hidden" name="order" value={query.order} />
        <Filter label="Bee" name="bee" value={query.bee} options={[["unsure", "Bombus sp. (not sure)"], ...loaderData.bees.map((b) => [String(b.id), b.scientificName] as [string, string])]} />
        <Filter label="Caste" name="caste" value={query.caste} options={CASTES.map((c) => [c, CASTE_LABELS[c]] as [string, string])} />
        <Filter label="Plant" name="plant" value={query.plant} options={[["not_identified", "Not identified"], ...loaderData.plants.map((p) => [String(p.id), p.scientificName] as [string, string])]} />
        <Filter label="Plant status" name="status" value={query.status} options={DETERMINATION_STATUSES.map((s) => [s, DETERMINATION_STATUS_LABELS[s]] as [string, string])} />
        <Filter label="Month" name="month" value={query.month} options={MONTH_NAMES.map((m, i) => [String(i + 1), m] as [string, string])} />
        <Filter label="Site" name="site" value={query.site} options={loaderData.sites.map((s) => [String(s.id), s.name] as [string, string])} />
        <div className="col-span-2 flex gap-2 sm:col-span-3 lg:col-span-6">
          <button type="submit" className="min-h-11 rounded-md bg-moss px-4 font-semibold text-paper">Filter</button>
          <Link to="/visits" className="inline-flex min-h-11 items-center rounded-md border border-ink/25 px-4 text-ink no-underline">Clear</Link>
        </div>
      </Form>
      </details>

      {/* Phones get cards; the table needs more width than a phone has. */}
      <ul className="space-y-2 sm:hidden" aria-label="Visits">
        {rows.map((row) => (
          <li key={row.id} data-testid="visit-card">
            <Link to={`/visits/${row.id}`} className="flex gap-3 rounded-lg border border-ink/10 bg-white/60 p-2 text-ink no-underline">
              {row.firstPhotoId ? (
                <img src={`/photos/${row.firstPhotoId}`} alt="" loading="lazy" className="h-16 w-16 flex-none rounded object-cover" />
              ) : (
                <span className="h-16 w-16 flex-none rounded bg-ink/5" />
              )}
              <span className="min-w-0 flex-1 space-y-0.5">
                <span className="block text-sm text-ink-soft">{row.eventLocalDate}{row.siteName ? ` · ${row.siteName}` : ""}</span>
                <span className="block truncate">{row.plantName ? <i>{row.plantName}</i> : "Plant not identified"}</span>
                <span className="block truncate text-sm"><i>{row.beeName}</i> · {CASTE_LABELS[row.caste]}</span>
                <span className="flex flex-wrap gap-1"><StatusTag status={row.plantStatus} label="Plant" /><StatusTag status={row.beeStatus} label="Bee" /></span>
              </span>
            </Link>
          </li>
        ))}
        {rows.length === 0 && <li className="py-6 text-center text-ink-soft">No visits match.</li>}
      </ul>

      <div className={`hidden overflow-x-auto sm:block rounded-lg border border-ink/10 bg-white/50 ${loading ? "opacity-60" : ""}`}>
        <table className="w-full text-left text-[0.95rem]">
          <thead className="bg-paper-deep/70">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => (
                  <SortableHeader key={header.id} header={header} sortable={header.column.getCanSort() && (VISIT_SORT_KEYS as readonly string[]).includes(header.column.id)} />
                ))}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink/10">
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="align-top" data-testid="visit-row">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2">{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>
                ))}
              </tr>
            ))}
            {rows.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-8 text-center text-ink-soft">
                  No visits match. <Link to="/visits/new">Record one</Link>.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>

      <nav aria-label="Pages" className="flex items-center justify-between gap-2">
        {query.page > 1 ? <Link to={pageLink(query.page - 1)} className="inline-flex min-h-11 items-center rounded-md border border-ink/25 px-4 no-underline">← Previous</Link> : <span />}
        <span className="text-sm text-ink-soft">Page {query.page} of {pages}</span>
        {query.page < pages ? <Link to={pageLink(query.page + 1)} className="inline-flex min-h-11 items-center rounded-md border border-ink/25 px-4 no-underline">Next →</Link> : <span />}
      </nav>
    </div>
  );
}

function Filter({ label, name, value, options }: { label: string; name: string; value: string | number | undefined; options: [string, string][] }) {
  return (
    <label className="block text-sm">
      <span className="block font-semibold">{label}</span>
      <select name={name} defaultValue={value === undefined ? "" : String(value)} className="min-h-11 w-full rounded-md border border-ink/30 bg-white px-2">
        <option value="">Any</option>
        {options.map(([v, text]) => (
          <option key={v} value={v}>{text}</option>
        ))}
      </select>
    </label>
  );
}
