import { describe, expect, it } from "vitest";
import { crossSiteReason, requireSameOrigin } from "../../../app/lib/http.server";

const post = (headers: Record<string, string>, method = "POST") => new Request("http://shop.example/api/x", { method, headers });
const status = (fn: () => void) => {
  try {
    fn();
    return 0;
  } catch (e) {
    return (e as Response).status;
  }
};
const own = "http://shop.example";
const reason = (headers: Record<string, string>) => crossSiteReason(new Headers(headers), own);

// OWASP CSRF Prevention Cheat Sheet: verify the source origin (Origin, else Fetch Metadata
// Sec-Fetch-Site, else Referer); W3C Fetch Metadata Request Headers for the values.
describe("state changes are same-origin only", () => {
  it("accepts our own Origin, Sec-Fetch-Site same-origin, or our own Referer", () => {
    expect(reason({ origin: own })).toBeNull();
    expect(reason({ "sec-fetch-site": "same-origin" })).toBeNull();
    expect(reason({ referer: "http://shop.example/calls/new" })).toBeNull();
  });

  it("refuses another origin, a cross-site or same-site fetch, another site's Referer, and no sign at all", () => {
    expect(reason({ origin: "http://evil.example" })).toMatch(/Origin/);
    expect(reason({ origin: "null" })).toMatch(/Origin/);
    expect(reason({ origin: "https://shop.example" })).toMatch(/Origin/); // another scheme is another origin
    expect(reason({ "sec-fetch-site": "cross-site" })).toMatch(/cross-site/);
    expect(reason({ "sec-fetch-site": "same-site" })).toMatch(/same-site/);
    expect(reason({ referer: "http://evil.example/shop.example" })).toMatch(/Referer/);
    expect(reason({ referer: "not a url" })).toMatch(/Referer/);
    expect(reason({})).toMatch(/no Origin/);
  });

  it("Origin decides when present: our Origin with a foreign Referer passes, a foreign Origin with our Fetch Metadata fails", () => {
    expect(reason({ origin: own, referer: "http://evil.example/" })).toBeNull();
    expect(reason({ origin: "http://evil.example", "sec-fetch-site": "same-origin" })).toMatch(/Origin/);
  });

  it("requireSameOrigin answers 403 for a refused mutation and lets safe methods through", () => {
    expect(status(() => requireSameOrigin(post({ origin: own })))).toBe(0);
    expect(status(() => requireSameOrigin(post({ "sec-fetch-site": "cross-site" })))).toBe(403);
    expect(status(() => requireSameOrigin(post({})))).toBe(403);
    expect(status(() => requireSameOrigin(post({}, "DELETE")))).toBe(403);
    expect(status(() => requireSameOrigin(post({ "sec-fetch-site": "cross-site" }, "GET")))).toBe(0);
  });
});
