/** Thrown from loaders/actions (UI or API): React Router returns it as is, or shows the error boundary. */
export function notFound(what = "That record"): never {
  throw Response.json({ error: `${what} was not found.` }, { status: 404 });
}

export function orNotFound<T>(value: T | null | undefined, what?: string): T {
  if (value === null || value === undefined) notFound(what);
  return value;
}

export function forbidden(message = "Your role cannot do this."): never {
  throw Response.json({ error: message }, { status: 403 });
}

/** The client's address as the server entry saw it (server.js puts it in the load context). */
export function clientAddress(context: { clientAddress?: string } | undefined): string {
  return context?.clientAddress ?? "unknown";
}
