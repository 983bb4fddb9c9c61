import { useEffect, useId, useMemo, useRef, useState } from "react";
import { useQuery } from "@tanstack/react-query";
import { createTaxonIndex, type TaxonHit } from "~/taxa/search";
import { bloomMonths } from "~/taxa/bloom";
import type { PlantTaxonRecord } from "~/taxa/taxon-record";
import { BloomStrip } from "./BloomStrip";

const RECENT_KEY = "visitwort.recentPlants";
const MAX_OPTIONS = 8;

/** The checklist for pickers: fetched once, then served from TanStack Query's cache (ETag on revalidation). */
export function usePlantChecklist() {
  return useQuery({
    queryKey: ["taxa", "plants"],
    queryFn: async (): Promise<PlantTaxonRecord[]> => {
      const response = await fetch("/api/taxa?group=plants");
      if (!response.ok) throw new Error(`The checklist could not be loaded (${response.status})`);
      return (await response.json()).taxa;
    },
    staleTime: 60 * 60 * 1000,
  });
}

function readRecent(): number[] {
  try {
    return JSON.parse(localStorage.getItem(RECENT_KEY) ?? "[]");
  } catch {
    return [];
  }
}

export function rememberRecentPlant(id: number) {
  const recent = [id, ...readRecent().filter((other) => other !== id)].slice(0, 8);
  localStorage.setItem(RECENT_KEY, JSON.stringify(recent));
}

/**
 * Orders hits so that, among equally good matches, the recorder's recent plants and plants in
 * bloom this month come first. Literal matches stay ahead of fuzzy ones.
 */
function preferLikely(hits: TaxonHit<PlantTaxonRecord>[], recent: number[], month: number) {
  const adjusted = (hit: TaxonHit<PlantTaxonRecord>) => {
    const literal = hit.score < 0.01;
    const isRecent = recent.includes(hit.taxon.id);
    const inBloom = bloomMonths(hit.taxon.bloomStart, hit.taxon.bloomEnd).has(month);
    return hit.score + (isRecent ? 0 : literal ? 0.0005 : 0.05) + (inBloom ? 0 : literal ? 0.0003 : 0.03);
  };
  return [...hits].sort((a, b) => adjusted(a) - adjusted(b));
}

/**
 * The plant picker: an ARIA combobox (input + listbox) over the regional checklist. Typing
 * searches scientific names, common names and synonyms and forgives misspellings.
 */
export function PlantPicker({
  name,
  label,
  value,
  onChange,
  errors,
  disabled,
}: {
  name: string;
  label: string;
  value: PlantTaxonRecord | null;
  onChange: (taxon: PlantTaxonRecord | null) => void;
  errors?: string[];
  disabled?: boolean;
}) {
  const id = useId();
  const listId = `${id}-list`;
  const { data: taxa, isLoading, error } = usePlantChecklist();
  const index = useMemo(() => (taxa ? createTaxonIndex(taxa) : null), [taxa]);
  const [query, setQuery] = useState(value ? value.scientificName : "");
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(0);
  const [recent, setRecent] = useState<number[]>([]);
  const inputRef = useRef<HTMLInputElement>(null);
  const month = new Date().getMonth() + 1;

  useEffect(() => setRecent(readRecent()), []);
  useEffect(() => {
    if (value) setQuery(value.scientificName);
  }, [value]);

  const options = useMemo(() => {
    if (!index || !taxa) return [];
    const typed = query.trim();
    if (!typed || (value && typed === value.scientificName)) {
      // Nothing typed: recent choices, then what is in bloom now.
      const byId = new Map(taxa.map((t) => [t.id, t]));
      const recentTaxa = recent.map((rid) => byId.get(rid)).filter((t): t is PlantTaxonRecord => Boolean(t));
      const blooming = taxa.filter((t) => !recent.includes(t.id) && bloomMonths(t.bloomStart, t.bloomEnd).has(month));
      return [...recentTaxa, ...blooming].slice(0, MAX_OPTIONS).map((taxon) => ({ taxon, matchedName: taxon.scientificName, matchedField: "scientificName" as const, score: 0 }));
    }
    return preferLikely(index.search(typed, 30), recent, month).slice(0, MAX_OPTIONS);
  }, [index, taxa, query, recent, month, value]);

  function choose(taxon: PlantTaxonRecord) {
    onChange(taxon);
    setQuery(taxon.scientificName);
    setOpen(false);
  }

  function onKeyDown(event: React.KeyboardEvent<HTMLInputElement>) {
    if (event.key === "ArrowDown") {
      event.preventDefault();
      setOpen(true);
      setActive((i) => Math.min(i + 1, options.length - 1));
    } else if (event.key === "ArrowUp") {
      event.preventDefault();
      setActive((i) => Math.max(i - 1, 0));
    } else if (event.key === "Enter") {
      if (open && options[active]) {
        event.preventDefault();
        choose(options[active].taxon);
      }
    } else if (event.key === "Escape") {
      setOpen(false);
    }
  }

  const describedBy = errors?.length ? `${id}-error` : `${id}-hint`;
  return (
    <div className="relative space-y-1">
      <label htmlFor={`${id}-input`} className="block font-semibold">
        {label}
      </label>
      <input type="hidden" name={name} value={value?.id ?? ""} />
      <input
        ref={inputRef}
        id={`${id}-input`}
        type="text"
        role="combobox"
        aria-expanded={open && options.length > 0}
        aria-controls={listId}
        aria-autocomplete="list"
        aria-activedescendant={open && options[active] ? `${id}-option-${options[active].taxon.id}` : undefined}
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={describedBy}
        autoComplete="off"
        spellCheck={false}
        disabled={disabled}
        placeholder={isLoading ? "Loading the checklist…" : "Type a name, e.g. bloodroot"}
        value={query}
        onChange={(event) => {
          setQuery(event.target.value);
          setOpen(true);
          setActive(0);
          if (value) onChange(null);
        }}
        onFocus={() => setOpen(true)}
        onBlur={() => setTimeout(() => setOpen(false), 150)}
        onKeyDown={onKeyDown}
        className={`min-h-12 w-full rounded-md border bg-white px-3 text-base disabled:bg-ink/5 ${errors?.length ? "border-clay" : "border-ink/30"}`}
      />
      {errors?.length ? (
        <p id={`${id}-error`} role="alert" className="text-sm font-medium text-clay">
          {errors.join(" ")}
        </p>
      ) : (
        <p id={`${id}-hint`} className="text-sm text-ink-soft">
          {error ? "The checklist could not be loaded; check your connection." : "Common or scientific name; misspellings are fine."}
        </p>
      )}
      {open && options.length > 0 && !disabled && (
        <ul
          id={listId}
          role="listbox"
          aria-label={`${label}: suggestions`}
          className="absolute z-20 mt-1 max-h-96 w-full overflow-y-auto rounded-md border border-ink/20 bg-white shadow-lg"
        >
          {options.map((option, i) => (
            <li
              key={option.taxon.id}
              id={`${id}-option-${option.taxon.id}`}
              role="option"
              aria-selected={i === active}
              onMouseDown={(event) => {
                event.preventDefault();
                choose(option.taxon);
              }}
              onMouseEnter={() => setActive(i)}
              className={`flex min-h-12 cursor-pointer flex-col gap-0.5 border-b border-ink/5 px-3 py-2 ${i === active ? "bg-moss/10" : ""}`}
            >
              <span>
                <i className="font-display">{option.taxon.scientificName}</i>{" "}
                <span className="text-sm text-ink-soft">{option.taxon.vernacularNames[0]}</span>
              </span>
              <span className="flex items-center gap-2 text-xs text-ink-soft">
                {option.taxon.family}
                <BloomStrip start={option.taxon.bloomStart} end={option.taxon.bloomEnd} />
                {recent.includes(option.taxon.id) && <span>· chosen before</span>}
                {option.matchedField === "synonym" && <span>· synonym {option.matchedName}</span>}
              </span>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
