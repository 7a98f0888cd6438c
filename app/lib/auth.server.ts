// Sign-in through @auth/core (Credentials provider, JWT strategy) and the guards every route uses.
import { Auth, setEnvDefaults, type AuthConfig } from "@auth/core";
import { CredentialsSignin } from "@auth/core/errors";
import { decode, encode } from "@auth/core/jwt";
import Credentials from "@auth/core/providers/credentials";
import { LRUCache } from "lru-cache";
import { redirect } from "react-router";
import { z } from "zod";
import { loadSession, revokeSession, SESSION_HOURS, signIn, type SessionUser } from "./sign-in.server";
import type { Ctx } from "./context";
import { authorize, type Action } from "./policy";
import { env } from "./env.server";
import { HOME_PATH } from "./roles";

class WrongCredentials extends CredentialsSignin {
  override code = "credentials";
}
class TooManyAttempts extends CredentialsSignin {
  override code = "too_many";
}
class AccessOff extends CredentialsSignin {
  override code = "access_off";
}

const credentials = z.object({ email: z.string().trim().min(1).max(254), password: z.string().min(1).max(1024) });

export function sessionCookieName(): string {
  return env().secureCookies ? "__Secure-authjs.session-token" : "authjs.session-token";
}

export function authConfig(address: string): AuthConfig {
  const e = env();
  const config: AuthConfig = {
    basePath: "/auth",
    secret: e.AUTH_SECRET,
    trustHost: true,
    useSecureCookies: e.secureCookies,
    session: { strategy: "jwt", maxAge: SESSION_HOURS * 3600 },
    pages: { signIn: "/login", error: "/login" },
    logger: {
      error: (err) => {
        if (!(err instanceof CredentialsSignin)) console.error(err);
      },
      warn: () => {},
      debug: () => {},
    },
    providers: [
      Credentials({
        credentials: { email: { label: "Email", type: "email" }, password: { label: "Password", type: "password" } },
        async authorize(raw, request) {
          const parsed = credentials.safeParse(raw);
          if (!parsed.success) throw new WrongCredentials();
          const result = await signIn(parsed.data.email, parsed.data.password, address, request.headers.get("user-agent"));
          if (result.kind === "rate-limited") throw new TooManyAttempts();
          if (result.kind === "access-off") throw new AccessOff();
          if (result.kind !== "ok") throw new WrongCredentials();
          return { id: result.userId, name: result.name, email: result.email, sessionId: result.sessionId } as never;
        },
      }),
    ],
    callbacks: {
      jwt({ token, user }) {
        // Only the session id travels in the cookie; everything else is read from its row.
        if (user) return { sid: (user as { sessionId: string }).sessionId, sub: user.id };
        return token;
      },
    },
    events: {
      async signOut(message) {
        const sid = "token" in message ? (message.token as { sid?: unknown } | null)?.sid : undefined;
        if (typeof sid === "string") await revokeSession(sid);
      },
    },
  };
  setEnvDefaults(process.env, config);
  return config;
}

/** The /auth/* resource route hands every request to Auth.js. */
export function handleAuth(request: Request, address: string): Promise<Response> {
  return Auth(request, authConfig(address));
}

function readCookie(request: Request, name: string): string | undefined {
  const header = request.headers.get("cookie") ?? "";
  for (const part of header.split(/;\s*/)) {
    const eq = part.indexOf("=");
    if (eq > 0 && part.slice(0, eq) === name) return decodeURIComponent(part.slice(eq + 1));
  }
  return undefined;
}

/**
 * Session ids by cookie, so a phone's cookie is decrypted once (key derivation and JWE decryption
 * were an eighth of a step's CPU), not on every request. Only what the cookie itself says is kept,
 * until the token's own expiry: whether the session is still live is asked of its row on every
 * request (loadSession), so signing out on any server ends it on all at once.
 */
const decodedCookies = new LRUCache<string, string>({ max: 5000 });

async function sessionIdFrom(request: Request): Promise<string | null> {
  const raw = readCookie(request, sessionCookieName());
  if (!raw) return null;
  const known = decodedCookies.get(raw);
  if (known) return known;
  try {
    const token = await decode<{ sid?: string; exp?: number }>({ token: raw, secret: env().AUTH_SECRET, salt: sessionCookieName() });
    if (typeof token?.sid !== "string") return null;
    const ttl = typeof token.exp === "number" ? token.exp * 1000 - Date.now() : 0;
    if (ttl > 0) decodedCookies.set(raw, token.sid, { ttl });
    return token.sid;
  } catch {
    return null;
  }
}

/** The signed-in user, or null. The cookie alone is not enough: its session row must be live. */
export async function getUser(request: Request): Promise<SessionUser | null> {
  const sid = await sessionIdFrom(request);
  return sid ? loadSession(sid) : null;
}

function isApi(request: Request): boolean {
  return new URL(request.url).pathname.startsWith("/api/");
}

/**
 * The signed-in caller (else sign-in, or 401 for an API). With `may`, a caller whose role can never
 * do that action is refused (403) before the request is read, so a role that may not write gets
 * the same answer whatever it sends; the model still decides for the record itself.
 */
export async function requireUser(request: Request, may?: Action): Promise<SessionUser & { ctx: Ctx }> {
  const user = await getUser(request);
  if (!user) {
    if (isApi(request)) throw Response.json({ error: "Sign in first." }, { status: 401 });
    const url = new URL(request.url);
    const next = url.pathname + url.search;
    throw redirect(next && next !== "/" ? `/login?next=${encodeURIComponent(next)}` : "/login");
  }
  const ctx: Ctx = { shopId: user.shopId, userId: user.userId, role: user.role };
  if (may) authorize(ctx, may);
  return { ...user, ctx };
}

function setCookies(response: Response): string[] {
  return response.headers.getSetCookie();
}

function cookiePairs(setCookie: string[]): string {
  return setCookie.map((c) => c.split(";")[0]).join("; ");
}

export type PasswordSignIn =
  { ok: true; headers: Headers; home: string } | { ok: false; reason: "credentials" | "too_many" | "access_off" };

/**
 * The /login form's action: runs the Credentials sign-in through Auth.js on the server, so the
 * form can show its errors beside the fields. Returns the cookies to set on success.
 */
export async function signInWithPassword(request: Request, address: string, email: string, password: string): Promise<PasswordSignIn> {
  const origin = new URL(request.url).origin;
  const config = authConfig(address);
  const csrf = await Auth(new Request(`${origin}/auth/csrf`), config);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const csrfCookies = setCookies(csrf);
  const body = new URLSearchParams({ csrfToken, email, password, callbackUrl: `${origin}/` });
  const response = await Auth(
    new Request(`${origin}/auth/callback/credentials`, {
      method: "POST",
      headers: {
        "content-type": "application/x-www-form-urlencoded",
        cookie: cookiePairs(csrfCookies),
        "user-agent": request.headers.get("user-agent") ?? "",
      },
      body,
    }),
    config,
  );
  const location = response.headers.get("location") ?? "";
  const sessionCookie = setCookies(response).find((c) => c.startsWith(`${sessionCookieName()}=`));
  if (location.includes("error=") || !sessionCookie) {
    const code = new URL(location || "/", origin).searchParams.get("code");
    return { ok: false, reason: code === "too_many" || code === "access_off" ? code : "credentials" };
  }
  const headers = new Headers();
  for (const c of [...csrfCookies, ...setCookies(response)]) headers.append("set-cookie", c);
  const sid = await sessionIdFromCookie(sessionCookie);
  const user = sid ? await loadSession(sid) : null;
  return { ok: true, headers, home: user ? HOME_PATH[user.role] : "/" };
}

async function sessionIdFromCookie(setCookie: string): Promise<string | null> {
  const pair = setCookie.split(";")[0] ?? "";
  return sessionIdFrom(new Request("http://local/", { headers: { cookie: pair } }));
}

/**
 * The cookie for a session opened without the password form (a password reset, an accepted
 * invitation): the same Auth.js JWT, naming only the session row, with the same attributes.
 */
export async function sessionCookie(sessionId: string, userId: string): Promise<Headers> {
  const maxAge = SESSION_HOURS * 3600;
  const token = await encode({ token: { sid: sessionId, sub: userId }, secret: env().AUTH_SECRET, salt: sessionCookieName(), maxAge });
  const secure = env().secureCookies ? "; Secure" : "";
  const headers = new Headers();
  headers.append("set-cookie", `${sessionCookieName()}=${token}; Path=/; HttpOnly; SameSite=Lax; Max-Age=${maxAge}${secure}`);
  return headers;
}

/** Ends the session for real: the row is revoked (a copied cookie stops working) and the cookie cleared. */
export async function signOut(request: Request): Promise<Headers> {
  const sid = await sessionIdFrom(request);
  if (sid) await revokeSession(sid);
  const headers = new Headers();
  const secure = env().secureCookies ? "; Secure" : "";
  headers.append("set-cookie", `${sessionCookieName()}=; Path=/; HttpOnly; SameSite=Lax; Max-Age=0${secure}`);
  return headers;
}

/** Where to go after sign-in: a same-site path from ?next=, else the role's home. */
export function safeNext(next: string | null | undefined, fallback: string): string {
  if (!next || !next.startsWith("/") || next.startsWith("//") || next.startsWith("/\\")) return fallback;
  return next;
}
