// The guide's index of decision records is written from docs/decisions/ (scripts/decisions-index.ts):
// a record added without `npm run docs:decisions`, or an index edited by hand, fails here.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { decisionsIndex, guideWithIndex } from "../../../scripts/decisions-index";

describe("DEVELOPERS.md's index of decisions", () => {
  it("lists every record under docs/decisions/, by its own title, and nothing else", () => {
    const guide = readFileSync("DEVELOPERS.md", "utf8");
    expect(guideWithIndex(guide) === guide, "run npm run docs:decisions").toBe(true);
    const index = decisionsIndex();
    expect(index).toContain("[0001. Models fail one way: a thrown Refusal](docs/decisions/0001-one-failure-shape.md)");
    expect(index.match(/^- \[\d{4}\. /gm)?.length).toBeGreaterThan(80);
  });
});
