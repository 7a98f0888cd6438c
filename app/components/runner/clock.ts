/** "14:05" in the shop's time zone (the same on the server and the phone). */
export function clock(d: Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", { timeZone, hour: "2-digit", minute: "2-digit" }).format(d);
}
