// How places and times read on screen. Times are in the shop's time zone and formatted by the
// loader, so the server and the browser show the same text.

/** "Larkspur Market — Deli counter", without saying the customer twice when the site's name has it. */
export function placeName(customer: string, site: string): string {
  return site.toLowerCase().startsWith(customer.toLowerCase()) ? site : `${customer} — ${site}`;
}

/** "Dec 1, 2026, 5:11 PM" (or the date alone) in the shop's time zone. */
export function atShop(d: Date | string | null | undefined, timeZone: string, style: "date" | "date-time" = "date-time"): string {
  if (!d) return "—";
  const date = typeof d === "string" ? new Date(d) : d;
  return new Intl.DateTimeFormat("en-US", style === "date" ? { timeZone, dateStyle: "medium" } : { timeZone, dateStyle: "medium", timeStyle: "short" }).format(date);
}
