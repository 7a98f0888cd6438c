// "Larkspur Market — Deli counter", without saying the customer twice when the site's name has it.
export function placeName(customer: string, site: string): string {
  return site.toLowerCase().startsWith(customer.toLowerCase()) ? site : `${customer} — ${site}`;
}
