// Test helpers: a real session for a demo user, as the cookie a browser would send.
import { encode } from "@auth/core/jwt";
import { eq } from "drizzle-orm";
import { memberships, users } from "../../db/schema";
import { sessionCookieName } from "../../app/lib/auth.server";
import { db } from "../../app/lib/db.server";
import { env } from "../../app/lib/env.server";
import { openSession } from "../../app/lib/sign-in.server";

export async function cookieFor(email: string): Promise<{ cookie: string; sessionId: string }> {
  const [row] = await db()
    .select({ id: users.id, v: users.sessionVersion, shopId: memberships.shopId })
    .from(users)
    .innerJoin(memberships, eq(memberships.userId, users.id))
    .where(eq(users.email, email))
    .limit(1);
  if (!row) throw new Error(`no demo user ${email}`);
  const sessionId = await openSession(row.id, row.shopId, row.v);
  const token = await encode({ token: { sid: sessionId, sub: row.id }, secret: env().AUTH_SECRET, salt: sessionCookieName() });
  return { cookie: `${sessionCookieName()}=${token}`, sessionId };
}

export function requestWith(cookie: string, path = "/", init: RequestInit = {}): Request {
  return new Request(`http://localhost${path}`, { ...init, headers: { cookie, ...(init.headers ?? {}) } });
}

/** Route loaders/actions are called with the arguments React Router would pass. */
export function routeArgs(request: Request, params: Record<string, string> = {}, context: Record<string, unknown> = {}) {
  return { request, params, context } as never;
}
