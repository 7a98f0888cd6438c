import { describe, expect, it } from "vitest";
import type { Tree } from "../../../app/engine/types";
import { diffTrees } from "../../../app/lib/tree-diff";
import { smallTree } from "../../support/trees";

describe("diffTrees", () => {
  it("the same tree has no changes", () => {
    const d = diffTrees(smallTree(), smallTree());
    expect(d.same).toBe(true);
    expect(d.unchanged).toBe(4);
  });

  it("names added, removed and changed nodes, and each changed field before and after", () => {
    const a = smallTree();
    const b: Tree = {
      ...a,
      title: "Fan hums, won't start",
      nodes: [
        ...a.nodes
          .filter((n) => n.id !== "motor-failed")
          .map((n) =>
            n.kind === "outcome"
              ? { ...n, parts: [...n.parts, "Capacitor mounting strap"] }
              : n.kind === "question"
                ? { ...n, answers: [...n.answers].reverse() }
                : n,
          ),
        { id: "escalate-lead", kind: "escalate", title: "Motor circuit", reason: "Trace the fan circuit with the wiring diagram." },
      ],
    };
    const d = diffTrees(a, b);
    expect(d.tree).toEqual([{ field: "title", label: "Title", before: a.title, after: b.title }]);
    expect(d.added.map((n) => [n.id, n.name])).toEqual([["escalate-lead", "Escalation ‘Motor circuit’"]]);
    expect(d.removed.map((n) => n.id)).toEqual(["motor-failed"]);
    const byId = Object.fromEntries(d.changed.map((c) => [c.id, c.fields]));
    expect(byId["cap-failed"]).toEqual([
      { field: "parts", label: "Parts", before: "Motor-run capacitor", after: "Motor-run capacitor\nCapacitor mounting strap" },
    ]);
    // Answer order is part of the question (it is the order the technician sees).
    expect(Object.keys(byId)).toEqual(["cap-look", "cap-failed"]);
    expect(d.unchanged).toBe(1);
  });

  it("an optional field appearing or going away shows as 'not set' on the other side", () => {
    const a = smallTree();
    const b: Tree = {
      ...a,
      equipment: "Two-fan rotisseries",
      nodes: a.nodes.map((n) => (n.id === "cap-measure" ? { ...n, body: "Discharge it first." } : n)),
    };
    const d = diffTrees(a, b);
    expect(d.tree).toEqual([{ field: "equipment", label: "Equipment covered", before: null, after: "Two-fan rotisseries" }]);
    expect(d.changed[0]?.fields).toEqual([{ field: "body", label: "Instructions", before: null, after: "Discharge it first." }]);
    expect(diffTrees(b, a).changed[0]?.fields[0]).toMatchObject({ before: "Discharge it first.", after: null });
  });
});
