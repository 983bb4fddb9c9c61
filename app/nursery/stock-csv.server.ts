import { parse, type Info } from "csv-parse";
import { Readable } from "node:stream";
import { STOCK_CSV_COLUMNS, stockCsvRow, type StockCsvColumn, type StockCsvRow } from "./stock-schema.ts";

/**
 * Reads a stock CSV record by record (csv-parse's stream), so a file is checked without
 * holding more than one record beyond its text, and a request body could be fed in as it
 * arrives. Checks each row against the shared schema; knows nothing of the database.
 */

/** A stock list longer than this is several files: the preview has to stay readable. */
export const MAX_IMPORT_ROWS = 2000;

export interface StockCsvProblem {
  /** The file's line (1 is the header); 0 when the problem is the file as a whole. */
  line: number;
  column?: StockCsvColumn;
  reason: string;
}

export interface StockCsvRead {
  rows: { line: number; row: StockCsvRow }[];
  problems: StockCsvProblem[];
}

const ENUM_COLUMNS = new Set<string>(["form", "availability", "grownWithoutSystemicInsecticides"]);

/** The header must name our six columns, each once, in any order; a misspelt one would lose its values. */
function readHeader(cells: string[]): { problems: StockCsvProblem[]; positions: Map<StockCsvColumn, number> } {
  const positions = new Map<StockCsvColumn, number>();
  const problems: StockCsvProblem[] = [];
  if (cells.every((cell) => cell === "")) {
    return { positions, problems: [{ line: 1, reason: `The first line must name the columns: ${STOCK_CSV_COLUMNS.join(",")}` }] };
  }
  const byLowerName = new Map(STOCK_CSV_COLUMNS.map((column) => [column.toLowerCase(), column]));
  const unknown: string[] = [];
  cells.forEach((cell, index) => {
    const column = byLowerName.get(cell.toLowerCase());
    if (!column) unknown.push(cell === "" ? `(an empty name in place ${index + 1})` : `“${cell}”`);
    else if (positions.has(column)) problems.push({ line: 1, reason: `The column ${column} is named twice` });
    else positions.set(column, index);
  });
  const missing = STOCK_CSV_COLUMNS.filter((column) => !positions.has(column));
  if (missing.length) problems.push({ line: 1, reason: `Missing column${missing.length > 1 ? "s" : ""}: ${missing.join(", ")}` });
  if (unknown.length) {
    problems.push({ line: 1, reason: `Unknown column${unknown.length > 1 ? "s" : ""}: ${unknown.join(", ")}. The columns are ${STOCK_CSV_COLUMNS.join(", ")}` });
  }
  return { problems, positions };
}

function toSource(source: string | AsyncIterable<string | Uint8Array>): Readable {
  return typeof source === "string" ? Readable.from([source]) : Readable.from(source);
}

/**
 * Every row of a stock CSV checked against `stockCsvRow`, with every problem found (not just
 * the first), each with its line. A header problem stops the reading: the rows cannot be read
 * without knowing which cell is which.
 */
export async function readStockCsv(source: string | AsyncIterable<string | Uint8Array>): Promise<StockCsvRead> {
  const rows: StockCsvRead["rows"] = [];
  const problems: StockCsvProblem[] = [];
  // relax_column_count: a row with a cell too many or too few is that row's problem, not the file's.
  // Every line end is taken, mixed too: a file touched by two programs can have both.
  const parser = parse({
    bom: true,
    trim: true,
    skip_empty_lines: true,
    relax_column_count: true,
    info: true,
    record_delimiter: ["\r\n", "\n", "\r"],
    max_record_size: 64 * 1024,
  });
  const input = toSource(source);
  input.on("error", (error) => parser.destroy(error));
  input.pipe(parser);

  let positions: Map<StockCsvColumn, number> | null = null;
  let headerLength = 0;
  let records = 0;
  try {
    for await (const { record, info } of parser as AsyncIterable<{ record: string[]; info: Info }>) {
      if (!positions) {
        const header = readHeader(record);
        if (header.problems.length) {
          problems.push(...header.problems);
          break;
        }
        positions = header.positions;
        headerLength = record.length;
        continue;
      }
      // A spreadsheet often saves rows of empty cells below the data; they say nothing.
      if (record.every((cell) => cell === "")) continue;
      if (++records > MAX_IMPORT_ROWS) {
        problems.push({ line: info.lines, reason: `The file has more than ${MAX_IMPORT_ROWS} rows. Split it into files of at most ${MAX_IMPORT_ROWS} rows and import them one by one` });
        break;
      }
      if (record.length !== headerLength) {
        problems.push({ line: info.lines, reason: `This row has ${record.length} cells where the header names ${headerLength}; check for a stray comma or a name with a comma that needs quotes` });
        continue;
      }
      const raw = Object.fromEntries(STOCK_CSV_COLUMNS.map((column) => [column, record[positions!.get(column)!]]));
      const parsed = stockCsvRow.safeParse(raw);
      if (parsed.success) {
        rows.push({ line: info.lines, row: parsed.data });
        continue;
      }
      for (const issue of parsed.error.issues) {
        const column = issue.path[0] as StockCsvColumn;
        const found = raw[column];
        const shown = ENUM_COLUMNS.has(column) && found ? ` (the file says “${found}”)` : "";
        problems.push({ line: info.lines, column, reason: `${column}: ${issue.message}${shown}` });
      }
    }
  } catch (error) {
    // csv-parse says where the file stopped making sense (an unclosed quote, a record too long).
    const line = typeof (error as { lines?: unknown }).lines === "number" ? (error as { lines: number }).lines : 0;
    problems.push({ line, reason: `The file could not be read as CSV here: ${(error as Error).message}` });
  } finally {
    input.destroy();
  }
  if (!positions && problems.length === 0) {
    problems.push({ line: 0, reason: `The file is empty. The first line must name the columns: ${STOCK_CSV_COLUMNS.join(",")}` });
  }
  return { rows, problems };
}
