import type { RegionalStatus } from "~/taxa/checklist-schema";
import { REGIONAL_STATUS_LABELS } from "~/taxa/taxon-record";

const STYLES: Record<RegionalStatus, string> = {
  native: "border-moss text-moss-deep bg-moss/10",
  introduced: "border-sky text-ink bg-sky/10",
  invasive: "border-clay text-ink bg-clay/15",
};

/** Native, introduced or invasive in the region; invasive carries a warning mark. */
export function StatusBadge({ status }: { status: RegionalStatus }) {
  return (
    <span className={`inline-flex items-center gap-1 rounded-full border px-2 py-0.5 text-xs font-semibold ${STYLES[status]}`}>
      {status === "invasive" && <span aria-hidden="true">⚠</span>}
      {REGIONAL_STATUS_LABELS[status]}
    </span>
  );
}
