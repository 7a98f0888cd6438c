// The editor's checks in the editor's words: the engine's real findings on broken drafts, as the
// checks list and the node form show them. No advice in the tree file's syntax reaches the editor.
import { describe, expect, it } from "vitest";
import { inEditorWords } from "../../../app/components/editor/finding-words";
import type { Tree, TreeNode } from "../../../app/engine/types";
import { validateTree } from "../../../app/engine/validate";
import { smallTree } from "../../support/trees";

/** Marks of the tree file's syntax: ‘- low → …’, ‘- acceptance: guarded’, ‘(re-check up to 2 times, then id)’. */
const FILE_SYNTAX = /‘- |→ …|acceptance:|\(re-check up to|^nodes\.\d/;

function words(tree: Tree) {
  return validateTree(tree).findings.map((f) => ({ code: f.code, engine: f.message, editor: inEditorWords(f, tree) }));
}

function withNode(t: Tree, id: string, f: (n: TreeNode) => TreeNode): Tree {
  return { ...t, nodes: t.nodes.map((n) => (n.id === id ? f(n) : n)) };
}

describe("the editor's words for the engine's checks", () => {
  it("an open verdict branch: ‘connect the Low branch to a node’, not the file's ‘- low → …’", () => {
    const t = withNode(smallTree(), "cap-measure", (n) =>
      n.kind === "measurement" ? { ...n, branches: { within: { to: "motor-failed" } } } : n,
    );
    const found = words(t).filter((w) => w.code === "missing-branch");
    expect(found.map((w) => w.engine)).toEqual([expect.stringContaining("‘- low → …’"), expect.stringContaining("‘- high → …’")]);
    expect(found.map((w) => w.editor)).toEqual([
      "Connect the Low branch of the measurement ‘Run capacitor against its rating’ to a node: a low reading has nowhere to go yet.",
      "Connect the High branch of the measurement ‘Run capacitor against its rating’ to a node: a high reading has nowhere to go yet.",
    ]);
  });

  it("a measurement with no branches at all, a marginal branch without guarded acceptance, a loop with no limit, a missing target", () => {
    let t = smallTree();
    t = withNode(t, "cap-measure", (n) => (n.kind === "measurement" ? { ...n, branches: {} } : n));
    t.nodes.push({
      id: "m2",
      kind: "measurement",
      title: "Supply voltage",
      quantity: "voltage",
      unit: "V",
      limits: { kind: "range", min: { value: 191 }, max: { value: 218 } },
      branches: { low: { to: "cap-failed" }, within: { to: "loop-a" }, high: { to: "gone" }, marginal: { to: "cap-failed" } },
    });
    t.nodes.push({ id: "loop-a", kind: "step", title: "Reseat the plug", next: { to: "loop-b" } });
    t.nodes.push({ id: "loop-b", kind: "step", title: "Check again", next: { to: "loop-a" } });
    const all = words(t);
    const by = (code: string) => all.filter((w) => w.code === code).map((w) => w.editor);
    expect(by("dead-end")).toContain(
      "The measurement ‘Run capacitor against its rating’ leads nowhere: connect its Low, Within and High branches to nodes.",
    );
    expect(by("unused-branch")).toContain(
      "The Marginal branch of the measurement ‘Supply voltage’ is never taken: only guarded acceptance gives marginal readings. Set “Judging readings near a limit” to guarded and give the meter's accuracy, or disconnect the branch.",
    );
    expect(by("unknown-target")).toContain(
      "The High branch of the measurement ‘Supply voltage’ leads to a node that no longer exists: choose where it leads.",
    );
    expect(by("cycle")).toEqual([
      expect.stringMatching(
        /^These nodes go round in a loop with no limit: ‘(Reseat the plug|Check again)’ → ‘(Reseat the plug|Check again)’.* tick “Goes back to check again”/,
      ),
    ]);
    expect(by("unreachable")).toContain(
      "Nothing leads to the measurement ‘Supply voltage’ from the first node: connect a branch to it, or delete it.",
    );
    for (const w of all) expect(w.editor, `${w.code}: ${w.editor}`).not.toMatch(FILE_SYNTAX);
  });

  it("an empty draft and a missing first node point at the editor's own controls", () => {
    const empty: Tree = { title: "New", category: "fryer", symptom: "Won't light", start: "start", nodes: [] };
    expect(words(empty).map((w) => w.editor)).toEqual(["The tree has no nodes yet: add the first one under “Add a node”."]);
    expect(words({ ...smallTree(), start: "nowhere" }).find((w) => w.code === "start-missing")?.editor).toBe(
      "The tree's first node is missing: choose one under Tree details.",
    );
  });

  it("a finding the layer does not know keeps the engine's words", () => {
    const f = { severity: "error" as const, code: "something-new", message: "Something the engine says." };
    expect(inEditorWords(f, smallTree())).toBe("Something the engine says.");
  });
});
