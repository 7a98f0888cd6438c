// Labels that tell nodes apart wherever they are picked from a list (where a branch leads, a
// tree's first node, a scenario's hidden fault). A draft may hold two nodes with the same title
// (the engine warns, `duplicate-title`, but an author picks between them before fixing it): each
// of those gets its id after the label, so the list never shows two identical choices. Pure.

/** Each node's label by id: `label(n)`, and " · <id>" after it when another node's label reads the same. */
export function distinctLabels<T extends { id: string }>(nodes: readonly T[], label: (n: T) => string): Map<string, string> {
  const key = (s: string) => s.trim().replace(/\s+/g, " ").toLowerCase();
  const seen = new Map<string, number>();
  for (const n of nodes) {
    const k = key(label(n));
    seen.set(k, (seen.get(k) ?? 0) + 1);
  }
  const out = new Map<string, string>();
  for (const n of nodes) {
    const l = label(n);
    out.set(n.id, (seen.get(key(l)) ?? 0) > 1 ? `${l.trim()} · ${n.id}` : l);
  }
  return out;
}
