/** The client's address as the server entry saw it (server.js puts it in the load context). */
export function clientAddress(context: { clientAddress?: string } | undefined): string {
  return context?.clientAddress ?? "unknown";
}

/**
 * API mutations must come from our own pages: React Router checks UI actions, not resource routes.
 * Accepts a matching Origin header, or Sec-Fetch-Site: same-origin when Origin is absent.
 */
export function requireSameOrigin(request: Request): void {
  const origin = request.headers.get("origin");
  const own = new URL(request.url).origin;
  if (origin) {
    if (origin === own) return;
  } else if (request.headers.get("sec-fetch-site") === "same-origin") {
    return;
  }
  throw Response.json({ error: "Cross-site requests are refused." }, { status: 403 });
}

/** A JSON error answer for API routes: `{ error, fields? }` with the status that fits. */
export function apiError(status: number, error: string, fields?: Record<string, string>): Response {
  return Response.json(fields ? { error, fields } : { error }, { status });
}
