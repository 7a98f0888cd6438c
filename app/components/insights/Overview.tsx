// The owner's overview: filters, four headline figures, and each figure as a chart with its table
// and a CSV of the rows shown. Everything arrives from the loader; charts draw with visx.
import type { FilterKey, OverviewFilters } from "~/lib/insights/filters";
import { cellText, type Table, type TableId } from "~/lib/insights/table";
import { BarChart, type BarDatum } from "./BarChart";
import { ColumnChart } from "./ColumnChart";
import { Figure } from "./Figure";
import { Filters, type FilterChoices } from "./Filters";

export type OverviewData = {
  filters: OverviewFilters;
  errors: Partial<Record<FilterKey, string>>;
  query: string;
  periodText: string;
  options: FilterChoices;
  tables: Record<TableId, Table>;
  definition: string;
  totals: { ended: number; handed: number; done: number; calls: number; fixed: number; diagnoseMedian: number | null };
};

const n = (v: unknown) => (typeof v === "number" ? v : 0);

/** Bars for one numeric column of a table, labelled by its first column (and a second, when it names the equipment). */
function bars(table: Table, key: string, label = (r: Table["rows"][number]) => String(r[table.columns[0]!.key] ?? "")): BarDatum[] {
  const col = table.columns.find((c) => c.key === key)!;
  return table.rows.map((r) => ({ label: label(r), value: n(r[key]), text: cellText(col.kind, r[key] ?? null) }));
}

function Headline({ label, value, note }: { label: string; value: string; note: string }) {
  return (
    <div className="card">
      <dt className="text-sm text-ink-soft">{label}</dt>
      <dd className="text-3xl font-bold tabular-nums">{value}</dd>
      <dd className="text-sm text-ink-soft">{note}</dd>
    </div>
  );
}

export function Overview({ data }: { data: OverviewData }) {
  const t = data.tables;
  const q = data.query;
  const { ended, handed, done, calls, fixed, diagnoseMedian } = data.totals;
  const pct = (a: number, b: number) => (b ? `${((a / b) * 100).toFixed(0)} %` : "—");
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-bold">Overview</h1>
        <p className="text-ink-soft">Runs that ended {data.periodText}. Practice runs are never counted.</p>
      </div>
      <Filters filters={data.filters} errors={data.errors} options={data.options} />
      {ended === 0 ? (
        <p className="card">No run ended in this period with these filters. Try a longer period or fewer filters.</p>
      ) : (
        <dl className="grid grid-cols-2 gap-3 lg:grid-cols-4">
          <Headline label="Runs with a root cause" value={String(done)} note={`of ${ended} runs ended`} />
          <Headline label="First-time-fix rate" value={pct(fixed, calls)} note={`${fixed} of ${calls} calls closed`} />
          <Headline
            label="Time to diagnose, median"
            value={diagnoseMedian === null ? "—" : `${cellText("minutes", diagnoseMedian)} min`}
            note="start of run to root cause"
          />
          <Headline label="Handed to a lead" value={pct(handed, ended)} note={`${handed} of ${ended} runs`} />
        </dl>
      )}

      <h2 className="text-xl font-bold">Root causes</h2>
      <Figure
        table={t["root-causes"]}
        query={q}
        chart={
          <BarChart data={bars(t["root-causes"], "runs")} label="Bar chart of runs per root cause; the table below has the same figures." />
        }
      />

      <h2 className="text-xl font-bold">First-time fixes</h2>
      <p className="card border-copper bg-copper-soft text-base">
        <strong>How it is counted.</strong> {data.definition}
      </p>
      <Figure
        table={t["first-time-fix-by-month"]}
        query={q}
        chart={
          <ColumnChart
            label="Column chart of the first-time-fix rate per month; the table below has the same figures."
            data={t["first-time-fix-by-month"].rows.map((r) => ({
              label: String(r.month),
              short: String(r.month).slice(0, 3),
              value: typeof r.rate === "number" ? r.rate : null,
              text: cellText("percent", r.rate ?? null),
            }))}
          />
        }
      />
      <Figure
        table={t["first-time-fix-by-equipment"]}
        query={q}
        chart={
          <BarChart
            max={1}
            data={bars(t["first-time-fix-by-equipment"], "rate", (r) => String(r.equipment))}
            label="Bar chart of the first-time-fix rate per make and model; the table below has the same figures."
          />
        }
      />

      <h2 className="text-xl font-bold">Time to diagnose and time on the job</h2>
      <Figure
        table={t["time-by-tree"]}
        query={q}
        chart={
          <BarChart
            data={bars(t["time-by-tree"], "diagnoseMedian")}
            label="Bar chart of the median minutes to diagnose per tree; the table below has medians and 90th percentiles."
          />
        }
      />
      <Figure table={t["time-by-equipment"]} query={q} />

      <h2 className="text-xl font-bold">Parts</h2>
      <Figure
        table={t.parts}
        query={q}
        chart={
          <BarChart
            data={bars(t.parts, "quantity", (r) => String(r.description))}
            label="Bar chart of quantities used per part; the table below has the same figures."
          />
        }
      />
      <Figure table={t["parts-by-model"]} query={q} />

      <h2 className="text-xl font-bold">Readings and hand-offs</h2>
      <Figure
        table={t["readings-out-of-limits"]}
        query={q}
        chart={
          <BarChart
            data={bars(t["readings-out-of-limits"], "out")}
            label="Bar chart of out-of-limits readings per measurement step; the table below has the same figures."
          />
        }
      />
      <Figure
        table={t["hand-offs"]}
        query={q}
        chart={
          <BarChart
            max={1}
            data={bars(t["hand-offs"], "share")}
            label="Bar chart of the share of runs handed to a lead per tree; the table below has the same figures."
          />
        }
      />
    </div>
  );
}
