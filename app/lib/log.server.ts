// The process's structured log (pino, one JSON object per line on stdout). The server entry writes
// one line per request; errors carry the request id so a user's report can be matched to its line.
// Nothing that identifies a session goes in: no headers, no cookies, no query strings, no request
// bodies, and database errors without their query parameters.
import pino, { type Logger } from "pino";
import { env } from "./env.server";

let logger: Logger | undefined;

export function log(): Logger {
  return (logger ??= pino({
    level: env().LOG_LEVEL,
    base: { service: "cluepath" },
    timestamp: pino.stdTimeFunctions.isoTime,
    // Last line of defence if someone logs a header bag or a request by mistake.
    redact: {
      paths: [
        "headers",
        "req.headers",
        "cookie",
        "*.cookie",
        "authorization",
        "*.authorization",
        "password",
        "*.password",
        "token",
        "*.token",
      ],
      censor: "[hidden]",
    },
  }));
}

/** An error as it may be logged: its kind, codes and first message line, never a query's parameters. */
export function safeError(error: unknown): Record<string, unknown> {
  if (!(error instanceof Error)) return { message: String(error).slice(0, 300) };
  const e = error as Error & { code?: unknown; errno?: unknown; sqlState?: unknown; cause?: unknown };
  const message = (e.message.split(/\nparams:|\n/)[0] ?? "").slice(0, 300);
  const out: Record<string, unknown> = { type: e.name, message };
  if (typeof e.code === "string" || typeof e.code === "number") out.code = e.code;
  if (typeof e.errno === "number") out.errno = e.errno;
  // Stack frames only: the first stack line repeats the message, which may hold values.
  if (e.stack)
    out.stack = e.stack
      .split("\n")
      .filter((l) => /^\s+at /.test(l))
      .slice(0, 12)
      .join("\n");
  if (e.cause) out.cause = safeError(e.cause);
  return out;
}
