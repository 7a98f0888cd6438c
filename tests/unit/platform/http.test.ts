import { describe, expect, it } from "vitest";
import { requireSameOrigin } from "../../../app/lib/http.server";

const post = (headers: Record<string, string>) => new Request("http://shop.example/api/x", { method: "POST", headers });
const status = (fn: () => void) => {
  try {
    fn();
    return 0;
  } catch (e) {
    return (e as Response).status;
  }
};

describe("API mutations are same-origin only (OWASP CSRF cheat sheet: verify Origin / Fetch Metadata)", () => {
  it("accepts our own Origin, or Sec-Fetch-Site same-origin when Origin is missing", () => {
    expect(status(() => requireSameOrigin(post({ origin: "http://shop.example" })))).toBe(0);
    expect(status(() => requireSameOrigin(post({ "sec-fetch-site": "same-origin" })))).toBe(0);
  });
  it("refuses another origin, and a request that shows neither", () => {
    expect(status(() => requireSameOrigin(post({ origin: "http://evil.example" })))).toBe(403);
    expect(status(() => requireSameOrigin(post({ "sec-fetch-site": "cross-site" })))).toBe(403);
    expect(status(() => requireSameOrigin(post({})))).toBe(403);
  });
});
