import { describe, expect, it } from "vitest";
import { safeNext } from "../../../app/lib/auth.server";
import { ACTIONS, can, POLICY } from "../../../app/lib/policy";
import { HOME_PATH, navFor, ROLES, type Role } from "../../../app/lib/roles";

describe("roles", () => {
  it("every role has its own home, and that home is in its navigation", () => {
    const homes = new Set(ROLES.map((r) => HOME_PATH[r]));
    expect(homes.size).toBe(ROLES.length);
    for (const r of ROLES) expect(navFor(r).map((n) => n.to)).toContain(HOME_PATH[r]);
  });
  it("only same-site paths are followed after sign-in (no open redirect)", () => {
    expect(safeNext("/equipment", "/calls")).toBe("/equipment");
    expect(safeNext("//evil.example/x", "/calls")).toBe("/calls");
    expect(safeNext("https://evil.example", "/calls")).toBe("/calls");
    expect(safeNext("/\\evil.example", "/calls")).toBe("/calls");
    expect(safeNext(null, "/calls")).toBe("/calls");
  });
});

// Who may do what, read against the people the product is for (DESIGN.md, "The people and what
// each must get done"): technicians work calls and runs, leads write the procedures and back the
// technicians up, trainers review, owners run the shop and may do what a lead does.
describe("the policy", () => {
  const who = (role: Role) => ({ role });
  const allowed = (action: (typeof ACTIONS)[number]) => ROLES.filter((r) => can(who(r), action));

  it("owners may do everything leads may do", () => {
    for (const action of ACTIONS) if (can(who("lead"), action)) expect(can(who("owner"), action), action).toBe(true);
  });

  it("technicians work calls and runs but do not write procedures, keep meters or manage people", () => {
    for (const action of ["calls.write", "equipment.write", "runs.start"] as const)
      expect(can(who("technician"), action), action).toBe(true);
    for (const action of ["trees.author", "meters.manage", "people.manage", "escalations.view", "runs.take-over"] as const)
      expect(can(who("technician"), action), action).toBe(false);
  });

  it("leads and owners author trees and take over escalated runs; nobody else does", () => {
    expect(allowed("trees.author")).toEqual(["lead", "owner"]);
    expect(allowed("runs.take-over")).toEqual(["lead", "owner"]);
  });

  it("trainers read everything a shop shares but change nothing in the field", () => {
    for (const action of ACTIONS.filter(
      (a) => a.endsWith(".view") && a !== "escalations.view" && a !== "outbox.view" && a !== "shop.overview" && a !== "audit.view",
    ))
      expect(can(who("trainer"), action), action).toBe(true);
    for (const action of ["calls.write", "equipment.write", "runs.start", "trees.author", "meters.manage", "reports.send"] as const)
      expect(can(who("trainer"), action), action).toBe(false);
  });

  it("service reports are sent by the roles that work calls (issue 9 item 9); the audit trail is the owner's", () => {
    expect(allowed("reports.send")).toEqual(allowed("calls.write"));
  });

  it("only the owner manages people and reads the audit trail; owners and leads read the overview", () => {
    expect(allowed("audit.view")).toEqual(["owner"]);
    expect(allowed("people.manage")).toEqual(["owner"]);
    expect(allowed("shop.overview")).toEqual(["lead", "owner"]);
  });

  it("steps, notes, photos, pausing and the outcome belong to whoever holds the run, whatever their role", () => {
    for (const action of ["runs.step", "runs.note", "runs.photo", "runs.pause", "runs.escalate", "runs.outcome"] as const) {
      expect(allowed(action), action).toEqual([]);
      for (const r of ROLES) expect(can(who(r), action, { holder: true }), `${action} ${r}`).toBe(true);
    }
    // Abandoning is the holder's, or a lead's.
    expect(allowed("runs.abandon")).toEqual(["lead", "owner"]);
    expect(can(who("technician"), "runs.abandon", { holder: true })).toBe(true);
  });

  it("every rule says in words why it refuses", () => {
    for (const action of ACTIONS) expect(POLICY[action].refusal.length, action).toBeGreaterThan(10);
  });
});
