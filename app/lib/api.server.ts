// Helpers for the JSON resource routes of field runs: parse a JSON body with zod, and turn a
// model's failure into a JSON error with its status.
import type { z } from "zod";
import { apiError } from "./http.server";

/** The request's JSON body checked against `schema`; a 400 JSON error is thrown otherwise. */
export async function readJson<S extends z.ZodType>(request: Request, schema: S): Promise<z.infer<S>> {
  let raw: unknown;
  try {
    raw = await request.json();
  } catch {
    throw apiError(400, "Send a JSON body.");
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success) {
    const fields: Record<string, string> = {};
    for (const issue of parsed.error.issues) fields[issue.path.join(".") || "body"] ??= issue.message;
    throw apiError(400, parsed.error.issues[0]?.message ?? "The request is not valid.", fields);
  }
  return parsed.data;
}

/** A model's `{ ok: false, status, message }` as a JSON error; anything else as 200 JSON. */
export function jsonResult<T extends { ok: boolean }>(result: T, okStatus = 200): Response {
  if (!result.ok) {
    const f = result as unknown as { status: number; message: string; code?: string };
    return Response.json(f.code ? { error: f.message, code: f.code } : { error: f.message }, { status: f.status });
  }
  return Response.json(result, { status: okStatus });
}

/** Only the methods a resource route answers. */
export function requireMethod(request: Request, ...methods: string[]): void {
  if (!methods.includes(request.method)) throw apiError(405, `Use ${methods.join(" or ")}.`);
}
