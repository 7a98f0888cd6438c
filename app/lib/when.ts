// Dates as people read them, in the shop's time zone. Loaders format them, so the server and
// the browser show the same text.
export function when(d: Date | null | undefined, timeZone: string, style: "date" | "date-time" = "date-time"): string {
  if (!d) return "";
  return new Intl.DateTimeFormat("en-US", style === "date" ? { timeZone, dateStyle: "medium" } : { timeZone, dateStyle: "medium", timeStyle: "short" }).format(d);
}
