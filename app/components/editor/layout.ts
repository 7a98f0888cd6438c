// Where boxes sit on the canvas: their size, and a free place for a new one near where it belongs
// (no box is dropped on another, so branch labels never end up on top of each other).
import type { Layout } from "./draft";

/** The canvas draws every node at this size; layouts space them by it. */
export const NODE_WIDTH = 240;
export const NODE_HEIGHT = 96;
const GAP_X = 40;
const GAP_Y = 60;

function overlaps(a: { x: number; y: number }, b: { x: number; y: number }): boolean {
  return Math.abs(a.x - b.x) < NODE_WIDTH + GAP_X / 2 && Math.abs(a.y - b.y) < NODE_HEIGHT + GAP_Y / 2;
}

/**
 * The first free place at or near `want`: the same row first, alternating right and left of it,
 * then the rows below. Only placed nodes count (a node with no position yet is placed by the canvas).
 */
export function freeSpot(layout: Layout, want: { x: number; y: number }): { x: number; y: number } {
  const taken = Object.values(layout);
  for (let row = 0; row < 50; row++) {
    for (let step = 0; step < 12; step++) {
      const side = step === 0 ? 0 : step % 2 === 1 ? (step + 1) / 2 : -step / 2;
      const at = { x: Math.round(want.x + side * (NODE_WIDTH + GAP_X)), y: Math.round(want.y + row * (NODE_HEIGHT + GAP_Y)) };
      if (!taken.some((p) => overlaps(p, at))) return at;
    }
  }
  const ys = taken.map((p) => p.y);
  return { x: want.x, y: Math.max(...ys) + NODE_HEIGHT + GAP_Y };
}

/**
 * Below its parent, to the right of the parent's other children already placed (so branches keep
 * their order left to right and their lines don't cross), or below everything when it has no parent.
 */
export function placeNew(layout: Layout, parentId?: string, siblingIds: readonly string[] = []): { x: number; y: number } {
  const parent = parentId ? layout[parentId] : undefined;
  if (parent) {
    const siblings = siblingIds.map((id) => layout[id]).filter((p): p is { x: number; y: number } => Boolean(p) && p!.y > parent.y);
    if (siblings.length) {
      const right = siblings.reduce((a, b) => (b.x > a.x ? b : a));
      return freeSpot(layout, { x: right.x + NODE_WIDTH + GAP_X, y: right.y });
    }
    return freeSpot(layout, { x: parent.x, y: parent.y + NODE_HEIGHT + GAP_Y + 10 });
  }
  const all = Object.values(layout);
  if (!all.length) return { x: 0, y: 0 };
  return freeSpot(layout, { x: Math.min(...all.map((p) => p.x)), y: Math.max(...all.map((p) => p.y)) + NODE_HEIGHT + GAP_Y });
}
