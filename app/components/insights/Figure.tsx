// One figure of the overview: its chart (when it has one), the table with the same rows — what a
// screen reader reads — and the CSV of exactly those rows with the page's filters.
import type { ReactNode } from "react";
import { cellText, type Table } from "~/lib/insights/table";

export function csvHref(table: Table, query: string): string {
  return `/api/insights/csv/${table.id}${query}`;
}

export function DataTable({ table }: { table: Table }) {
  return (
    <div className="overflow-x-auto rounded-lg border border-rule" tabIndex={0} role="region" aria-label={`${table.title}, table`}>
      <table className="w-full border-collapse bg-card text-left text-base">
        <caption className="sr-only">{table.caption}</caption>
        <thead className="border-b border-rule bg-paper text-sm">
          <tr>
            {table.columns.map((c) => (
              <th
                key={c.key}
                scope="col"
                className={`px-3 py-2 font-semibold ${c.kind === "text" || c.kind === "month" ? "" : "text-right"}`}
              >
                {c.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {table.rows.map((row, i) => (
            <tr key={i} className="border-b border-rule last:border-0 align-top">
              {table.columns.map((c, j) =>
                j === 0 ? (
                  <th key={c.key} scope="row" className="px-3 py-2 font-normal">
                    {cellText(c.kind, row[c.key] ?? null)}
                  </th>
                ) : (
                  <td
                    key={c.key}
                    className={`px-3 py-2 ${c.kind === "text" || c.kind === "month" ? "" : "text-right tabular-nums whitespace-nowrap"}`}
                  >
                    {cellText(c.kind, row[c.key] ?? null)}
                  </td>
                ),
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function Figure({ table, query, chart, children }: { table: Table; query: string; chart?: ReactNode; children?: ReactNode }) {
  const headingId = `fig-${table.id}`;
  return (
    <section aria-labelledby={headingId} className="card space-y-3">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 id={headingId} className="text-lg font-bold">
          {table.title}
        </h3>
        {table.rows.length > 0 && (
          <a
            href={csvHref(table, query)}
            download
            className="btn-quiet min-h-11 px-3 text-base"
            aria-label={`Download CSV: ${table.title}`}
          >
            Download CSV
          </a>
        )}
      </div>
      <p className="text-base text-ink-soft">{table.caption}</p>
      {children}
      {table.rows.length === 0 ? (
        <p className="text-ink-soft">Nothing to show for these filters.</p>
      ) : (
        <>
          {chart}
          <DataTable table={table} />
        </>
      )}
    </section>
  );
}
