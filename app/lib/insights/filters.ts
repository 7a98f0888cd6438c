// The overview's filters as they live in the URL (shareable; the back button works). Parsed with
// zod by the route; shared with the page and the CSV links, so both carry exactly the same filters.
import { z } from "zod";
import { CATEGORIES } from "~/engine/types";

export const PERIODS = ["30", "90", "365", "range"] as const;
export type Period = (typeof PERIODS)[number];
export const DEFAULT_PERIOD: Period = "90";

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;
const DAY = /^\d{4}-\d{2}-\d{2}$/;

const text = (max: number) => z.string().trim().min(1).max(max);
const id = z.string().regex(UUID);
const day = z
  .string()
  .regex(DAY, "Use a date like 2026-03-09.")
  .refine(
    (d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)) && new Date(`${d}T00:00:00Z`).toISOString().startsWith(d),
    "That date does not exist.",
  );

/** What the URL may carry. Values of the wrong shape are reported and left out, never a 500. */
export type OverviewFilters = {
  period: Period;
  /** Local dates in the shop's time zone, both included (period "range"). */
  from?: string;
  to?: string;
  category?: (typeof CATEGORIES)[number];
  make?: string;
  model?: string;
  treeId?: string;
  customerId?: string;
  siteId?: string;
  technicianId?: string;
};

export const FILTER_KEYS = ["period", "from", "to", "category", "make", "model", "tree", "customer", "site", "technician"] as const;
export type FilterKey = (typeof FILTER_KEYS)[number];

const fields = {
  period: z.enum(PERIODS, { message: "Choose a period of 30, 90 or 365 days, or a date range." }),
  from: day,
  to: day,
  category: z.enum(CATEGORIES, { message: "That is not an equipment category." }),
  make: text(120),
  model: text(120),
  tree: id,
  customer: id,
  site: id,
  technician: id,
} satisfies Record<FilterKey, z.ZodType>;

export type ParsedFilters = { filters: OverviewFilters; errors: Partial<Record<FilterKey, string>> };

/** Filters from a URL's query. Empty values mean "all"; a value that doesn't fit gets a message and is ignored. */
export function parseFilters(params: URLSearchParams): ParsedFilters {
  const errors: ParsedFilters["errors"] = {};
  const raw: Partial<Record<FilterKey, string>> = {};
  for (const key of FILTER_KEYS) {
    const value = params.get(key)?.trim();
    if (!value) continue;
    const r = fields[key].safeParse(value);
    if (r.success) raw[key] = r.data as string;
    else
      errors[key] =
        key === "period" || key === "from" || key === "to" || key === "category"
          ? (r.error.issues[0]?.message ?? "Not understood.")
          : "Not understood; showing all.";
  }
  let period = (raw.period as Period | undefined) ?? (raw.from || raw.to ? "range" : DEFAULT_PERIOD);
  const filters: OverviewFilters = { period };
  if (period === "range") {
    if (!raw.from && !errors.from) errors.from = "Choose the first day of the range.";
    if (!raw.to && !errors.to) errors.to = "Choose the last day of the range.";
    if (raw.from && raw.to && raw.from > raw.to) errors.to = "The last day comes before the first day.";
    if (errors.from || errors.to) period = DEFAULT_PERIOD;
    else Object.assign(filters, { from: raw.from, to: raw.to });
    filters.period = period;
  }
  if (raw.category) filters.category = raw.category as OverviewFilters["category"];
  if (raw.make) filters.make = raw.make;
  if (raw.model) filters.model = raw.model;
  if (raw.tree) filters.treeId = raw.tree;
  if (raw.customer) filters.customerId = raw.customer;
  if (raw.site) filters.siteId = raw.site;
  if (raw.technician) filters.technicianId = raw.technician;
  return { filters, errors };
}

/** The filters back as a query string (defaults left out), for links and CSV downloads. */
export function filtersQuery(f: OverviewFilters): string {
  const p = new URLSearchParams();
  if (f.period !== DEFAULT_PERIOD) p.set("period", f.period);
  if (f.period === "range") {
    if (f.from) p.set("from", f.from);
    if (f.to) p.set("to", f.to);
  }
  if (f.category) p.set("category", f.category);
  if (f.make) p.set("make", f.make);
  if (f.model) p.set("model", f.model);
  if (f.treeId) p.set("tree", f.treeId);
  if (f.customerId) p.set("customer", f.customerId);
  if (f.siteId) p.set("site", f.siteId);
  if (f.technicianId) p.set("technician", f.technicianId);
  const s = p.toString();
  return s ? `?${s}` : "";
}
