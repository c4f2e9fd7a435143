// Applied field per frame, from a table column, a list, a sweep description or the file names.
// Every result carries its unit and a description of where the values came from, so that a
// count mismatch can say which source was wrong.

/** Field values, one per frame, with their unit and origin. */
export interface FieldValues {
  values: Float64Array;
  /** Unit of every value, e.g. "mT" (may be "" when unknown). */
  unit: string;
  /** Where the values came from, e.g. `column "H (mT)" of field.csv`. */
  source: string;
}

/** Options shared by the field constructors. */
export interface FieldOptions {
  /** Unit of the values. For a table column it defaults to the unit in the header ("H (mT)", "H [mT]"), else "". */
  unit?: string;
  /** When given, the number of frames the values must match (see {@link checkFieldCount}). */
  frames?: number;
}

/** Throws unless there is exactly one field value per frame. */
export function checkFieldCount(fields: FieldValues, frames: number): FieldValues {
  if (fields.values.length !== frames) {
    throw new Error(`expected ${frames} field values for ${frames} frames, got ${fields.values.length} from ${fields.source}`);
  }
  return fields;
}

function finish(values: number[], unit: string, source: string, frames: number | undefined): FieldValues {
  const fields = { values: Float64Array.from(values), unit, source };
  return frames === undefined ? fields : checkFieldCount(fields, frames);
}

/** Field values given directly. */
export function fieldsFromList(values: readonly number[], options: FieldOptions & { source?: string } = {}): FieldValues {
  const source = options.source ?? "a list";
  values.forEach((v, i) => {
    if (!Number.isFinite(v)) throw new Error(`${source}: value ${i} is ${v}, not a finite number`);
  });
  return finish([...values], options.unit ?? "", source, options.frames);
}

// ---- Tables -------------------------------------------------------------------------------

/** Options of {@link fieldsFromTable}. */
export interface TableFieldOptions extends FieldOptions {
  /** Column separator; detected from the header row (comma, tab or semicolon) when omitted. */
  delimiter?: "," | "\t" | ";";
  /** Name of the table in messages. @default "table" */
  name?: string;
}

/** Splits delimited text into rows of fields (RFC 4180 quoting: "..." with "" for a quote). */
export function parseDelimited(text: string, delimiter: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = "";
  let quoted = false;
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0; // skip a byte-order mark
  for (; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"') {
        if (text[i + 1] === '"') {
          field += '"';
          i++;
        } else quoted = false;
      } else field += c;
    } else if (c === '"' && field.trim() === "") {
      quoted = true;
      field = "";
    } else if (c === delimiter) {
      row.push(field);
      field = "";
    } else if (c === "\n" || c === "\r") {
      if (c === "\r" && text[i + 1] === "\n") i++;
      row.push(field);
      rows.push(row);
      row = [];
      field = "";
    } else field += c;
  }
  if (quoted) throw new Error("a quoted field is not closed before the end of the text");
  if (field !== "" || row.length > 0) {
    row.push(field);
    rows.push(row);
  }
  return rows.filter((r) => !(r.length === 1 && r[0].trim() === ""));
}

function detectDelimiter(headerLine: string): "," | "\t" | ";" {
  const counts: Record<string, number> = { ",": 0, "\t": 0, ";": 0 };
  let quoted = false;
  for (const c of headerLine) {
    if (c === '"') quoted = !quoted;
    else if (!quoted && c in counts) counts[c]++;
  }
  const best = (["\t", ";", ","] as const).reduce((a, b) => (counts[b] > counts[a] ? b : a), ",");
  return best;
}

/** The unit written in a column header such as "H (mT)" or "field [Oe]", or "". */
export function unitFromHeader(header: string): string {
  const match = /[([]\s*([^()[\]]+?)\s*[)\]]\s*$/.exec(header);
  return match === null ? "" : match[1];
}

/**
 * Field values from one column of CSV / TSV text whose first row names the columns. The column
 * is found by exact name, then ignoring case and surrounding space. With a semicolon delimiter a
 * decimal comma ("1,5") is read as a decimal point. Empty or non-numeric cells are errors that
 * name the table, the row (1-based, header = row 1) and the column.
 */
export function fieldsFromTable(text: string, column: string, options: TableFieldOptions = {}): FieldValues {
  const name = options.name ?? "table";
  const firstLine = text.replace(/^\ufeff/, "").split(/\r?\n|\r/, 1)[0] ?? "";
  const delimiter = options.delimiter ?? detectDelimiter(firstLine);
  let rows: string[][];
  try {
    rows = parseDelimited(text, delimiter);
  } catch (error) {
    throw new Error(`${name}: ${(error as Error).message}`);
  }
  if (rows.length === 0) throw new Error(`${name}: the table is empty`);
  const header = rows[0].map((h) => h.trim());
  let col = header.indexOf(column);
  if (col < 0) col = header.findIndex((h) => h.toLowerCase() === column.trim().toLowerCase());
  if (col < 0) {
    throw new Error(`${name}: no column named "${column}" (columns: ${header.map((h) => `"${h}"`).join(", ")})`);
  }
  const values: number[] = [];
  for (let r = 1; r < rows.length; r++) {
    const raw = (rows[r][col] ?? "").trim();
    const text = delimiter === ";" && /^[-+]?\d+,\d+(e[-+]?\d+)?$/i.test(raw) ? raw.replace(",", ".") : raw;
    const v = text === "" ? NaN : Number(text);
    if (!Number.isFinite(v)) {
      throw new Error(`${name}: row ${r + 1}: column "${header[col]}" holds ${raw === "" ? "nothing" : `"${raw}"`}, not a number`);
    }
    values.push(v);
  }
  const unit = options.unit ?? unitFromHeader(header[col]);
  return finish(values, unit, `column "${header[col]}" of ${name}`, options.frames);
}

// ---- Sweeps -------------------------------------------------------------------------------

/** One straight leg of a field sweep: from `start` to `stop` (both included) in steps of `step`. */
export interface SweepSegment {
  start: number;
  stop: number;
  /** Step size; its sign is ignored (the direction is from start to stop). */
  step: number;
}

/** Rounds away float noise from start + i step (12 significant digits). */
function clean(v: number): number {
  return v === 0 ? 0 : Number(v.toPrecision(12));
}

/**
 * Field values of a sweep made of straight segments in sequence, e.g. a major loop
 * `[{start: -40, stop: 40, step: 2}, {start: 40, stop: -40, step: 2}]`. Each segment includes
 * both ends; where a segment starts at the previous one's stop, the joint is not repeated.
 * A segment whose span is not a whole number of steps is an error.
 */
export function fieldsFromSweep(segments: readonly SweepSegment[], options: FieldOptions = {}): FieldValues {
  if (segments.length === 0) throw new Error("sweep: no segments");
  const values: number[] = [];
  const source = `a sweep of ${segments.length} segment${segments.length === 1 ? "" : "s"}`;
  segments.forEach((s, k) => {
    const where = `sweep segment ${k} (${s.start} -> ${s.stop} step ${s.step})`;
    if (![s.start, s.stop, s.step].every(Number.isFinite)) throw new Error(`${where}: start, stop and step must be finite numbers`);
    const step = Math.abs(s.step);
    const span = s.stop - s.start;
    if (step === 0 && span !== 0) throw new Error(`${where}: step is zero`);
    const steps = step === 0 ? 0 : Math.round(Math.abs(span) / step);
    if (step !== 0 && Math.abs(steps * step - Math.abs(span)) > 1e-9 * Math.max(1, Math.abs(span))) {
      throw new Error(`${where}: the span ${Math.abs(span)} is not a whole number of steps of ${step}`);
    }
    const direction = Math.sign(span);
    const startsAtJoint = values.length > 0 && Math.abs(values[values.length - 1] - s.start) <= 1e-9 * Math.max(1, Math.abs(s.start));
    for (let i = startsAtJoint ? 1 : 0; i <= steps; i++) values.push(clean(s.start + direction * step * i));
  });
  return finish(values, options.unit ?? "", source, options.frames);
}

// ---- File names ---------------------------------------------------------------------------

/**
 * Field values read from file names by a regular expression whose first capture group is the
 * number, e.g. `/H=(-?[\d.]+)mT/`. A name that does not match, or whose capture is not a number,
 * is an error naming it.
 */
export function fieldsFromNames(names: readonly string[], pattern: RegExp | string, options: FieldOptions = {}): FieldValues {
  const regex = typeof pattern === "string" ? new RegExp(pattern) : new RegExp(pattern.source, pattern.flags.replace(/[gy]/g, ""));
  const groups = new RegExp(`${regex.source}|`).exec("")!.length - 1;
  if (groups < 1) throw new Error(`field pattern /${regex.source}/ has no capture group for the number`);
  const source = `file names matched by /${regex.source}/`;
  const values = names.map((name) => {
    const match = regex.exec(name);
    if (match === null || match[1] === undefined) throw new Error(`${name}: does not match the field pattern /${regex.source}/`);
    const v = Number(match[1].replace(/^\+/, ""));
    if (match[1].trim() === "" || !Number.isFinite(v)) throw new Error(`${name}: field pattern captured "${match[1]}", not a number`);
    return v;
  });
  return finish(values, options.unit ?? "", source, options.frames);
}
