import { env } from "./env.server";

/**
 * An absolute link to one of Cluepath's pages, for an e-mail: from PUBLIC_URL when it is set, so a
 * forged Host header cannot point a password-reset link at another site; else the request's origin.
 */
export function publicLink(request: Request, path: string): string {
  return new URL(path, env().PUBLIC_URL ?? new URL(request.url).origin).toString();
}

/** The client's address as the server entry saw it (server/app.ts puts it in the load context). */
export function clientAddress(context: { clientAddress?: string } | undefined): string {
  return context?.clientAddress ?? "unknown";
}

/** The caller with the address their request came from, for the actions the audit trail records. */
export function fromClient<C extends object>(ctx: C, context: { clientAddress?: string } | undefined): C & { address: string } {
  return { ...ctx, address: clientAddress(context) };
}

/** Methods that change nothing; every other method must come from our own pages. */
export const SAFE_METHODS: ReadonlySet<string> = new Set(["GET", "HEAD", "OPTIONS"]);

type HeaderBag = { get(name: string): string | null };

/**
 * Why a state-changing request is not from our own pages, or null when it is. The server entry
 * applies this to every POST/PUT/PATCH/DELETE, UI action or API, before any route runs.
 * OWASP CSRF Prevention Cheat Sheet: verify the source origin with standard headers — Origin when
 * present; else Fetch Metadata (Sec-Fetch-Site); else Referer. A request that shows none of them is
 * refused too (every current browser sends Origin on a POST).
 */
export function crossSiteReason(headers: HeaderBag, ownOrigin: string): string | null {
  const origin = headers.get("origin");
  if (origin !== null) return origin === ownOrigin ? null : `Origin ${origin.slice(0, 100)} is not this site`;
  const site = headers.get("sec-fetch-site");
  if (site !== null) return site === "same-origin" ? null : `Sec-Fetch-Site is ${site.slice(0, 20)}`;
  const referer = headers.get("referer");
  if (referer !== null) return sameOriginUrl(referer, ownOrigin) ? null : "the Referer is another site";
  return "no Origin, Sec-Fetch-Site or Referer";
}

function sameOriginUrl(url: string, origin: string): boolean {
  try {
    return new URL(url).origin === origin;
  } catch {
    return false;
  }
}

export const CROSS_SITE_MESSAGE = "Cross-site requests are refused.";

/** The same check for code holding a Request (the server entry already applied it to every route). */
export function requireSameOrigin(request: Request): void {
  if (SAFE_METHODS.has(request.method)) return;
  if (crossSiteReason(request.headers, new URL(request.url).origin)) throw Response.json({ error: CROSS_SITE_MESSAGE }, { status: 403 });
}

/** A JSON error answer for API routes: `{ error, fields? }` with the status that fits. */
export function apiError(status: number, error: string, fields?: Record<string, string>): Response {
  return Response.json(fields ? { error, fields } : { error }, { status });
}
