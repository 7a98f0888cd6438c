import { describe, expect, it } from "vitest";
import { baseSecurityHeaders, contentSecurityPolicy, permissionsPolicy } from "../../../app/lib/security-headers.server";

const directives = (csp: string) => Object.fromEntries(csp.split("; ").map((d) => [d.split(" ")[0], d.split(" ").slice(1)]));

describe("security headers (OWASP Secure Headers Project; W3C CSP 3, Permissions Policy; RFC 6797)", () => {
  it("page CSP: scripts only from this origin or with the response's nonce; nothing frames the app", () => {
    const d = directives(contentSecurityPolicy("abc123"));
    expect(d["script-src"]).toEqual(["'self'", "'nonce-abc123'"]);
    expect(d["object-src"]).toEqual(["'none'"]);
    expect(d["frame-ancestors"]).toEqual(["'none'"]);
    expect(d["base-uri"]).toEqual(["'self'"]);
    expect(d["form-action"]).toEqual(["'self'"]);
    expect(d["connect-src"]).toEqual(["'self'"]);
    // Only the dev server's hot reload needs a WebSocket.
    expect(directives(contentSecurityPolicy("n", true))["connect-src"]).toEqual(["'self'", "ws:", "wss:"]);
  });

  it("the camera is allowed on the runner (/runs/:runId) and nowhere else", () => {
    expect(permissionsPolicy("/runs/3f1c")).toContain("camera=(self)");
    expect(permissionsPolicy("/runs/3f1c/")).toContain("camera=(self)");
    for (const path of ["/", "/calls", "/runs", "/runs/3f1c/extra", "/api/runs/3f1c/photos", "/trees/1/edit"]) {
      expect(permissionsPolicy(path), path).toContain("camera=()");
    }
    expect(permissionsPolicy("/runs/3f1c")).toContain("microphone=()");
  });

  it("HSTS only over TLS", () => {
    expect(baseSecurityHeaders({ tls: true, pathname: "/" })["strict-transport-security"]).toBe("max-age=31536000");
    expect(baseSecurityHeaders({ tls: false, pathname: "/" })["strict-transport-security"]).toBeUndefined();
  });
});
