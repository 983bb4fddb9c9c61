// CSV for downloads made in the browser. Pure module.
//
// RFC 4180: records end with CRLF; a field holding a comma, a double quote, CR or LF is
// enclosed in double quotes, and a double quote inside it is written twice.

export type CsvCell = string | number | null | undefined;

/** One field, quoted only when RFC 4180 requires it. null/undefined become an empty field. */
export function csvField(value: CsvCell): string {
  if (value === null || value === undefined) return "";
  const text = typeof value === "number" ? (Number.isFinite(value) ? String(value) : "") : value;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** A header row and data rows as one CSV text, every record (the last too) ending in CRLF. */
export function toCsv(header: readonly CsvCell[], rows: readonly (readonly CsvCell[])[]): string {
  return [header, ...rows].map((row) => row.map(csvField).join(",") + "\r\n").join("");
}

/** A file name from words of the view: lower case, letters, digits and hyphens only. */
export function csvFileName(...parts: (string | number | undefined | null)[]): string {
  const words = parts
    .filter((p): p is string | number => p !== undefined && p !== null && p !== "")
    .map((p) =>
      String(p)
        .toLowerCase()
        .replace(/[^a-z0-9]+/g, "-")
        .replace(/^-+|-+$/g, ""),
    )
    .filter(Boolean);
  return `${words.join("-") || "data"}.csv`;
}
