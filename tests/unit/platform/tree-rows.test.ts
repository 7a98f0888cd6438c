import { readdirSync, readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parseTree } from "../../../app/engine/markdown/parse";
import { TreeSchema } from "../../../app/engine/schema";
import { rowsToTree, treeToRows } from "../../../app/lib/tree-rows";

const files = readdirSync("trees").filter((f) => f.endsWith(".md"));

describe("tree ↔ storage rows", () => {
  it("there are starter trees to check", () => {
    expect(files.length).toBeGreaterThanOrEqual(5);
  });
  for (const file of files) {
    it(`${file}: rows give back the same tree, which the engine's schema accepts`, () => {
      const parsed = parseTree(readFileSync(`trees/${file}`, "utf8"));
      expect(parsed.ok).toBe(true);
      if (!parsed.ok) return;
      const { version, nodes, branches } = treeToRows(parsed.tree);
      expect(nodes).toHaveLength(parsed.tree.nodes.length);
      const back = rowsToTree(version, nodes, branches);
      expect(back).toEqual(parsed.tree);
      expect(TreeSchema.safeParse(back).success).toBe(true);
      // Branch rows are the tree's edges, one row each.
      expect(branches.every((b) => nodes.some((n) => n.nodeKey === b.fromKey))).toBe(true);
    });
  }
});
