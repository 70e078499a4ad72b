/**
 * Op-amp models to and from CSV (papaparse). One model per row; a header row names the columns.
 * Figures may be written in engineering notation, with or without their unit (`1M`, `1 MHz`, `4n7`):
 * each is read with parseQuantity for its column's unit and then checked by the shared part schema, so a CSV row is held to exactly the rules of a part typed in the workspace.
 * Nothing here stores anything: `readPartsCsv` gives a row-by-row preview the caller shows first.
 */
import Papa from "papaparse";
import { partSchema } from "@/lib/chain/schema";
import type { Part } from "@/lib/chain/types";
import { parseQuantity, type QuantityUnit } from "@/lib/units";

/** Largest CSV accepted (bytes of text) and most rows, so one upload cannot tie up the server. */
export const CSV_MAX_BYTES = 256 * 1024;
export const CSV_MAX_ROWS = 500;
export const NAME_MAX = 100;
export const NOTES_MAX = 2000;

/** Numeric columns, in the order written on download, with the unit each is read in. */
export const FIGURE_COLUMNS: ReadonlyArray<readonly [keyof Part & string, QuantityUnit]> = [
  ["gbw", "hertz"],
  ["aol", "none"],
  ["slewRate", "V/s"],
  ["vos", "volt"],
  ["ib", "ampere"],
  ["en", "V/√Hz"],
  ["in", "A/√Hz"],
  ["enCorner", "hertz"],
  ["inCorner", "hertz"],
  ["swingLow", "volt"],
  ["swingHigh", "volt"],
  ["inputLow", "volt"],
  ["inputHigh", "volt"],
];

export const CSV_COLUMNS = ["name", "label", ...FIGURE_COLUMNS.map(([k]) => k), "notes"] as const;
const KNOWN = new Set<string>(CSV_COLUMNS);

export interface CsvRowError {
  /** the column, or "" for the row as a whole */
  column: string;
  message: string;
}

export interface CsvRow {
  /** 1-based line in the file (the header is line 1) */
  line: number;
  name: string;
  notes: string;
  model: Part | null;
  errors: CsvRowError[];
}

export interface CsvPreview {
  rows: CsvRow[];
  /** problems with the file as a whole (size, header, too many rows); when present, rows may be empty */
  fileErrors: string[];
  valid: number;
  invalid: number;
}

function normalizeHeader(h: string): string {
  const t = h.trim();
  const hit = CSV_COLUMNS.find((c) => c.toLowerCase() === t.toLowerCase());
  return hit ?? t;
}

/**
 * Read a CSV of op-amp models into a preview: each row with its model or its errors (naming the
 * column). `existingNames` are names the library already holds; a row repeating one, or repeating an
 * earlier row, is an error (names are unique within a team).
 */
export function readPartsCsv(text: string, existingNames: ReadonlySet<string> = new Set()): CsvPreview {
  const bytes = new TextEncoder().encode(text).length;
  if (bytes > CSV_MAX_BYTES) return { rows: [], fileErrors: [`the file is ${Math.ceil(bytes / 1024)} kB; at most ${CSV_MAX_BYTES / 1024} kB is accepted`], valid: 0, invalid: 0 };
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: "greedy", transformHeader: normalizeHeader });
  const fileErrors: string[] = [];
  const fields = parsed.meta.fields ?? [];
  if (!fields.includes("name")) fileErrors.push("the first line must be a header naming the columns, with at least a “name” column");
  const unknown = fields.filter((f) => !KNOWN.has(f));
  if (unknown.length) fileErrors.push(`unknown column${unknown.length === 1 ? "" : "s"}: ${unknown.join(", ")} (known: ${CSV_COLUMNS.join(", ")})`);
  if (parsed.data.length > CSV_MAX_ROWS) fileErrors.push(`the file has ${parsed.data.length} rows; at most ${CSV_MAX_ROWS} are accepted`);
  if (fileErrors.length) return { rows: [], fileErrors, valid: 0, invalid: 0 };

  // Row-shape problems (a row with too many or too few fields) as papaparse saw them, by data row.
  const shapeErrors = new Map<number, string>();
  for (const e of parsed.errors) if (typeof e.row === "number") shapeErrors.set(e.row, e.message);

  const seen = new Set<string>();
  const rows = parsed.data.map((raw, i): CsvRow => {
    const line = i + 2;
    const errors: CsvRowError[] = [];
    const shape = shapeErrors.get(i);
    if (shape) errors.push({ column: "", message: shape.replace(/\.$/, "").toLowerCase() });
    const name = (raw.name ?? "").trim();
    const notes = (raw.notes ?? "").trim();
    if (!name) errors.push({ column: "name", message: "a model needs a name" });
    else if (name.length > NAME_MAX) errors.push({ column: "name", message: `at most ${NAME_MAX} characters` });
    else if (existingNames.has(name)) errors.push({ column: "name", message: `the library already has a model named “${name}”` });
    else if (seen.has(name)) errors.push({ column: "name", message: `“${name}” appears on an earlier line` });
    if (name) seen.add(name);
    if (notes.length > NOTES_MAX) errors.push({ column: "notes", message: `at most ${NOTES_MAX} characters` });
    const model: Record<string, unknown> = {};
    const label = (raw.label ?? "").trim();
    if (label) model.label = label;
    for (const [key, unit] of FIGURE_COLUMNS) {
      const cell = (raw[key] ?? "").trim();
      if (!cell) continue;
      const q = parseQuantity(cell, { unit });
      if (!q.ok) {
        errors.push({ column: key, message: q.error });
        continue;
      }
      model[key] = q.value;
    }
    if (!errors.some((e) => FIGURE_COLUMNS.some(([k]) => k === e.column))) {
      const checked = partSchema.safeParse(model);
      if (!checked.success) {
        for (const issue of checked.error.issues) errors.push({ column: String(issue.path[0] ?? ""), message: issue.message });
      }
    }
    return { line, name, notes, model: errors.length ? null : (model as Part), errors };
  });
  const invalid = rows.filter((r) => r.errors.length).length;
  return { rows, fileErrors: [], valid: rows.length - invalid, invalid };
}

/** Write models as CSV with the same columns the reader takes (plain SI numbers, so nothing is lost). */
export function writePartsCsv(models: ReadonlyArray<{ name: string; notes: string; model: Part }>): string {
  const data = models.map((m) => {
    const row: Record<string, string | number> = { name: m.name, label: m.model.label ?? "" };
    for (const [key] of FIGURE_COLUMNS) {
      const v = m.model[key];
      row[key] = typeof v === "number" ? v : "";
    }
    row.notes = m.notes;
    return row;
  });
  // A cell starting with = + - @ could run as a formula in a spreadsheet; prefix text cells that do.
  return Papa.unparse({ fields: [...CSV_COLUMNS], data: data.map((r) => CSV_COLUMNS.map((c) => r[c] ?? "")) }, { escapeFormulae: true });
}
