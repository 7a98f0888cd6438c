// The one way a model says no. A model function returns its data or throws a Refusal: a kind (what
// sort of no), a message in the user's words, and optionally a code for the client, field errors for
// a form, and details the caller may show (the revision that won, the parse errors…). Throwing inside
// `writeTx` rolls the transaction back, so a refusal never leaves half a write behind.
// `app/lib/route.server.ts` turns a Refusal into HTTP, in one place.

/** What sort of refusal, and the HTTP status each maps to. */
export const REFUSAL_STATUS = {
  /** The request is malformed or a field is wrong. */
  invalid: 400,
  /** The caller's role, or their relation to the record, does not allow it. */
  forbidden: 403,
  /** No such record in the caller's shop (another shop's record reads the same). */
  "not-found": 404,
  /** The record's state does not allow it now (closed, changed meanwhile, already open). */
  conflict: 409,
  /** The record was there but has gone or can no longer change (published, discarded). */
  gone: 410,
  /** An upload over its size cap. */
  "too-large": 413,
  /** An upload of a type Cluepath does not take. */
  "wrong-type": 415,
  /** Well-formed, but the rules refuse it (a reused idempotency key, a step the tree doesn't allow). */
  rejected: 422,
  /** The same thing again too soon (a report e-mailed again within minutes). */
  "too-many": 429,
  /** A service behind Cluepath (the mail server) did not take it. */
  unavailable: 502,
} as const;

export type RefusalKind = keyof typeof REFUSAL_STATUS;

export type RefusalExtra = {
  /** A stable word for the client to act on ("closed", "key-reused"). */
  code?: string;
  /** Messages by form field, shown beside each field. */
  fields?: Record<string, string>;
  /** More for the caller to show or act on; sent with the error as is. */
  details?: Record<string, unknown>;
};

export class Refusal extends Error {
  override readonly name = "Refusal";
  /** The HTTP status the kind maps to. */
  readonly status: number;
  readonly code?: string;
  readonly fields?: Record<string, string>;
  readonly details?: Record<string, unknown>;

  constructor(
    readonly kind: RefusalKind,
    message: string,
    extra: RefusalExtra = {},
  ) {
    super(message);
    this.status = REFUSAL_STATUS[kind];
    if (extra.code !== undefined) this.code = extra.code;
    if (extra.fields !== undefined) this.fields = extra.fields;
    if (extra.details !== undefined) this.details = extra.details;
  }
}

export function isRefusal(e: unknown): e is Refusal {
  return e instanceof Refusal;
}

/** "That run was not found." — for a record the caller named that is not in their shop. */
export function notFound(what = "That record"): never {
  throw new Refusal("not-found", `${what} was not found.`);
}

/** The value, or a not-found refusal when there is none. */
export function orNotFound<T>(value: T | null | undefined, what?: string): T {
  if (value === null || value === undefined) notFound(what);
  return value;
}

/** A refusal on one form field, shown beside it. */
export function fieldRefusal(field: string, message: string): Refusal {
  return new Refusal("invalid", message, { fields: { [field]: message } });
}
