// Reading the CSV tables domtopo writes (and any plain comma-separated table with one header
// line): quoted cells, "" escapes, CRLF or LF. Errors name the file, the column and the row.
import { readFileSync } from "node:fs";

export interface CsvTable {
  file: string;
  header: string[];
  /** Data rows (cells as text), without the header. */
  rows: string[][];
  /** Line number (1-based, in the file) of each data row. */
  lines: number[];
}

/** Where a data row is, for messages: "row 3 (line 4)". */
export function rowPlace(t: CsvTable, r: number): string {
  return `row ${r + 1} (line ${t.lines[r]})`;
}

/** Parses CSV text; `file` names it in messages. */
export function parseCsv(text: string, file: string): CsvTable {
  const records: string[][] = [];
  const lines: number[] = [];
  let line = 1;
  let i = 0;
  const n = text.length;
  if (text.charCodeAt(0) === 0xfeff) i = 1;
  while (i < n) {
    const startLine = line;
    const cells: string[] = [];
    for (;;) {
      let cell = "";
      if (text[i] === '"') {
        i++;
        for (;;) {
          if (i >= n) throw new Error(`${file}: line ${startLine}: a quoted cell is not closed`);
          const c = text[i]!;
          if (c === '"') {
            if (text[i + 1] === '"') { cell += '"'; i += 2; continue; }
            i++;
            break;
          }
          if (c === "\n") line++;
          cell += c;
          i++;
        }
        if (i < n && text[i] !== "," && text[i] !== "\n" && text[i] !== "\r") {
          throw new Error(`${file}: line ${line}: expected a comma or the end of the line after a quoted cell, got ${JSON.stringify(text[i])}`);
        }
      } else {
        while (i < n && text[i] !== "," && text[i] !== "\n" && text[i] !== "\r") cell += text[i++];
      }
      cells.push(cell);
      if (i < n && text[i] === ",") { i++; continue; }
      break;
    }
    if (text[i] === "\r") i++;
    if (text[i] === "\n") { i++; line++; }
    if (cells.length === 1 && cells[0] === "") continue; // blank line
    records.push(cells);
    lines.push(startLine);
  }
  if (records.length === 0) throw new Error(`${file}: expected a header line, got an empty file`);
  const header = records[0]!.map((h) => h.trim());
  const rows = records.slice(1);
  const rowLines = lines.slice(1);
  rows.forEach((r, k) => {
    if (r.length !== header.length) {
      throw new Error(`${file}: row ${k + 1} (line ${rowLines[k]}): expected ${header.length} cells like the header, got ${r.length}`);
    }
  });
  return { file, header, rows, lines: rowLines };
}

/** Reads and parses a CSV file. */
export function readCsv(file: string): CsvTable {
  let text: string;
  try {
    text = readFileSync(file, "utf8");
  } catch (err) {
    throw new Error(`${file}: cannot read (${(err as NodeJS.ErrnoException).code ?? (err as Error).message})`);
  }
  return parseCsv(text, file);
}

/** Index of a column; throws naming the file and the columns it has. */
export function columnIndex(t: CsvTable, name: string): number {
  const k = t.header.indexOf(name);
  if (k < 0) {
    const shown = t.header.slice(0, 12).join(", ") + (t.header.length > 12 ? ", ..." : "");
    throw new Error(`${t.file}: no column "${name}" (columns: ${shown})`);
  }
  return k;
}

export interface NumericColumnOptions {
  /**
   * `"error"`: an empty cell is bad input; `"null"`: an empty cell becomes `null` (a row that has
   * no value of this column, e.g. a frame on no reversal curve).
   * @default "error"
   */
  empty?: "error" | "null";
}

/**
 * A column as finite numbers. A non-numeric cell, NaN or an infinity throws, naming the file, the
 * column and the row.
 */
export function numericColumn(t: CsvTable, name: string, options: { empty: "null" }): (number | null)[];
export function numericColumn(t: CsvTable, name: string, options?: NumericColumnOptions): number[];
export function numericColumn(t: CsvTable, name: string, options: NumericColumnOptions = {}): (number | null)[] {
  const k = columnIndex(t, name);
  const out: (number | null)[] = new Array(t.rows.length);
  for (let r = 0; r < t.rows.length; r++) {
    const text = t.rows[r]![k]!.trim();
    if (text === "") {
      if (options.empty === "null") { out[r] = null; continue; }
      throw new Error(`${t.file}: column "${name}", ${rowPlace(t, r)}: expected a number, got an empty cell`);
    }
    const v = Number(text);
    if (!Number.isFinite(v)) {
      throw new Error(`${t.file}: column "${name}", ${rowPlace(t, r)}: expected a finite number, got ${JSON.stringify(text)}`);
    }
    out[r] = v;
  }
  return out;
}
