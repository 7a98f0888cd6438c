// Secret tokens for links sent by e-mail (invitations, password resets): random, URL-safe, and
// stored only as a SHA-256 hash, so a copy of the database opens nothing.
import { createHash, randomBytes } from "node:crypto";

/** A new token for a link: 32 random bytes (256 bits), base64url. */
export function newToken(): string {
  return randomBytes(32).toString("base64url");
}

/** What the database keeps of a token: its SHA-256, hex. */
export function tokenHash(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}
