import { describe, expect, it } from "vitest";
import { ConfigError, DEFAULT_DATABASE_URL, databaseUrl, parseEnv } from "../../../app/lib/env.server";

const problem = (source: Record<string, string>) => {
  try {
    parseEnv(source);
    return "";
  } catch (e) {
    expect(e).toBeInstanceOf(ConfigError);
    return (e as Error).message;
  }
};

describe("configuration: one schema, checked at boot (issue 8 item 8)", () => {
  it("has working defaults for development", () => {
    const env = parseEnv({});
    expect(env).toMatchObject({
      PORT: 3000,
      HOST: "0.0.0.0",
      TRUST_PROXY: false,
      DATABASE_URL: DEFAULT_DATABASE_URL,
      DB_POOL_SIZE: 20,
      secureCookies: false,
    });
    expect(parseEnv({ PORT: "8080", TRUST_PROXY: "1" })).toMatchObject({ PORT: 8080, TRUST_PROXY: true });
  });

  it("names each bad variable and what it should be", () => {
    expect(problem({ PORT: "eighty" })).toMatch(/PORT: a whole number from 1 to 65535 \(it is "eighty"\)/);
    expect(problem({ PORT: "70000" })).toMatch(/PORT: a whole number from 1 to 65535/);
    expect(problem({ PORT: "80.5" })).toMatch(/PORT:/);
    expect(problem({ TRUST_PROXY: "yes" })).toMatch(/TRUST_PROXY: use "1" \(on\) or "0" \(off\)/);
    expect(problem({ DATABASE_URL: "postgres://db/cluepath" })).toMatch(/DATABASE_URL: must start with mysql:\/\//);
    expect(problem({ LOG_LEVEL: "loud" })).toMatch(/LOG_LEVEL:/);
    const both = problem({ PORT: "x", S3_ENDPOINT: "not a url" });
    expect(both).toMatch(/PORT:/);
    expect(both).toMatch(/S3_ENDPOINT:/);
  });

  it("needs a real AUTH_SECRET in production and never prints secrets", () => {
    expect(problem({ NODE_ENV: "production" })).toMatch(/AUTH_SECRET: required in production/);
    const short = problem({ NODE_ENV: "production", AUTH_SECRET: "hunter2-short" });
    expect(short).toMatch(/AUTH_SECRET: must be at least 32 characters/);
    expect(short).not.toContain("hunter2");
    expect(parseEnv({ NODE_ENV: "production", AUTH_SECRET: "x".repeat(32) }).secureCookies).toBe(true);
  });

  it("reads DATABASE_URL alone for migrations and drizzle-kit, with the same default", () => {
    expect(databaseUrl({})).toBe(DEFAULT_DATABASE_URL);
    expect(databaseUrl({ DATABASE_URL: "mysql://u@h:1/x" })).toBe("mysql://u@h:1/x");
    expect(() => databaseUrl({ DATABASE_URL: "nonsense" })).toThrow(/DATABASE_URL/);
  });
});
