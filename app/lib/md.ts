// A small, safe subset of Markdown as plain data: the server parses step bodies (mdast) and sends
// this to the phone, which renders it as React elements. No HTML passes through, and the runner
// does not download a Markdown parser.
export type MdInline =
  | { t: "text"; v: string }
  | { t: "strong" | "em" | "del"; c: MdInline[] }
  | { t: "code"; v: string }
  | { t: "link"; href: string; c: MdInline[] }
  | { t: "img"; src: string; alt: string }
  | { t: "br" };

export type MdBlock =
  | { t: "p"; c: MdInline[] }
  | { t: "h"; level: number; c: MdInline[] }
  | { t: "list"; ordered: boolean; items: MdBlock[][] }
  | { t: "quote"; c: MdBlock[] }
  | { t: "pre"; v: string }
  | { t: "hr" };

/** Only same-site paths and https links or images; anything else is dropped to text. */
export function safeUrl(url: string): string | null {
  const u = url.trim();
  if (u.startsWith("/") && !u.startsWith("//")) return u;
  if (/^https:\/\//i.test(u)) return u;
  return null;
}
