import { useMemo, useState } from "react";
import { data, Form, useNavigation } from "react-router";
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnFiltersState,
  type SortingState,
} from "@tanstack/react-table";
import type { Route } from "./+types/users";
import { SortableHeader } from "~/components/SortableHeader";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { AccountError, inviteUser, listUsers, publicOrigin, setRoles, setStatus } from "~/auth/accounts.server";
import { fieldErrors, formToObject, inviteForm, roleList, type FieldErrors } from "~/auth/account-schemas";
import { ROLE_LABELS, ROLES, type Role } from "~/auth/roles";
import { readSetting, writeSetting } from "~/admin/settings.server";
import { Field, FormMessage, PrimaryButton, SecondaryButton } from "~/components/forms";

export const meta: Route.MetaFunction = () => [{ title: "People · Visitwort" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const me = requireUser(request, context, { roles: ["coordinator"] });
  const em = context.get(entityManagerContext);
  return { ...(await listUsers(em)), myId: me.id, openSignUp: await readSetting(em, "openSignUp") };
}

type ActionResult = { intent: string; message?: string; error?: string; fields?: FieldErrors };

export async function action({ request, context }: Route.ActionArgs) {
  const me = requireUser(request, context, { roles: ["coordinator"] });
  const em = context.get(entityManagerContext);
  const form = await request.formData();
  const intent = String(form.get("intent"));
  const refuse = (result: ActionResult) => data(result, { status: 400 });
  try {
    if (intent === "invite") {
      const parsed = inviteForm.safeParse(formToObject(form, ["roles"]));
      if (!parsed.success) return refuse({ intent, fields: fieldErrors(parsed.error) });
      await inviteUser(em, { ...parsed.data, invitedById: me.id, origin: publicOrigin(request) });
      return { intent, message: `Invitation sent to ${parsed.data.email}. The link works for 7 days.` } satisfies ActionResult;
    }
    if (intent === "sign-up-setting") {
      const open = form.get("openSignUp") === "on";
      await writeSetting(em, "openSignUp", open);
      return { intent, message: open ? "Anyone can now sign up as a recorder at /signup, after confirming their e-mail." : "Sign-up is closed: new members join by invitation." } satisfies ActionResult;
    }
    const userId = Number(form.get("userId"));
    if (!Number.isInteger(userId)) return refuse({ intent, error: "No person chosen." });
    if (intent === "roles") {
      const parsed = roleList.safeParse(form.getAll("roles"));
      if (!parsed.success) return refuse({ intent, error: parsed.error.issues[0]?.message });
      await setRoles(em, userId, parsed.data, me.id);
      return { intent, message: "Roles saved." } satisfies ActionResult;
    }
    if (intent === "deactivate" || intent === "reactivate") {
      await setStatus(em, userId, intent === "deactivate" ? "deactivated" : "active", me.id);
      return { intent, message: intent === "deactivate" ? "Deactivated: signed out everywhere, cannot sign in." : "Reactivated." } satisfies ActionResult;
    }
    return refuse({ intent, error: "Unknown action." });
  } catch (error) {
    if (error instanceof AccountError) return refuse({ intent, error: error.field ? undefined : error.message, fields: error.field ? { [error.field]: [error.message] } : undefined });
    throw error;
  }
}

type Person = Route.ComponentProps["loaderData"]["users"][number];
const column = createColumnHelper<Person>();

export default function Users({ loaderData, actionData }: Route.ComponentProps) {
  const result = actionData as ActionResult | undefined;
  const busy = useNavigation().state === "submitting";
  const [sorting, setSorting] = useState<SortingState>([{ id: "name", desc: false }]);
  const [columnFilters, setColumnFilters] = useState<ColumnFiltersState>([]);
  const [globalFilter, setGlobalFilter] = useState("");

  const columns = useMemo(
    () => [
      column.accessor("name", { header: "Name" }),
      column.accessor("email", { header: "E-mail" }),
      column.accessor("roles", {
        header: "Roles",
        enableSorting: false,
        filterFn: (row, id, value: Role | "") => !value || (row.getValue(id) as Role[]).includes(value),
        cell: (info) => <RolesEditor person={info.row.original} busy={busy} />,
      }),
      column.accessor("status", {
        header: "Status",
        filterFn: "equalsString",
        cell: (info) => (
          <span className={info.getValue() === "active" ? "text-moss-deep" : "font-semibold text-clay"}>{info.getValue()}</span>
        ),
      }),
      column.accessor("lastSignInAt", {
        header: "Last signed in",
        cell: (info) => info.getValue()?.slice(0, 10) ?? "never",
        sortUndefined: "last",
      }),
      column.display({
        id: "actions",
        header: () => <span className="sr-only">Actions</span>,
        cell: (info) =>
          info.row.original.id === loaderData.myId ? (
            <span className="text-sm text-ink-soft">you</span>
          ) : (
            <Form method="post">
              <input type="hidden" name="userId" value={info.row.original.id} />
              <SecondaryButton name="intent" value={info.row.original.status === "active" ? "deactivate" : "reactivate"} disabled={busy}>
                {info.row.original.status === "active" ? "Deactivate" : "Reactivate"}
              </SecondaryButton>
            </Form>
          ),
      }),
    ],
    [busy, loaderData.myId],
  );

  const table = useReactTable({
    data: loaderData.users,
    columns,
    state: { sorting, columnFilters, globalFilter },
    onSortingChange: setSorting,
    onColumnFiltersChange: setColumnFilters,
    onGlobalFilterChange: setGlobalFilter,
    globalFilterFn: (row, _id, value: string) =>
      `${row.original.name} ${row.original.email}`.toLowerCase().includes(value.toLowerCase()),
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });

  const filterValue = (id: string) => (columnFilters.find((f) => f.id === id)?.value as string | undefined) ?? "";
  const setFilter = (id: string, value: string) =>
    setColumnFilters((current) => [...current.filter((f) => f.id !== id), ...(value ? [{ id, value }] : [])]);

  return (
    <div className="space-y-8">
      <h1 className="text-3xl">People</h1>

      <section className="max-w-xl space-y-3 rounded-lg border border-ink/10 bg-white/50 p-4">
        <h2 className="text-xl">Invite someone</h2>
        {result?.intent === "invite" && result.message && <FormMessage tone="success">{result.message}</FormMessage>}
        {result?.intent === "invite" && result.error && <FormMessage tone="error">{result.error}</FormMessage>}
        <Form method="post" className="space-y-4" noValidate>
          <input type="hidden" name="intent" value="invite" />
          <Field label="E-mail address" name="email" type="email" errors={result?.intent === "invite" ? result.fields?.email : undefined} />
          <fieldset>
            <legend className="mb-1 font-semibold">Roles</legend>
            <div className="flex flex-wrap gap-2">
              {ROLES.map((role) => (
                <label key={role} className="inline-flex min-h-11 items-center gap-2 rounded-md border border-ink/20 bg-white px-3">
                  <input type="checkbox" name="roles" value={role} defaultChecked={role === "recorder"} className="h-5 w-5 accent-moss" />
                  {ROLE_LABELS[role]}
                </label>
              ))}
            </div>
            {result?.intent === "invite" && result.fields?.roles && (
              <p className="mt-1 text-sm font-medium text-clay" role="alert">{result.fields.roles.join(" ")}</p>
            )}
          </fieldset>
          <PrimaryButton disabled={busy}>Send the invitation</PrimaryButton>
        </Form>
        {loaderData.invitations.length > 0 && (
          <div>
            <h3 className="font-semibold">Waiting for an answer</h3>
            <ul className="text-sm">
              {loaderData.invitations.map((i) => (
                <li key={i.id}>
                  {i.email} — {i.roles.map((r) => ROLE_LABELS[r]).join(", ")} — link valid until {i.expiresAt.slice(0, 10)}
                </li>
              ))}
            </ul>
          </div>
        )}
      </section>

      <section className="max-w-xl space-y-2">
        <h2 className="text-xl">Joining without an invitation</h2>
        {result?.intent === "sign-up-setting" && result.message && <FormMessage tone="success">{result.message}</FormMessage>}
        <Form method="post" className="flex flex-wrap items-center gap-3">
          <input type="hidden" name="intent" value="sign-up-setting" />
          <label className="inline-flex min-h-11 items-center gap-2">
            <input type="checkbox" name="openSignUp" defaultChecked={loaderData.openSignUp} className="h-5 w-5 accent-moss" />
            Let people sign up as recorders themselves (each confirms through a link we send them)
          </label>
          <SecondaryButton disabled={busy}>Save</SecondaryButton>
        </Form>
      </section>

      <section className="space-y-3">
        <h2 className="text-xl">Everyone in the programme</h2>
        {result && result.intent !== "invite" && result.intent !== "sign-up-setting" && (result.message || result.error) && (
          <FormMessage tone={result.error ? "error" : "success"}>{result.error ?? result.message}</FormMessage>
        )}
        <div className="flex flex-wrap gap-3">
          <label className="block">
            <span className="block text-sm font-semibold">Name or e-mail</span>
            <input value={globalFilter} onChange={(e) => setGlobalFilter(e.target.value)} className="min-h-11 rounded-md border border-ink/30 bg-white px-3" />
          </label>
          <label className="block">
            <span className="block text-sm font-semibold">Role</span>
            <select value={filterValue("roles")} onChange={(e) => setFilter("roles", e.target.value)} className="min-h-11 rounded-md border border-ink/30 bg-white px-3">
              <option value="">any</option>
              {ROLES.map((r) => (
                <option key={r} value={r}>{ROLE_LABELS[r]}</option>
              ))}
            </select>
          </label>
          <label className="block">
            <span className="block text-sm font-semibold">Status</span>
            <select value={filterValue("status")} onChange={(e) => setFilter("status", e.target.value)} className="min-h-11 rounded-md border border-ink/30 bg-white px-3">
              <option value="">any</option>
              <option value="active">active</option>
              <option value="deactivated">deactivated</option>
            </select>
          </label>
        </div>
        <div className="overflow-x-auto rounded-lg border border-ink/10 bg-white/50">
          <table className="w-full text-left text-[0.95rem]">
            <thead className="bg-paper-deep/70">
              {table.getHeaderGroups().map((group) => (
                <tr key={group.id}>
                  {group.headers.map((header) => <SortableHeader key={header.id} header={header} />)}
                </tr>
              ))}
            </thead>
            <tbody className="divide-y divide-ink/10">
              {table.getRowModel().rows.map((row) => (
                <tr key={row.id} className="align-top">
                  {row.getVisibleCells().map((cell) => (
                    <td key={cell.id} className="px-3 py-2">
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  ))}
                </tr>
              ))}
              {table.getRowModel().rows.length === 0 && (
                <tr>
                  <td colSpan={columns.length} className="px-3 py-6 text-center text-ink-soft">Nobody matches these filters.</td>
                </tr>
              )}
            </tbody>
          </table>
        </div>
      </section>
    </div>
  );
}

function RolesEditor({ person, busy }: { person: Person; busy: boolean }) {
  return (
    <details>
      <summary className="cursor-pointer">{person.roles.map((r) => ROLE_LABELS[r]).join(", ") || "none"}</summary>
      <Form method="post" className="mt-2 space-y-2">
        <input type="hidden" name="intent" value="roles" />
        <input type="hidden" name="userId" value={person.id} />
        {ROLES.map((role) => (
          <label key={role} className="flex items-center gap-2">
            <input type="checkbox" name="roles" value={role} defaultChecked={person.roles.includes(role)} className="h-5 w-5 accent-moss" />
            {ROLE_LABELS[role]}
          </label>
        ))}
        <SecondaryButton disabled={busy}>Save roles</SecondaryButton>
      </Form>
    </details>
  );
}
