// The overview's filters: a GET form, so every choice lands in the URL (shareable, and the back
// button steps through them). With scripts on, a change applies at once; without, "Show" does.
import { Form, Link, useSubmit } from "react-router";
import { SelectField } from "~/components/FormFields";
import { Field } from "~/components/Field";
import { categoryLabel } from "~/components/editor/kinds";
import type { FilterKey, OverviewFilters } from "~/lib/insights/filters";

export type FilterChoices = {
  categories: string[];
  trees: { id: string; title: string }[];
  makes: string[];
  models: { make: string; model: string }[];
  customers: { id: string; name: string }[];
  sites: { id: string; name: string }[];
  technicians: { id: string; name: string }[];
};

const PERIOD_LABEL = { "30": "30 days", "90": "90 days", "365": "365 days", range: "Dates" } as const;

export function Filters({
  filters,
  errors,
  options,
}: {
  filters: OverviewFilters;
  errors: Partial<Record<FilterKey, string>>;
  options: FilterChoices;
}) {
  const submit = useSubmit();
  // Only the filters in use go into the URL (without scripts the browser sends every field; that works too).
  const go = (form: HTMLFormElement) => {
    const data = new FormData(form);
    for (const [key, value] of [...data.entries()]) {
      if (value === "" || ((key === "from" || key === "to") && data.get("period") !== "range")) data.delete(key);
    }
    submit(data, { method: "get", preventScrollReset: true });
  };
  const more = Boolean(filters.make || filters.model || filters.treeId || filters.customerId || filters.siteId || filters.technicianId);
  return (
    <Form
      method="get"
      role="search"
      aria-label="Filter the overview"
      className="group/filters card space-y-4"
      onSubmit={(e) => {
        e.preventDefault();
        go(e.currentTarget);
      }}
      onChange={(e) => {
        const target = e.target as unknown as HTMLInputElement;
        // Dates wait for "Show": a half-typed date, or "Dates" picked before any date, is not a filter yet.
        if (target.type === "date" || (target.name === "period" && target.value === "range")) return;
        go(e.currentTarget);
      }}
    >
      <fieldset>
        <legend className="field-label">Period</legend>
        <div className="flex flex-wrap gap-2">
          {(["30", "90", "365", "range"] as const).map((p) => (
            <label
              key={p}
              className="flex min-h-12 cursor-pointer items-center gap-2 rounded-lg border border-rule bg-card px-3 has-[:checked]:border-copper has-[:checked]:bg-copper-soft"
            >
              <input type="radio" name="period" value={p} defaultChecked={filters.period === p} className="size-5 accent-copper" />
              <span className="font-semibold">{p === "range" ? PERIOD_LABEL[p] : `Last ${PERIOD_LABEL[p]}`}</span>
            </label>
          ))}
        </div>
        {errors.period && <p className="field-error">{errors.period}</p>}
      </fieldset>
      {/* The two days show once "Dates" is picked (CSS :has, so it works before scripts load too). */}
      <div
        className={`${errors.from || errors.to ? "grid" : "hidden"} gap-3 group-has-[input[value=range]:checked]/filters:grid sm:grid-cols-2 lg:grid-cols-4`}
      >
        <Field label="First day" name="from" type="date" defaultValue={filters.from ?? ""} error={errors.from} />
        <Field label="Last day" name="to" type="date" defaultValue={filters.to ?? ""} error={errors.to} />
      </div>
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <SelectField label="Equipment category" name="category" defaultValue={filters.category ?? ""} error={errors.category}>
          <option value="">All categories</option>
          {options.categories.map((c) => (
            <option key={c} value={c}>
              {categoryLabel(c)}
            </option>
          ))}
        </SelectField>
        <SelectField label="Symptom (tree)" name="tree" defaultValue={filters.treeId ?? ""} error={errors.tree}>
          <option value="">All trees</option>
          {options.trees.map((t) => (
            <option key={t.id} value={t.id}>
              {t.title}
            </option>
          ))}
        </SelectField>
      </div>
      <details open={more} className="group">
        <summary className="min-h-11 cursor-pointer py-2 font-semibold text-copper-dark">Equipment, customer and technician</summary>
        <div className="mt-2 grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          <SelectField label="Make" name="make" defaultValue={filters.make ?? ""} error={errors.make}>
            <option value="">All makes</option>
            {options.makes.map((m) => (
              <option key={m} value={m}>
                {m}
              </option>
            ))}
          </SelectField>
          <SelectField label="Model" name="model" defaultValue={filters.model ?? ""} error={errors.model}>
            <option value="">All models</option>
            {options.models
              .filter((m) => !filters.make || m.make === filters.make)
              .map((m) => (
                <option key={`${m.make}|${m.model}`} value={m.model}>
                  {m.model} ({m.make})
                </option>
              ))}
          </SelectField>
          <SelectField label="Technician" name="technician" defaultValue={filters.technicianId ?? ""} error={errors.technician}>
            <option value="">Everyone</option>
            {options.technicians.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name}
              </option>
            ))}
          </SelectField>
          <SelectField label="Customer" name="customer" defaultValue={filters.customerId ?? ""} error={errors.customer}>
            <option value="">All customers</option>
            {options.customers.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </SelectField>
          {filters.customerId && (
            <SelectField label="Site" name="site" defaultValue={filters.siteId ?? ""} error={errors.site}>
              <option value="">All the customer's sites</option>
              {options.sites.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </SelectField>
          )}
        </div>
      </details>
      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" className="btn-primary">
          Show
        </button>
        <Link to="/overview" className="font-semibold">
          Clear the filters
        </Link>
      </div>
    </Form>
  );
}
