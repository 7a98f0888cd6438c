import argon2 from "argon2";
import { createRequire } from "node:module";

// OWASP Password Storage Cheat Sheet minimum for argon2id: m = 19 MiB, t = 2, p = 1.
export const ARGON2_OPTIONS = { type: argon2.argon2id, memoryCost: 19 * 1024, timeCost: 2, parallelism: 1 } as const;

export const PASSWORD_MIN = 8;
export const PASSWORD_RECOMMENDED = 15;
export const PASSWORD_MAX = 128;

const require = createRequire(import.meta.url);
const commonList = require("fxa-common-password-list") as { test(password: string): boolean };

export function hashPassword(password: string): Promise<string> {
  return argon2.hash(password, ARGON2_OPTIONS);
}

export async function verifyPassword(hash: string, password: string): Promise<boolean> {
  try {
    return await argon2.verify(hash, password);
  } catch {
    return false;
  }
}

// Verified against when the e-mail is unknown, so both answers take about as long.
let dummyHash: Promise<string> | undefined;
export async function burnVerify(password: string): Promise<void> {
  dummyHash ??= hashPassword("not-a-real-password-" + crypto.randomUUID());
  await verifyPassword(await dummyHash, password);
}

/**
 * ASVS 5.0 password rules: at least 8 characters (15 recommended), no composition rules,
 * and not one of the commonly used passwords. Returns a message for the field, or null.
 */
export function passwordProblem(password: string, email?: string): string | null {
  if ([...password].length < PASSWORD_MIN)
    return `Use at least ${PASSWORD_MIN} characters (${PASSWORD_RECOMMENDED} or more is better; a few words work well).`;
  if ([...password].length > PASSWORD_MAX) return `Use at most ${PASSWORD_MAX} characters.`;
  if (commonList.test(password.toLowerCase()) || commonList.test(password))
    return "That password is on the list of commonly used passwords. Choose another.";
  if (email && password.toLowerCase() === email.toLowerCase()) return "Don't use your e-mail address as your password.";
  return null;
}
