import { useEffect, useRef, useState } from "react";
import { data, Link, useNavigation } from "react-router";
import type { Route } from "./+types/nursery";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { listStock, recommendedWithStock, removeStockEntry, saveStockEntry, StockRefused } from "~/nursery/stock.server";
import { stockFormToInput, type StockFieldErrors } from "~/nursery/stock-schema";
import { STOCK_FORM_LABELS } from "~/planting/vocabulary";
import type { PlantTaxonRecord } from "~/taxa/taxon-record";
import { usePlantChecklist } from "~/components/PlantPicker";
import { FormMessage } from "~/components/forms";
import { AddStockForm, StockCautions, StockTable, WhatToGrow } from "./StockParts";

export const meta: Route.MetaFunction = () => [{ title: "Nursery stock · Visitwort" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["nursery"] });
  const em = context.get(entityManagerContext);
  const stock = await listStock(em, user.id);
  const whatToGrow = await recommendedWithStock(em, user.id);
  return { stock, whatToGrow };
}

type ActionResult = { intent: string; message?: string; error?: string; fields?: StockFieldErrors };

export async function action({ request, context }: Route.ActionArgs) {
  const user = requireUser(request, context, { roles: ["nursery"] });
  const em = context.get(entityManagerContext);
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "");
  try {
    if (intent === "add") {
      const { entry, created } = await saveStockEntry(em, user.id, stockFormToInput(form));
      const what = `${entry.taxon.scientificName} (${STOCK_FORM_LABELS[entry.form].toLowerCase()})`;
      return { intent, message: created ? `Added ${what} to your stock list.` : `Updated ${what} on your stock list.` } satisfies ActionResult;
    }
    if (intent === "remove") {
      const id = Number(form.get("stockItemId"));
      if (!Number.isInteger(id) || id <= 0) return data({ intent, error: "No stock entry chosen." } satisfies ActionResult, { status: 400 });
      const removed = await removeStockEntry(em, user.id, id);
      return { intent, message: `Removed ${removed.scientificName} (${STOCK_FORM_LABELS[removed.form].toLowerCase()}) from your stock list.` } satisfies ActionResult;
    }
    return data({ intent, error: "Unknown action." } satisfies ActionResult, { status: 400 });
  } catch (error) {
    if (error instanceof StockRefused) return data({ intent, error: error.message, fields: error.fields } satisfies ActionResult, { status: error.status });
    throw error;
  }
}

export default function Nursery({ loaderData, actionData }: Route.ComponentProps) {
  const result = actionData as ActionResult | undefined;
  const busy = useNavigation().state === "submitting";
  const { data: checklist } = usePlantChecklist();
  const [plant, setPlant] = useState<PlantTaxonRecord | null>(null);
  // A new key empties the add form after a save; a refusal keeps what was typed.
  const [formKey, setFormKey] = useState(0);
  const addSection = useRef<HTMLElement>(null);

  useEffect(() => {
    if (result?.intent === "add" && result.message) {
      setPlant(null);
      setFormKey((key) => key + 1);
    }
  }, [result]);

  /** From "What to grow": the species goes into the add form, ready for its form and availability. */
  function offer(taxonId: number) {
    const taxon = checklist?.find((t) => t.id === taxonId);
    if (!taxon) return;
    setPlant(taxon);
    addSection.current?.scrollIntoView({ behavior: "smooth", block: "start" });
    addSection.current?.querySelector<HTMLElement>("input[name=form]")?.focus({ preventScroll: true });
  }

  const addResult = result?.intent === "add" ? result : undefined;
  const removeResult = result?.intent === "remove" ? result : undefined;
  return (
    <div className="space-y-10">
      <header className="space-y-3">
        <h1 className="text-3xl">Nursery stock</h1>
        <p className="max-w-2xl text-ink-soft">
          Your stock list: the plants you offer, each in the forms you sell it. Planners see it beside their planting lists,
          with your insecticide-free declaration as you give it.
        </p>
        <nav aria-label="Stock list files" className="flex flex-wrap gap-2">
          <Link to="/nursery/import" className={fileLink}>
            Import a CSV file
          </Link>
          {/* A file download, not a page: the browser fetches it itself. */}
          <a href="/nursery/stock.csv" download className={fileLink}>
            Export CSV
          </a>
        </nav>
      </header>

      {/* Phones read the cautions before the form; wider screens set them beside it. */}
      <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,7fr)_minmax(0,5fr)]">
        <div className="lg:order-2">
          <StockCautions />
        </div>
        <section ref={addSection} aria-labelledby="add-heading" className="max-w-xl scroll-mt-4 space-y-3 lg:order-1">
          <h2 id="add-heading" className="text-2xl">Add a plant to your stock</h2>
          {addResult?.message && <FormMessage tone="success">{addResult.message}</FormMessage>}
          {addResult?.error && (
            <FormMessage tone="error">
              {addResult.error} {Object.keys(addResult.fields ?? {}).length > 0 && "Check the marked fields below; what you typed is still there."}
            </FormMessage>
          )}
          <AddStockForm key={formKey} plant={plant} onPlantChange={setPlant} fields={addResult?.fields ?? {}} busy={busy} />
        </section>
      </div>

      <section aria-labelledby="stock-heading" className="space-y-3">
        <h2 id="stock-heading" className="text-2xl">
          Your stock list <span className="font-sans text-base font-normal text-ink-soft">({loaderData.stock.length} {loaderData.stock.length === 1 ? "entry" : "entries"})</span>
        </h2>
        {removeResult && <FormMessage tone={removeResult.error ? "error" : "success"}>{removeResult.error ?? removeResult.message}</FormMessage>}
        <StockTable stock={loaderData.stock} busy={busy} />
      </section>

      <WhatToGrow bands={loaderData.whatToGrow} onOffer={checklist ? offer : undefined} />
    </div>
  );
}

const fileLink = "inline-flex min-h-11 items-center rounded-md border border-moss px-4 font-semibold text-moss-deep no-underline hover:bg-moss/10";
