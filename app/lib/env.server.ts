import { z } from "zod";

const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_URL: z.string().url().default("mysql://root@127.0.0.1:3307/cluepath"),
  AUTH_SECRET: z.string().min(32, "AUTH_SECRET must be at least 32 characters"),
  /** Trust X-Forwarded-For from a load balancer in front of the app. Off unless set. */
  TRUST_PROXY: z
    .enum(["0", "1"])
    .default("0")
    .transform((v) => v === "1"),
  /** Secure cookies (HTTPS). On in production unless explicitly turned off for a loopback demo. */
  SECURE_COOKIES: z.enum(["0", "1"]).optional(),
  /** Outgoing mail: an SMTP server (scripts/start and scripts/test run a local catcher). */
  SMTP_URL: z.string().default("smtp://127.0.0.1:2525"),
  MAIL_FROM: z.string().default("Cluepath <no-reply@cluepath.example>"),
  /** Where the local mail catcher stores what it receives (dev and tests only; unset in production). */
  MAIL_CAPTURE_DIR: z.string().optional(),
  /** Object storage for photos and images: any S3-compatible endpoint. */
  S3_ENDPOINT: z.string().url().default("http://127.0.0.1:4569"),
  S3_REGION: z.string().default("us-east-1"),
  S3_BUCKET: z.string().default("cluepath"),
  S3_ACCESS_KEY_ID: z.string().default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().default("S3RVER"),
});

export type Env = z.infer<typeof schema> & { secureCookies: boolean };

let cached: Env | undefined;

export function env(): Env {
  if (cached) return cached;
  const parsed = schema.safeParse({
    ...process.env,
    AUTH_SECRET:
      process.env.AUTH_SECRET ??
      (process.env.NODE_ENV === "production" ? undefined : "development-only-secret-not-for-real-use-0000"),
  });
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`).join("\n");
    throw new Error(`Cluepath's configuration is incomplete:\n${lines}`);
  }
  const secureCookies =
    parsed.data.SECURE_COOKIES !== undefined ? parsed.data.SECURE_COOKIES === "1" : parsed.data.NODE_ENV === "production";
  cached = { ...parsed.data, secureCookies };
  return cached;
}
