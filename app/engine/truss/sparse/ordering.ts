// Reverse Cuthill-McKee ordering of a symmetric graph: a breadth-first numbering from a
// pseudo-peripheral vertex, neighbours by increasing degree, then reversed. It keeps every
// vertex's neighbours close in the numbering, which keeps the skyline profile small.

/** Symmetric adjacency in compressed form: neighbours of v are adj[ptr[v] .. ptr[v+1]). */
export interface Graph {
  n: number;
  ptr: Int32Array;
  adj: Int32Array;
}

/** Builds the adjacency of the graph with the given undirected edges (duplicates and self-loops dropped). */
export function graphFromEdges(n: number, a: Int32Array, b: Int32Array, keep?: (e: number) => boolean): Graph {
  const deg = new Int32Array(n);
  const m = a.length;
  for (let e = 0; e < m; e++) {
    if (a[e] === b[e] || (keep && !keep(e))) continue;
    deg[a[e]]++;
    deg[b[e]]++;
  }
  const ptr = new Int32Array(n + 1);
  for (let v = 0; v < n; v++) ptr[v + 1] = ptr[v] + deg[v];
  const fill = ptr.slice(0, n);
  const raw = new Int32Array(ptr[n]);
  for (let e = 0; e < m; e++) {
    if (a[e] === b[e] || (keep && !keep(e))) continue;
    raw[fill[a[e]]++] = b[e];
    raw[fill[b[e]]++] = a[e];
  }
  // sort each list and drop duplicate edges (two members between the same nodes)
  const outPtr = new Int32Array(n + 1);
  const out = new Int32Array(ptr[n]);
  let k = 0;
  for (let v = 0; v < n; v++) {
    const seg = raw.subarray(ptr[v], ptr[v + 1]).sort();
    for (let t = 0; t < seg.length; t++) if (t === 0 || seg[t] !== seg[t - 1]) out[k++] = seg[t];
    outPtr[v + 1] = k;
  }
  return { n, ptr: outPtr, adj: out.slice(0, k) };
}

/** BFS levels from root within the vertices marked in `active`; returns the last level and its depth. */
function levels(g: Graph, root: number, mark: Int32Array, stamp: number, queue: Int32Array): { depth: number; lastStart: number; count: number } {
  let head = 0;
  let tail = 0;
  queue[tail++] = root;
  mark[root] = stamp;
  let depth = 0;
  let levelEnd = 1;
  let lastStart = 0;
  while (head < tail) {
    const v = queue[head++];
    for (let p = g.ptr[v]; p < g.ptr[v + 1]; p++) {
      const w = g.adj[p];
      if (mark[w] !== stamp) {
        mark[w] = stamp;
        queue[tail++] = w;
      }
    }
    if (head === levelEnd && head < tail) {
      depth++;
      lastStart = head;
      levelEnd = tail;
    }
  }
  return { depth, lastStart, count: tail };
}

/**
 * Reverse Cuthill-McKee order of the vertices with include[v] = 1 (all when omitted).
 * Returns order[k] = vertex placed k-th; each connected component is numbered in turn.
 */
export function reverseCuthillMcKee(g: Graph, include?: Uint8Array): Int32Array {
  const n = g.n;
  const deg = new Int32Array(n);
  for (let v = 0; v < n; v++) deg[v] = g.ptr[v + 1] - g.ptr[v];
  const inc = (v: number) => !include || include[v] === 1;
  let total = 0;
  for (let v = 0; v < n; v++) if (inc(v)) total++;
  const order = new Int32Array(total);
  const placed = new Uint8Array(n);
  const mark = new Int32Array(n);
  const queue = new Int32Array(n);
  let stamp = 0;
  let k = 0;
  for (let seed = 0; seed < n; seed++) {
    if (!inc(seed) || placed[seed]) continue;
    // pseudo-peripheral root (George & Liu): jump to a minimum-degree vertex of the last level
    // while that deepens the level structure
    let root = seed;
    let info = levels(g, root, mark, ++stamp, queue);
    for (let iter = 0; iter < 8; iter++) {
      let best = -1;
      for (let t = info.lastStart; t < info.count; t++) {
        const w = queue[t];
        if (best < 0 || deg[w] < deg[best]) best = w;
      }
      if (best < 0 || best === root) break;
      const next = levels(g, best, mark, ++stamp, queue);
      if (next.depth <= info.depth) break;
      root = best;
      info = next;
    }
    // Cuthill-McKee from root
    const startK = k;
    order[k++] = root;
    placed[root] = 1;
    let head = startK;
    while (head < k) {
      const v = order[head++];
      const from = k;
      for (let p = g.ptr[v]; p < g.ptr[v + 1]; p++) {
        const w = g.adj[p];
        if (!placed[w] && inc(w)) {
          placed[w] = 1;
          order[k++] = w;
        }
      }
      // neighbours by increasing degree (short insertion sort: lists are small)
      for (let a = from + 1; a < k; a++) {
        const w = order[a];
        let b = a - 1;
        while (b >= from && deg[order[b]] > deg[w]) {
          order[b + 1] = order[b];
          b--;
        }
        order[b + 1] = w;
      }
    }
    order.subarray(startK, k).reverse();
  }
  return order;
}
