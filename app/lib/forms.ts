// Small helpers for zod-validated forms: numbers from text inputs, and errors keyed by field.
import { z } from "zod";

/** A number typed into a form field; an empty field is "missing", not 0. */
export function formNumber(message: string) {
  return z.preprocess(
    (v) => (typeof v === "string" && v.trim() === "" ? undefined : v),
    z.coerce.number({ message }).refine(Number.isFinite, message),
  );
}

/** An optional text field: empty becomes null. */
export function optionalText(max: number, message: string) {
  return z.preprocess((v) => (typeof v === "string" && v.trim() === "" ? null : v), z.string().trim().max(max, message).nullable());
}

// A UTF-16 surrogate without its partner: no character, and not storable as UTF-8.
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

/**
 * The text with every lone surrogate replaced by U+FFFD, as MariaDB would store it. Every request's
 * text is normalised so before it is checked, hashed or stored, so a retry of the same text
 * compares equal to what was stored (String.prototype.toWellFormed, ES2024).
 */
export function wellFormed(text: string): string {
  return text.replace(LONE_SURROGATE, "\uFFFD");
}

/** The first error of each field, for showing beside it. */
export function fieldErrors(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.join(".");
    if (!(key in out)) out[key] = issue.message;
  }
  return out;
}

/** Form fields as strings (what was typed goes back to the form). */
export function formStrings(form: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of form) if (typeof v === "string") out[k] = wellFormed(v);
  return out;
}

/** The hint under every "choose a password" field (the rules are password.server.ts's passwordProblem). */
export const PASSWORD_HINT = "At least 8 characters; 15 or more is better. A few unrelated words work well.";
