// One way to count a run's steps, one way to show a time, labels instead of internal names, and the
// phone's navigation that always fits (issue 17, items 6, 7 and 9).
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parseTree } from "../../../app/engine/markdown/parse";
import { replay, type LogEntry } from "../../../app/engine/traversal";
import { atShop, ratingLabel } from "../../../app/lib/display";
import { navFor, ROLES, splitNav, BAR_SLOTS, isCurrent, type NavItem } from "../../../app/lib/roles";
import { stepsDone } from "../../../app/lib/run-log";
import { openRunLine } from "../../../app/lib/calls";
import { ROTISSERIE_TO_CAPACITOR } from "../../support/trees";

const parsed = parseTree(readFileSync("trees/rotisserie-uneven-heat.md", "utf8"));
if (!parsed.ok) throw new Error("the starter tree does not parse");
const tree = parsed.tree;

/** Step rows as the server stores them: one per entry, a taken-back step flagged as the engine says. */
function rowsOf(log: LogEntry[]) {
  const state = replay(tree, log);
  return log.map((e, seq) => ({ type: e.type, undone: state.undone.includes(seq) }));
}

describe("counting a run's steps", () => {
  it("counts what the run stands on — the engine's path — not the rows, whatever was taken back", () => {
    const log: LogEntry[] = [
      ...ROTISSERIE_TO_CAPACITOR,
      { type: "reading", node: "cap-measure", reading: "1.47 µF" },
      { type: "undo" },
      { type: "reading", node: "cap-measure", reading: "1470 nF" },
      { type: "answer", node: "shaft-free", answer: "stiff, gritty or seized" },
      { type: "undo" },
      { type: "undo" },
      { type: "reading", node: "cap-measure", reading: "1.5 µF" },
    ];
    const rows = rowsOf(log);
    expect(rows).toHaveLength(14);
    const path = replay(tree, log).steps.length;
    expect(path).toBe(8); // seven steps to the capacitor, then its reading
    expect(stepsDone(rows)).toBe(path);
  });

  it("agrees with the engine after every entry of the log", () => {
    const log: LogEntry[] = [
      ...ROTISSERIE_TO_CAPACITOR.slice(0, 4),
      { type: "undo" },
      { type: "undo" },
      ...ROTISSERIE_TO_CAPACITOR.slice(2),
    ];
    for (let n = 0; n <= log.length; n++)
      expect(stepsDone(rowsOf(log.slice(0, n))), `after ${n} entries`).toBe(replay(tree, log.slice(0, n)).steps.length);
  });
});

describe("times in the shop's zone", () => {
  // 2026-12-03 01:07 UTC is 8:07 PM on Dec 2 in New York (EST, UTC−5) and 1:07 AM in London (GMT):
  // the IANA time zone database, as shipped with Node's ICU.
  const t = new Date("2026-12-03T01:07:00Z");
  it("shows date and time, the date or the time in one format, in the given zone whatever the machine's", () => {
    expect(atShop(t, "America/New_York")).toBe("Dec 2, 2026, 8:07 PM");
    expect(atShop(t, "America/New_York", "date")).toBe("Dec 2, 2026");
    expect(atShop(t, "America/New_York", "time")).toBe("8:07 PM");
    expect(atShop(t.toISOString(), "Europe/London", "time")).toBe("1:07 AM");
    expect(atShop(null, "UTC")).toBe("—");
  });
});

describe("labels, not internal names", () => {
  it("a nameplate rating takes the tree's title, or its key in words", () => {
    expect(ratingLabel("rated_uf", "Rated capacitance of the slow fan's run capacitor")).toBe(
      "Rated capacitance of the slow fan's run capacitor",
    );
    expect(ratingLabel("fanCapacitor")).toBe("Fan capacitor");
    expect(ratingLabel("rated_manifold")).toBe("Rated manifold");
    expect(ratingLabel("supply")).toBe("Supply");
  });

  it("a run a lead has taken over says so on the technician's list", () => {
    expect(openRunLine({ status: "active", heldByMe: false, holder: "Teodor Vance" })).toBe(
      "Teodor Vance has taken over the run — read it",
    );
    expect(openRunLine({ status: "active", heldByMe: true, holder: "Priya Lindqvist" })).toBe("Carry on with the run");
    expect(openRunLine({ status: "paused", heldByMe: true, holder: "Priya Lindqvist" })).toBe("Resume the paused run");
    expect(openRunLine({ status: "escalated", heldByMe: true, holder: "Priya Lindqvist" })).toBe("Waiting for a lead — open the run");
  });
});

describe("the phone's bottom bar", () => {
  const item = (n: number): NavItem => ({ to: `/p${n}`, label: `Page ${n}`, roles: ["owner"] });
  it("keeps every entry as a tab while they fit, else three tabs and a menu of any length", () => {
    expect(splitNav([1, 2, 3, 4].map(item))).toEqual({ tabs: [1, 2, 3, 4].map(item), more: [] });
    const many = splitNav([1, 2, 3, 4, 5, 6, 7, 8, 9].map(item));
    expect(many.tabs.map((t) => t.to)).toEqual(["/p1", "/p2", "/p3"]);
    expect(many.more).toHaveLength(6);
  });
  it("never has more than four places for any role, and the role's home is a tab", () => {
    for (const r of ROLES) {
      const { tabs, more } = splitNav(navFor(r));
      expect(tabs.length + (more.length ? 1 : 0)).toBeLessThanOrEqual(BAR_SLOTS);
      expect(tabs[0]!.to).toBe(navFor(r)[0]!.to);
    }
  });
  it("a page under an entry counts as that entry", () => {
    expect(isCurrent("/trees", "/trees/abc")).toBe(true);
    expect(isCurrent("/trees", "/trees")).toBe(true);
    expect(isCurrent("/trees", "/treesx")).toBe(false);
  });
});
