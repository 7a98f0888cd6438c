// The overview's period in the shop's calendar: "last 90 days" or a date range become a half-open
// UTC range starting at local midnight, with the local months inside it. Pure (no database).
import { TZDate } from "@date-fns/tz";
import type { OverviewFilters } from "./filters";

/** The filters resolved against the shop's calendar: a half-open UTC range and the months in it. */
export type Scope = {
  shopId: string;
  filters: OverviewFilters;
  timeZone: string;
  start: Date;
  end: Date;
  /** The first and last local day, "2026-09-02". */
  firstDay: string;
  lastDay: string;
  /** Local month starts inside [start, end), the first one possibly before start. */
  months: { start: Date; label: string; key: string }[];
};

const dayStart = (y: number, m: number, d: number, tz: string) => new Date(new TZDate(y, m, d, tz).getTime());

export function resolveScope(shopId: string, filters: OverviewFilters, timeZone: string, now = new Date()): Scope {
  let start: Date;
  let end: Date;
  if (filters.period === "range" && filters.from && filters.to) {
    const [fy, fm, fd] = filters.from.split("-").map(Number) as [number, number, number];
    const [ty, tm, td] = filters.to.split("-").map(Number) as [number, number, number];
    start = dayStart(fy, fm - 1, fd, timeZone);
    end = dayStart(ty, tm - 1, td + 1, timeZone);
  } else {
    const days = Number(filters.period === "range" ? "90" : filters.period);
    const today = new TZDate(now.getTime(), timeZone);
    start = dayStart(today.getFullYear(), today.getMonth(), today.getDate() - (days - 1), timeZone);
    end = dayStart(today.getFullYear(), today.getMonth(), today.getDate() + 1, timeZone);
  }
  const months: Scope["months"] = [];
  const first = new TZDate(start.getTime(), timeZone);
  for (let y = first.getFullYear(), m = first.getMonth(); ; m++) {
    const s = dayStart(y, m, 1, timeZone);
    if (s >= end) break;
    const local = new TZDate(s.getTime(), timeZone);
    months.push({
      start: s,
      key: `${local.getFullYear()}-${String(local.getMonth() + 1).padStart(2, "0")}`,
      label: new Intl.DateTimeFormat("en-US", { timeZone, month: "short", year: "numeric" }).format(s),
    });
  }
  const ymd = (d: Date) => {
    const l = new TZDate(d.getTime(), timeZone);
    return `${l.getFullYear()}-${String(l.getMonth() + 1).padStart(2, "0")}-${String(l.getDate()).padStart(2, "0")}`;
  };
  return { shopId, filters, timeZone, start, end, firstDay: ymd(start), lastDay: ymd(new Date(end.getTime() - 1)), months };
}
