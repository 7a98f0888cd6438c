import { describe, expect, it } from "vitest";
import { roleAllows, safeNext } from "../../../app/lib/auth.server";
import { HOME_PATH, navFor, ROLES } from "../../../app/lib/roles";

describe("roles", () => {
  it("every role has its own home, and that home is in its navigation", () => {
    const homes = new Set(ROLES.map((r) => HOME_PATH[r]));
    expect(homes.size).toBe(ROLES.length);
    for (const r of ROLES) expect(navFor(r).map((n) => n.to)).toContain(HOME_PATH[r]);
  });
  it("owners may do what leads do; technicians and trainers only their own", () => {
    expect(roleAllows("owner", ["lead"])).toBe(true);
    expect(roleAllows("technician", ["lead"])).toBe(false);
    expect(roleAllows("trainer", ["technician"])).toBe(false);
    expect(roleAllows("lead", ["owner"])).toBe(false);
  });
  it("only same-site paths are followed after sign-in (no open redirect)", () => {
    expect(safeNext("/equipment", "/calls")).toBe("/equipment");
    expect(safeNext("//evil.example/x", "/calls")).toBe("/calls");
    expect(safeNext("https://evil.example", "/calls")).toBe("/calls");
    expect(safeNext("/\\evil.example", "/calls")).toBe("/calls");
    expect(safeNext(null, "/calls")).toBe("/calls");
  });
});
