// How places and times read on screen. Times are in the shop's time zone and formatted by the
// loader, so the server and the browser show the same text.

/** "Larkspur Market — Deli counter", without saying the customer twice when the site's name has it. */
export function placeName(customer: string, site: string): string {
  return site.toLowerCase().startsWith(customer.toLowerCase()) ? site : `${customer} — ${site}`;
}

const STYLES = {
  date: { dateStyle: "medium" },
  "date-time": { dateStyle: "medium", timeStyle: "short" },
  time: { timeStyle: "short" },
} as const satisfies Record<string, Intl.DateTimeFormatOptions>;

/**
 * Every time Cluepath shows, in the shop's time zone and one format: "Dec 1, 2026, 5:11 PM", the
 * date alone ("Dec 1, 2026") or the time alone ("5:11 PM"). The same text on the server and the
 * phone, whatever zone the phone is set to.
 */
export function atShop(d: Date | string | null | undefined, timeZone: string, style: keyof typeof STYLES = "date-time"): string {
  if (!d) return "—";
  const date = typeof d === "string" ? new Date(d) : d;
  return new Intl.DateTimeFormat("en-US", { timeZone, ...STYLES[style] }).format(date);
}

/** A nameplate rating's label: the tree's title for it when there is one, else its key in words ("fanCapacitor", "fan_capacitor" → "Fan capacitor"). */
export function ratingLabel(key: string, treeTitle?: string | null): string {
  if (treeTitle) return treeTitle;
  const words = key
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .replace(/[_-]+/g, " ")
    .trim()
    .toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** How far the wall clock in `timeZone` is ahead of UTC at that instant, in milliseconds. */
function zoneOffset(at: number, timeZone: string): number {
  const parts: Record<string, number> = {};
  const format = new Intl.DateTimeFormat("en-US", {
    timeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "numeric",
    day: "numeric",
    hour: "numeric",
    minute: "numeric",
    second: "numeric",
  });
  for (const p of format.formatToParts(new Date(at))) if (p.type !== "literal") parts[p.type] = Number(p.value);
  const wall = Date.UTC(parts.year!, parts.month! - 1, parts.day!, parts.hour!, parts.minute!, parts.second!);
  return wall - Math.floor(at / 1000) * 1000;
}

/** The instant a calendar day ("2026-12-01") begins in the shop's time zone, for filters by period. */
export function dayStartsAt(day: string, timeZone: string): Date {
  const [y, m, d] = day.split("-").map(Number) as [number, number, number];
  const wall = Date.UTC(y, m - 1, d);
  // Twice: the offset at the first guess may differ from the offset at midnight (a DST change).
  const first = wall - zoneOffset(wall, timeZone);
  return new Date(wall - zoneOffset(first, timeZone));
}
