// One shape for every figure on the overview: the page renders it as a table (and a chart of one
// of its columns), and the CSV download writes the very same rows.
export type CellKind = "text" | "count" | "percent" | "minutes" | "month";

export type Column = { key: string; label: string; kind: CellKind };
export type Cell = string | number | null;
export type Row = Record<string, Cell>;

export const TABLE_IDS = [
  "root-causes",
  "first-time-fix-by-month",
  "first-time-fix-by-equipment",
  "time-by-tree",
  "time-by-equipment",
  "parts",
  "parts-by-model",
  "readings-out-of-limits",
  "hand-offs",
] as const;
export type TableId = (typeof TABLE_IDS)[number];

export type Table = { id: TableId; title: string; caption: string; columns: Column[]; rows: Row[] };

/** A share as a fraction 0…1 (null when there is nothing to divide by), shown and written as a percentage. */
export function share(part: number, whole: number): number | null {
  return whole > 0 ? part / whole : null;
}

/** How a cell reads on the page and in the CSV (same text in both). */
export function cellText(kind: CellKind, value: Cell): string {
  if (value === null || value === undefined) return "—";
  if (typeof value === "string") return value;
  switch (kind) {
    case "percent":
      return `${(value * 100).toFixed(1)} %`;
    case "minutes":
      return value.toFixed(1);
    default:
      return String(value);
  }
}

/**
 * OWASP CSV injection: a cell that starts with = + - @, a tab or a carriage return is taken as a
 * formula by spreadsheet programs; prefix it with a single quote so it reads as text. Numbers we
 * write ourselves (a negative figure) stay numbers.
 */
export function neutralise(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}

/** RFC 4180 quoting: a field with a comma, quote or line break is quoted, quotes doubled. */
function quote(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** The table's rows as CSV (CRLF line ends, a header row), every cell as the page shows it. */
export function toCsv(table: Table): string {
  const lines = [table.columns.map((c) => quote(neutralise(c.label)))];
  for (const row of table.rows) {
    lines.push(
      table.columns.map((c) => {
        const v = row[c.key] ?? null;
        if (v === null) return "";
        return quote(typeof v === "number" ? cellText(c.kind, v) : neutralise(v));
      }),
    );
  }
  return lines.map((l) => l.join(",")).join("\r\n") + "\r\n";
}
