import type { ReactNode } from "react";
import { NavLink } from "react-router";

const TABS = [
  { to: "/forage/ranking", label: "Ranking" },
  { to: "/forage", label: "Matrix" },
  { to: "/season", label: "Season calendar" },
];

/** Moves between the three forage pages; the main navigation links only the ranking and the season. */
export function ForageTabs() {
  return (
    <nav aria-label="Forage results" className="-mx-1 flex gap-1 overflow-x-auto border-b border-ink/10 pb-px">
      {TABS.map((tab) => (
        <NavLink
          key={tab.to}
          to={tab.to}
          end
          className={({ isActive }) =>
            `whitespace-nowrap rounded-t-md border-b-[3px] px-3 py-2.5 text-[0.95rem] font-medium no-underline ${
              isActive ? "border-moss text-moss-deep" : "border-transparent text-ink hover:bg-ink/5"
            }`
          }
        >
          {tab.label}
        </NavLink>
      ))}
    </nav>
  );
}

/** Said while the figures load; announced politely, and kept as tall as a small result. */
export function Loading({ what }: { what: string }) {
  return (
    <div role="status" className="flex min-h-32 items-center justify-center rounded-lg border border-dashed border-ink/20 text-ink-soft">
      <span className="animate-pulse motion-reduce:animate-none">Loading {what}…</span>
    </div>
  );
}

const FILTER_NAMES: Record<string, string> = {
  bee: "Bee",
  caste: "Caste",
  band: "Band",
  window: "Season window",
  months: "Months",
  from: "From year",
  to: "To year",
  determination: "Evidence",
};

/**
 * The API's refusal, in its own words, with the filter each problem belongs to (unless the
 * message already says it), and a way to try again when trying again can help.
 */
export function LoadError({ error, onRetry }: { error: unknown; onRetry: () => void }) {
  const message = error instanceof Error ? error.message : "Something went wrong.";
  const fields = error && typeof error === "object" && "fields" in error ? (error.fields as Record<string, string[]>) : {};
  const status = error && typeof error === "object" && "status" in error ? (error.status as number) : 0;
  const fieldLines = Object.entries(fields).flatMap(([field, problems]) =>
    problems.filter((problem) => !message.includes(problem)).map((problem) => `${FILTER_NAMES[field] ?? field}: ${problem}`),
  );
  return (
    <div role="alert" className="space-y-2 rounded-md border-l-4 border-clay bg-clay/10 p-3" data-testid="forage-error">
      <p className="font-semibold">The figures could not be loaded.</p>
      <p>{message}</p>
      {fieldLines.length > 0 && (
        <ul className="list-inside list-disc text-sm">
          {fieldLines.map((line) => (
            <li key={line}>{line}</li>
          ))}
        </ul>
      )}
      {status === 400 ? (
        <p className="text-sm">Change the filters above and show again.</p>
      ) : (
        <button type="button" onClick={onRetry} className="min-h-11 rounded-md border border-ink/30 bg-white/70 px-4 font-medium">
          Try again
        </button>
      )}
    </div>
  );
}

/** Nothing to show for these filters, and what to try instead. */
export function EmptyResult({ children }: { children: ReactNode }) {
  return (
    <div className="rounded-lg border border-dashed border-ink/25 p-6 text-center" data-testid="forage-empty">
      {children}
    </div>
  );
}

/** Saves text as a file, made in the browser (nothing is sent to the server). */
export function downloadText(fileName: string, text: string, type = "text/csv;charset=utf-8") {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const link = document.createElement("a");
  link.href = url;
  link.download = fileName;
  document.body.append(link);
  link.click();
  link.remove();
  // Some browsers read the blob after click() returns; let them finish first.
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
