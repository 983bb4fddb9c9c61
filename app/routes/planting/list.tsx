import { data, Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/list";
import { requireUser } from "~/auth/permissions.server";
import { publicOrigin } from "~/auth/accounts.server";
import { entityManagerContext } from "~/db/orm.server";
import { loadList, PlantingListNotFound } from "~/planting/lists.server";
import { runListAction, type ListActionResult } from "~/planting/list-actions.server";
import { describeSettings } from "~/planting/plan-words";
import { Field, FormMessage, PrimaryButton, SecondaryButton } from "~/components/forms";
import { PlantingCautions } from "~/components/PlantingCautions";
import { BloomChart, SpeciesList, SwapPanel, UnmetMonths } from "~/components/planting/PlanParts";

export const meta: Route.MetaFunction = ({ loaderData }) => [{ title: `${loaderData?.list.name ?? "Planting list"} · Visitwort` }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["planner"] });
  try {
    const list = await loadList(context.get(entityManagerContext), user, params.listId);
    return { list, shareUrl: list.shareToken ? `${publicOrigin(request)}/planting/shared/${list.shareToken}` : null, saved: new URL(request.url).searchParams.has("saved") };
  } catch (error) {
    if (error instanceof PlantingListNotFound) throw data(error.message, { status: 404 });
    throw error;
  }
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = requireUser(request, context, { roles: ["planner"] });
  const { status, result } = await runListAction(context.get(entityManagerContext), user, params.listId, await request.formData());
  return data<ListActionResult>(result, { status });
}

const dateOnly = (iso: string) => iso.slice(0, 10);

export default function PlantingListPage({ loaderData, actionData }: Route.ComponentProps) {
  const { list, shareUrl, saved } = loaderData;
  const busy = useNavigation().state === "submitting";
  const { plan } = list;
  const result = actionData as ListActionResult | undefined;

  return (
    <div className="space-y-5">
      <p className="text-sm">
        <Link to="/planting">← Planting</Link>
      </p>
      <header className="space-y-1">
        <h1 className="text-3xl break-words">{list.name}</h1>
        <p className="text-sm text-ink-soft">
          Saved by {list.ownerName} · changed {dateOnly(list.updatedAt)}
        </p>
        <p className="text-sm text-ink-soft">{describeSettings(plan.settings)}</p>
      </header>

      {saved && !result && <FormMessage tone="success">Saved. Swap species below, print the list, or share a read-only link.</FormMessage>}
      {result?.message && <FormMessage tone="success">{result.message}</FormMessage>}
      {result?.error && <FormMessage tone="error">{result.error}</FormMessage>}

      <nav aria-label="This list" className="flex flex-wrap gap-2">
        <Link to={`/planting/lists/${list.id}/print`} className="inline-flex min-h-11 items-center rounded-md border border-ink/30 bg-white/70 px-4 font-medium text-ink no-underline hover:bg-white">
          Print view
        </Link>
        <a
          href={`/planting/lists/${list.id}/export.csv`}
          download
          className="inline-flex min-h-11 items-center rounded-md border border-ink/30 bg-white/70 px-4 font-medium text-ink no-underline hover:bg-white"
        >
          Download CSV
        </a>
      </nav>

      <section aria-labelledby="share-heading" className="space-y-2 rounded-lg border border-ink/10 bg-white/60 p-4" data-testid="share-panel">
        <h2 id="share-heading" className="text-xl">
          Share
        </h2>
        {list.canChange ? (
          shareUrl ? (
            <>
              <p className="text-sm">Anyone with this link can read the list (not change it) without an account. It shows no names or e-mail addresses.</p>
              <label htmlFor="share-url" className="block text-sm font-semibold">
                Share link
              </label>
              <input id="share-url" readOnly value={shareUrl} className="min-h-11 w-full rounded-md border border-ink/30 bg-white px-3 font-mono text-sm" data-testid="share-url" />
              <Form method="post">
                <input type="hidden" name="intent" value="revoke" />
                <SecondaryButton disabled={busy}>Stop sharing</SecondaryButton>
              </Form>
            </>
          ) : (
            <Form method="post" className="space-y-2">
              <p className="text-sm">Make a link that lets someone without an account — a landowner, a school, a nursery — read this list.</p>
              <input type="hidden" name="intent" value="share" />
              <SecondaryButton disabled={busy}>Create a share link</SecondaryButton>
            </Form>
          )
        ) : (
          <p className="text-sm text-ink-soft">
            {list.shared ? "This list has a share link; " : "This list is not shared; "}
            only {list.ownerName} or a coordinator can change that, rename, swap or delete.
          </p>
        )}
      </section>

      <BloomChart plan={plan} />
      <UnmetMonths plan={plan} />
      <SpeciesList
        plan={plan}
        swap={
          list.canChange
            ? (species) => (
                <SwapPanel
                  species={species}
                  minPerMonth={plan.settings.minPerMonth}
                  use={(alternative) => (
                    <Form method="post" preventScrollReset>
                      <input type="hidden" name="intent" value="swap" />
                      <input type="hidden" name="from" value={species.id} />
                      <input type="hidden" name="to" value={alternative.id} />
                      <button
                        type="submit"
                        disabled={busy}
                        aria-label={`Use ${alternative.scientificName} instead of ${species.scientificName}`}
                        className="min-h-11 rounded-md border border-moss px-3 font-semibold text-moss-deep hover:bg-moss/10 disabled:opacity-60"
                      >
                        Use instead
                      </button>
                    </Form>
                  )}
                />
              )
            : undefined
        }
      />

      {list.canChange && (
        <section aria-labelledby="manage-heading" className="space-y-3">
          <h2 id="manage-heading" className="text-xl">
            Rename or delete
          </h2>
          <Form method="post" className="space-y-2 rounded-lg border border-ink/10 bg-white/60 p-4">
            <input type="hidden" name="intent" value="rename" />
            <Field label="Name" name="name" defaultValue={list.name} required maxLength={200} autoComplete="off" errors={result?.intent === "rename" ? result.fields?.name : undefined} />
            <PrimaryButton disabled={busy}>Rename</PrimaryButton>
          </Form>
          <details className="rounded-lg border border-clay/40 bg-clay/5">
            <summary className="min-h-11 cursor-pointer px-4 py-3 font-medium">Delete this list…</summary>
            <Form method="post" className="space-y-2 border-t border-clay/20 p-4">
              <p className="text-sm">Deleting removes the list, its species and its share link for everyone. It cannot be undone.</p>
              <input type="hidden" name="intent" value="delete" />
              <button type="submit" disabled={busy} className="min-h-11 w-full rounded-md bg-clay px-5 font-semibold text-white hover:bg-clay/90 sm:w-auto">
                Delete for good
              </button>
            </Form>
          </details>
        </section>
      )}

      <PlantingCautions />
    </div>
  );
}
