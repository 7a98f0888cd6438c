// What every route module uses between the request and a model: reading the body with zod, and the
// one place where a model's Refusal becomes HTTP.
//
//   api(handler)   JSON resource routes: a Refusal answers `{ error, code?, fields?, …details }`
//                  with the refusal's status (404, 409, 422…).
//   page(handler)  UI loaders: a Refusal is thrown as a JSON Response with its status, which the
//                  root error boundary shows ("Not found", "Not for your role"…).
//   form(handler)  UI actions: a Refusal is returned as action data with its status —
//                  `{ ok: false, message, errors, values, code?, details? }` — so the form shows the
//                  message, each field's error beside it, and what was typed. `forbidden` and
//                  `not-found` are thrown as for pages: no form can fix a missing record or right.
//
// Anything else thrown (a redirect, a Response, a bug) passes through untouched.
import { data } from "react-router";
import type { z } from "zod";
import { fieldErrors, formStrings, wellFormed } from "./forms";
import { apiError } from "./http.server";
import { isRefusal, Refusal } from "./refusal";
import { readBody } from "./upload.server";

/** How a refusal reads as JSON: the message as `error`, with its code, fields and details. */
function errorBody(r: Refusal): Record<string, unknown> {
  return { error: r.message, ...(r.code ? { code: r.code } : {}), ...(r.fields ? { fields: r.fields } : {}), ...r.details };
}

/** The JSON answer for a refusal, as API routes send it. */
export function refusalResponse(r: Refusal): Response {
  return Response.json(errorBody(r), { status: r.status });
}

export function api<A extends { request: Request }>(handler: (args: A) => Promise<Response>) {
  return async (args: A): Promise<Response> => {
    try {
      return await handler(args);
    } catch (e) {
      if (isRefusal(e)) return refusalResponse(e);
      throw e;
    }
  };
}

/** A refusal as the error page shows it (the root error boundary reads `error`). */
function pageError(r: Refusal): Response {
  return Response.json({ error: r.message }, { status: r.status });
}

export function page<A extends { request: Request }, R>(handler: (args: A) => Promise<R>) {
  return async (args: A): Promise<R> => {
    try {
      return await handler(args);
    } catch (e) {
      if (isRefusal(e)) throw pageError(e);
      throw e;
    }
  };
}

/** What a form's action sends back when it is refused (successful actions answer `{ ok: true, … }`). */
export type FormRefusal = {
  ok: false;
  message: string;
  /** Messages by field, shown beside each. */
  errors: Record<string, string>;
  /** What was typed, sent back to the form. */
  values: Record<string, string>;
  code?: string;
  details?: Record<string, unknown>;
};

// What was typed into each request's form, kept so a refusal can send it back.
const typed = new WeakMap<Request, Record<string, string>>();

export function form<A extends { request: Request }, R>(handler: (args: A) => Promise<R>) {
  return async (args: A) => {
    try {
      return await handler(args);
    } catch (e) {
      if (!isRefusal(e)) throw e;
      if (e.kind === "forbidden" || e.kind === "not-found") throw pageError(e);
      const body: FormRefusal = {
        ok: false,
        message: e.message,
        errors: e.fields ?? {},
        values: typed.get(args.request) ?? {},
        ...(e.code ? { code: e.code } : {}),
        ...(e.details ? { details: e.details } : {}),
      };
      return data(body, { status: e.status });
    }
  };
}

/** The largest JSON body an API route reads (a tree's autosave is the largest there is). */
export const MAX_JSON_BYTES = 4 * 1024 * 1024;

/** A field's path as the API's caller wrote it: `tree.nodes[3].body`. */
function fieldPath(path: readonly PropertyKey[]): string {
  return path.reduce<string>((out, p) => (typeof p === "number" ? `${out}[${p}]` : out ? `${out}.${String(p)}` : String(p)), "");
}

/**
 * The request's JSON body checked against `schema`. Read up to MAX_JSON_BYTES (413 beyond); text
 * made well-formed (lone surrogates → U+FFFD) before anything checks, hashes or stores it. Refusals
 * name each field: a text longer than its cap (so longer than its column) is `rejected` (422), any
 * other problem of shape `invalid` (400).
 */
export async function readJson<S extends z.ZodType>(request: Request, schema: S): Promise<z.infer<S>> {
  const bytes = await readBody(request, MAX_JSON_BYTES, {
    tooLarge: `Send at most ${MAX_JSON_BYTES / 1024 / 1024} MB of JSON.`,
    empty: "Send a JSON body.",
  });
  let raw: unknown;
  try {
    raw = JSON.parse(new TextDecoder().decode(bytes), (_key, value: unknown) => (typeof value === "string" ? wellFormed(value) : value));
  } catch {
    throw new Refusal("invalid", "Send a JSON body.");
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success) {
    const fields: Record<string, string> = {};
    for (const issue of parsed.error.issues) fields[fieldPath(issue.path) || "body"] ??= issue.message;
    const first = parsed.error.issues[0];
    const tooLong = parsed.error.issues.every((i) => i.code === "too_big" && i.origin === "string");
    if (first && tooLong) throw new Refusal("rejected", `${fieldPath(first.path)}: ${first.message}`, { code: "too-long", fields });
    throw new Refusal("invalid", first?.message ?? "The request is not valid.", { fields });
  }
  return parsed.data;
}

/**
 * The submitted form checked against `schema` (or the schema picked for what was sent, when one
 * page posts several forms). What was typed (less any field named like a password) is kept for the request, so any
 * refusal of it (here, or later from a model) goes back to the form with the values; a field the
 * schema refuses is an `invalid` refusal (400) with its message beside the field.
 */
export async function readForm<S extends z.ZodType>(
  request: Request,
  schema: S | ((values: Record<string, string>) => S),
): Promise<z.infer<S>> {
  const values = formStrings(await request.formData());
  // Passwords are never sent back to the page: the person types them again.
  typed.set(request, Object.fromEntries(Object.entries(values).filter(([k]) => !/password/i.test(k))));
  const parsed = (typeof schema === "function" ? schema(values) : schema).safeParse(values);
  if (!parsed.success) {
    const fields = fieldErrors(parsed.error);
    throw new Refusal("invalid", Object.values(fields)[0] ?? "Check the form.", { fields });
  }
  return parsed.data;
}

/** Only the methods a resource route answers (405 otherwise). */
export function requireMethod(request: Request, ...methods: string[]): void {
  if (!methods.includes(request.method)) throw apiError(405, `Use ${methods.join(" or ")}.`);
}
