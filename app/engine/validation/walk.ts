// Graph walks over a tree's branches: adjacency in compressed rows, and ONE iterative depth-first
// search that every other walk is built on (reachability with reverse post-order, and Tarjan's
// strongly connected components). Node numbers are indices into tree.nodes; nothing here knows
// about node kinds or messages.

/** Adjacency in compressed sparse rows: the successors of v are adj[off[v] .. off[v+1]). */
export interface Adjacency {
  off: Int32Array;
  adj: Int32Array;
  /** The edge number (index into the edge arrays) of each adjacency entry. */
  eid: Int32Array;
}

/** Build adjacency over the edges `keep` accepts; `reverse` gives predecessors instead. */
export function adjacency(N: number, from: number[], to: number[], keep: (e: number) => boolean, reverse = false): Adjacency {
  const off = new Int32Array(N + 1);
  const E = from.length;
  for (let e = 0; e < E; e++) if (keep(e)) off[(reverse ? to[e]! : from[e]!) + 1]!++;
  for (let i = 0; i < N; i++) off[i + 1]! += off[i]!;
  const adj = new Int32Array(off[N]!);
  const eid = new Int32Array(off[N]!);
  const fill = off.slice(0, N);
  for (let e = 0; e < E; e++) {
    if (!keep(e)) continue;
    const a = reverse ? to[e]! : from[e]!;
    const k = fill[a]!++;
    adj[k] = reverse ? from[e]! : to[e]!;
    eid[k] = e;
  }
  return { off, adj, eid };
}

/** What a depth-first search reports as it goes. */
export interface DfsVisitor {
  /** v is reached for the first time (parent −1 for a root). */
  enter(v: number, parent: number): void;
  /**
   * The adjacency entry k (v → w) leads to a node already entered. `onPath` says w is on the
   * current path from the root to v, so v → w closes a cycle (a back edge): the cycle is
   * walk.nodes[walk.position[w] .. walk.depth], then back to w.
   */
  seen(v: number, w: number, k: number, onPath: boolean, walk: DepthFirst): void;
  /** Every successor of v is done. */
  leave(v: number, parent: number): void;
}

/**
 * The one depth-first search: iterative (no recursion limit on 10,000-node chains), over an
 * adjacency, from `root`, skipping nodes `entered` already marks (and marking the ones it
 * enters), so several searches can share one marking. `path` holds the current path from the
 * root: path.nodes[0 .. path.depth] — the visitor may read it inside `seen`.
 */
export class DepthFirst {
  readonly entered: Uint8Array;
  /** Nodes on the current path, root first; valid up to `depth`. */
  readonly nodes: Int32Array;
  /** Position of each node on the current path, −1 when it is not on it. */
  readonly position: Int32Array;
  depth = -1;
  private readonly next: Int32Array;

  constructor(
    private readonly g: Adjacency,
    N: number,
  ) {
    this.entered = new Uint8Array(N);
    this.nodes = new Int32Array(N);
    this.position = new Int32Array(N).fill(-1);
    this.next = new Int32Array(N);
  }

  run(root: number, visit: DfsVisitor): void {
    if (this.entered[root]) return;
    const { off, adj } = this.g;
    const { entered, nodes, position, next } = this;
    let d = 0;
    nodes[0] = root;
    next[0] = off[root]!;
    position[root] = 0;
    entered[root] = 1;
    this.depth = 0;
    visit.enter(root, -1);
    while (d >= 0) {
      const v = nodes[d]!;
      const k = next[d]!;
      if (k < off[v + 1]!) {
        next[d] = k + 1;
        const w = adj[k]!;
        if (entered[w]) {
          visit.seen(v, w, k, position[w] !== -1, this);
        } else {
          entered[w] = 1;
          d++;
          nodes[d] = w;
          next[d] = off[w]!;
          position[w] = d;
          this.depth = d;
          visit.enter(w, v);
        }
      } else {
        position[v] = -1;
        d--;
        this.depth = d;
        visit.leave(v, d >= 0 ? nodes[d]! : -1);
      }
    }
  }
}

/** Nodes reachable from `start`, and those nodes in reverse post-order (a topological order when acyclic). */
export function reachFrom(g: Adjacency, N: number, start: number): { reach: Uint8Array; order: number[] } {
  const order: number[] = [];
  const walk = new DepthFirst(g, N);
  walk.run(start, { enter() {}, seen() {}, leave: (v) => void order.push(v) });
  order.reverse();
  return { reach: walk.entered, order };
}

export interface Components {
  /** comp[v]: the strongly connected component of v. */
  comp: Int32Array;
  /** Number of nodes in each component. */
  size: Int32Array;
  count: number;
}

/**
 * Strongly connected components (Tarjan, on the shared depth-first search). Searches start at
 * `first` roots in order, then at every node not yet reached; `onSeen` sees each non-tree edge
 * as the search meets it (back edges included), for callers that want them.
 */
export function components(
  g: Adjacency,
  N: number,
  first: readonly number[] = [],
  onSeen?: DfsVisitor["seen"],
): Components & { walk: DepthFirst } {
  const idx = new Int32Array(N);
  const low = new Int32Array(N);
  const onStack = new Uint8Array(N);
  const stack = new Int32Array(N);
  const comp = new Int32Array(N).fill(-1);
  const sizes: number[] = [];
  let sp = 0;
  let counter = 0;
  let count = 0;
  const walk = new DepthFirst(g, N);
  const visit: DfsVisitor = {
    enter(v) {
      idx[v] = low[v] = counter++;
      stack[sp++] = v;
      onStack[v] = 1;
    },
    seen(v, w, k, onPath, walk) {
      if (onStack[w] && idx[w]! < low[v]!) low[v] = idx[w]!;
      if (onSeen) onSeen(v, w, k, onPath, walk);
    },
    leave(v, parent) {
      if (low[v] === idx[v]) {
        let size = 0;
        let w: number;
        do {
          w = stack[--sp]!;
          onStack[w] = 0;
          comp[w] = count;
          size++;
        } while (w !== v);
        sizes.push(size);
        count++;
      }
      if (parent >= 0 && low[v]! < low[parent]!) low[parent] = low[v]!;
    },
  };
  for (const s of first) walk.run(s, visit);
  for (let s = 0; s < N; s++) walk.run(s, visit);
  return { comp, size: Int32Array.from(sizes), count, walk };
}
