import type { MultiPolygon } from 'geojson';
import { geodesicAreaM2 } from './geodesic-area';
import { type GridFrame, cellsCrossed, cellsInside } from './grid-frame';
import { type AreaLike, asMultiPolygon, intersectAreas, unionAreas } from './polygon-clip';

/** One polygonised piece: the class it carries and its area as a MultiPolygon ([lon, lat], RFC 7946). */
export type ClassPart = { classIndex: number; geometry: MultiPolygon };

/**
 * Every cell without a class (negative) takes the class of the nearest classed cell, by a breadth-first
 * flood over 4-neighbours from all classed cells at once. Returns a new array, or null if no cell is classed.
 */
function fillUnclassed(classOf: Int32Array, cols: number, rows: number): Int32Array | null {
  const out = Int32Array.from(classOf);
  const queue = new Int32Array(cols * rows);
  let head = 0;
  let tail = 0;
  for (let i = 0; i < out.length; i++) if (out[i] >= 0) queue[tail++] = i;
  if (tail === 0) return null;
  while (head < tail) {
    const i = queue[head++];
    const c = i % cols;
    const r = (i - c) / cols;
    const visit = (j: number) => {
      if (out[j] < 0) {
        out[j] = out[i];
        queue[tail++] = j;
      }
    };
    if (c > 0) visit(i - 1);
    if (c + 1 < cols) visit(i + 1);
    if (r > 0) visit(i - cols);
    if (r + 1 < rows) visit(i + cols);
  }
  return out;
}

/** Connected regions (4-connectivity) of equal class: a region number per cell and the count of regions. */
function labelRegions(cls: Int32Array, cols: number, rows: number): { label: Int32Array; count: number } {
  const label = new Int32Array(cls.length).fill(-1);
  const stack = new Int32Array(cls.length);
  let count = 0;
  for (let s = 0; s < cls.length; s++) {
    if (label[s] >= 0) continue;
    let top = 0;
    stack[top++] = s;
    label[s] = count;
    while (top > 0) {
      const i = stack[--top];
      const c = i % cols;
      const r = (i - c) / cols;
      const push = (j: number) => {
        if (label[j] < 0 && cls[j] === cls[i]) {
          label[j] = count;
          stack[top++] = j;
        }
      };
      if (c > 0) push(i - 1);
      if (c + 1 < cols) push(i + 1);
      if (r > 0) push(i - cols);
      if (r + 1 < rows) push(i + cols);
    }
    count++;
  }
  return { label, count };
}

// Directions of boundary edges on the grid-line lattice: east, north, west, south.
const DX = [1, 0, -1, 0];
const DY = [0, 1, 0, -1];

/**
 * Rings of every region by edge tracing. Each cell edge between a region and anything else becomes a directed
 * edge with the region on its left; edges are chained, turning left first where two leave one vertex (so
 * regions touching only at a corner stay apart, as 4-connectivity says). Exterior rings come out
 * counter-clockwise and holes clockwise (RFC 7946); straight runs are merged. Vertices are lattice (col, row).
 */
function traceRegions(label: Int32Array, count: number, cols: number, rows: number): number[][][][] {
  const W = cols + 1;
  const at = (c: number, r: number) => (c < 0 || r < 0 || c >= cols || r >= rows ? -1 : label[r * cols + c]);
  // A directed edge (start vertex, direction) has exactly one region on its left, so one array holds them all.
  const edgeRegion = new Int32Array(W * (rows + 1) * 4).fill(-1);
  const used = new Uint8Array(edgeRegion.length);
  const edgesOf: number[][] = Array.from({ length: count }, () => []);
  const add = (region: number, vx: number, vy: number, dir: number) => {
    const key = (vy * W + vx) * 4 + dir;
    edgeRegion[key] = region;
    edgesOf[region].push(key);
  };
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const g = label[r * cols + c];
      if (at(c, r - 1) !== g) add(g, c, r, 0); // south side, going east
      if (at(c + 1, r) !== g) add(g, c + 1, r, 1); // east side, going north
      if (at(c, r + 1) !== g) add(g, c + 1, r + 1, 2); // north side, going west
      if (at(c - 1, r) !== g) add(g, c, r + 1, 3); // west side, going south
    }
  }
  const area2 = (ring: number[][]) =>
    ring.reduce((s, p, i) => (i ? s + ring[i - 1][0] * p[1] - p[0] * ring[i - 1][1] : s), 0);
  return edgesOf.map((edges, g) => {
    const rings: number[][][] = [];
    for (const startKey of edges) {
      if (used[startKey]) continue;
      const ring: number[][] = [];
      let key = startKey;
      while (!used[key]) {
        used[key] = 1;
        const dir = key % 4;
        const v = (key - dir) / 4;
        const vx = v % W;
        const vy = (v - vx) / W;
        ring.push([vx, vy, dir]);
        const nv = (vy + DY[dir]) * W + vx + DX[dir];
        // Left turn first, then straight on, then right.
        let next = -1;
        for (const d of [(dir + 1) % 4, dir, (dir + 3) % 4]) {
          const k = nv * 4 + d;
          if (edgeRegion[k] === g && !used[k]) {
            next = k;
            break;
          }
        }
        if (next < 0) break;
        key = next;
      }
      // Keep only the vertices where the direction changes.
      const corners = ring
        .filter((p, i) => p[2] !== ring[(i + ring.length - 1) % ring.length][2])
        .map(([x, y]) => [x, y]);
      if (corners.length >= 3) rings.push([...corners, corners[0]]);
    }
    // One exterior (counter-clockwise, positive) per connected region, first; the clockwise rings are its holes.
    return rings.sort((a, b) => area2(b) - area2(a));
  });
}

/**
 * Turns a classed grid into polygons: one part per connected region (4-connectivity) of cells of equal class,
 * traced to rings with holes kept, then clipped to the field boundary. `classOf` holds a class index per cell
 * (row-major like the grid's values; negative for no class). Cells without a class take the class of the
 * nearest classed cell first, so the parts cover the whole boundary, edge cells included. Regions wholly
 * inside the boundary are not clipped. Coordinates are [lon, lat] from the grid's lattice; neighbouring parts
 * share their vertices exactly. Inputs are not mutated.
 */
export function polygoniseClasses(grid: GridFrame, classOf: Int32Array, boundary: AreaLike): ClassPart[] {
  const { cols, rows } = grid;
  const cls = fillUnclassed(classOf, cols, rows);
  if (!cls) return [];
  const { label, count } = labelRegions(cls, cols, rows);
  const area = asMultiPolygon(boundary);
  const inside = cellsInside(grid, area);
  const crossed = cellsCrossed(grid, area);
  const firstCell = new Int32Array(count).fill(-1);
  const needsClip = new Uint8Array(count);
  for (let i = 0; i < label.length; i++) {
    if (firstCell[label[i]] < 0) firstCell[label[i]] = i;
    if (!inside[i] || crossed[i]) needsClip[label[i]] = 1;
  }
  const lon = (x: number) => grid.originLon + x * grid.lonStep;
  const lat = (y: number) => grid.originLat + y * grid.latStep;
  const parts: ClassPart[] = [];
  traceRegions(label, count, cols, rows).forEach((rings, g) => {
    const poly: MultiPolygon = {
      type: 'MultiPolygon',
      coordinates: [rings.map((ring) => ring.map(([x, y]) => [lon(x), lat(y)]))],
    };
    const clipped = needsClip[g] ? intersectAreas(poly, area) : poly;
    if (clipped) parts.push({ classIndex: cls[firstCell[g]], geometry: clipped });
  });
  return parts;
}

/**
 * Grid-level version of {@link dissolveSmall}, for whole grids: regions (4-connectivity, after filling cells
 * without a class as {@link polygoniseClasses} does) whose weight is under `minAreaM2` are relabelled with the
 * class of the neighbour region sharing the most cell edges, or failing that the largest region touching it
 * at a corner; smallest first, weights adding up. `weightM2` is each cell's area inside the boundary (m²).
 * Returns new classes per cell (every cell classed), or null when no cell has a class.
 */
export function dissolveSmallCells(
  grid: GridFrame,
  classOf: Int32Array,
  weightM2: Float64Array,
  minAreaM2: number,
): Int32Array | null {
  const { cols, rows } = grid;
  const cls = fillUnclassed(classOf, cols, rows);
  if (!cls || !(minAreaM2 > 0)) return cls;
  const { label, count } = labelRegions(cls, cols, rows);
  const area = new Float64Array(count);
  const regionClass = new Int32Array(count);
  const shared: Map<number, number>[] = Array.from({ length: count }, () => new Map());
  const corner: Set<number>[] = Array.from({ length: count }, () => new Set());
  const link = (a: number, b: number, edge: boolean) => {
    if (a === b) return;
    if (edge) {
      shared[a].set(b, (shared[a].get(b) ?? 0) + 1);
      shared[b].set(a, (shared[b].get(a) ?? 0) + 1);
    } else {
      corner[a].add(b);
      corner[b].add(a);
    }
  };
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const i = r * cols + c;
      const g = label[i];
      area[g] += weightM2[i];
      regionClass[g] = cls[i];
      if (c + 1 < cols) link(g, label[i + 1], true);
      if (r + 1 < rows) {
        link(g, label[i + cols], true);
        if (c + 1 < cols) link(g, label[i + cols + 1], false);
        if (c > 0) link(g, label[i + cols - 1], false);
      }
    }
  }
  const root = Int32Array.from({ length: count }, (_, i) => i);
  const find = (i: number): number => {
    while (root[i] !== i) i = root[i] = root[root[i]];
    return i;
  };
  // Smallest first: regions sorted by weight; a merged region is revisited while still small.
  const order = Array.from({ length: count }, (_, i) => i).filter((i) => area[i] < minAreaM2);
  order.sort((a, b) => area[a] - area[b]);
  const heap = order; // processed front to back; merged targets that stay small are pushed again
  for (let h = 0; h < heap.length; h++) {
    const small = heap[h];
    if (find(small) !== small || area[small] >= minAreaM2) continue;
    let target = -1;
    let best = 0;
    for (const [q, n] of shared[small]) {
      const t = find(q);
      if (t !== small && (n > best || (n === best && area[t] > area[target]))) [target, best] = [t, n];
    }
    if (target < 0) {
      for (const q of corner[small]) {
        const t = find(q);
        if (t !== small && (target < 0 || area[t] > area[target])) target = t;
      }
    }
    if (target < 0) continue;
    root[small] = target;
    area[target] += area[small];
    for (const [q, n] of shared[small]) {
      const t = find(q);
      if (t !== target) shared[target].set(t, (shared[target].get(t) ?? 0) + n);
      if (t !== target) shared[t].set(target, (shared[t].get(target) ?? 0) + n);
    }
    for (const q of corner[small]) {
      const t = find(q);
      if (t !== target) {
        corner[target].add(t);
        corner[t].add(target);
      }
    }
    if (area[target] < minAreaM2) heap.push(target);
  }
  return Int32Array.from(label, (g) => regionClass[find(g)]);
}

// ---- dissolving small fragments ----

/** Length in metres of an axis-aligned step on the sphere of 6 371 008.8 m: enough to rank shared edges. */
const DEG_M = (6_371_008.8 * Math.PI) / 180;

/**
 * Shared edge lengths (m) between parts, from their axis-aligned segments lying on a common grid line
 * (polygonised parts meet only along grid lines), and which parts share at least a vertex.
 */
function adjacency(parts: ClassPart[]): {
  shared: Map<number, Map<number, number>>;
  touching: Map<number, Set<number>>;
} {
  type Seg = { part: number; a: number; b: number };
  const lines = new Map<string, Seg[]>();
  const vertices = new Map<string, Set<number>>();
  const key = (v: number) => v.toFixed(10);
  parts.forEach((p, part) => {
    for (const rings of p.geometry.coordinates) {
      for (const ring of rings) {
        for (let i = 0; i + 1 < ring.length; i++) {
          const [x1, y1] = ring[i];
          const [x2, y2] = ring[i + 1];
          const vk = `${key(x1)},${key(y1)}`;
          (vertices.get(vk) ?? vertices.set(vk, new Set()).get(vk)!).add(part);
          let lk: string | null = null;
          let a = 0;
          let b = 0;
          if (y1 === y2) [lk, a, b] = [`h${key(y1)}`, Math.min(x1, x2), Math.max(x1, x2)];
          else if (x1 === x2) [lk, a, b] = [`v${key(x1)}`, Math.min(y1, y2), Math.max(y1, y2)];
          if (lk) (lines.get(lk) ?? lines.set(lk, []).get(lk)!).push({ part, a, b });
        }
      }
    }
  });
  const shared = new Map<number, Map<number, number>>();
  const addShared = (i: number, j: number, m: number) => {
    for (const [p, q] of [
      [i, j],
      [j, i],
    ]) {
      const row = shared.get(p) ?? shared.set(p, new Map()).get(p)!;
      row.set(q, (row.get(q) ?? 0) + m);
    }
  };
  for (const [lk, segs] of lines) {
    const scale = lk[0] === 'h' ? DEG_M * Math.cos((Number(lk.slice(1)) * Math.PI) / 180) : DEG_M;
    segs.sort((s, t) => s.a - t.a);
    for (let i = 0; i < segs.length; i++) {
      for (let j = i + 1; j < segs.length && segs[j].a < segs[i].b; j++) {
        if (segs[i].part === segs[j].part) continue;
        const overlap = Math.min(segs[i].b, segs[j].b) - segs[j].a;
        if (overlap > 0) addShared(segs[i].part, segs[j].part, overlap * scale);
      }
    }
  }
  const touching = new Map<number, Set<number>>();
  for (const set of vertices.values()) {
    for (const p of set)
      for (const q of set) if (p !== q) (touching.get(p) ?? touching.set(p, new Set()).get(p)!).add(q);
  }
  return { shared, touching };
}

/**
 * Merges every part smaller than `minAreaM2` (geodesic m²) into a neighbour: the one sharing the longest edge
 * with it or, when none shares an edge, the largest part touching it; the merged part keeps the neighbour's
 * class. Smallest fragments go first and merged areas add up, so a merge can take several steps. A part with
 * no neighbour at all keeps its class. Returns new parts; geometry of merged groups is their union. Shared
 * edges are found along grid lines, so the parts should come from {@link polygoniseClasses}.
 */
export function dissolveSmall(parts: ClassPart[], minAreaM2: number): ClassPart[] {
  if (!(minAreaM2 > 0) || parts.length < 2) return parts.map((p) => ({ ...p }));
  const area = parts.map((p) => geodesicAreaM2(p.geometry));
  const { shared, touching } = adjacency(parts);
  // Union–find over parts; group data lives on the root.
  const root = parts.map((_, i) => i);
  const find = (i: number): number => (root[i] === i ? i : (root[i] = find(root[i])));
  const cls = parts.map((p) => p.classIndex);
  const groupShared = new Map<number, Map<number, number>>(Array.from(shared, ([k, v]) => [k, new Map(v)]));
  const groupTouch = new Map<number, Set<number>>(Array.from(touching, ([k, v]) => [k, new Set(v)]));
  const stuck = new Set<number>();
  for (;;) {
    let small = -1;
    for (let i = 0; i < parts.length; i++) {
      if (find(i) === i && !stuck.has(i) && area[i] < minAreaM2 && (small < 0 || area[i] < area[small]))
        small = i;
    }
    if (small < 0) break;
    let target = -1;
    let best = 0;
    for (const [q, len] of groupShared.get(small) ?? []) {
      const r = find(q);
      if (r !== small && (len > best || (len === best && target >= 0 && area[r] > area[target])))
        [target, best] = [r, len];
    }
    if (target < 0) {
      for (const q of groupTouch.get(small) ?? []) {
        const r = find(q);
        if (r !== small && (target < 0 || area[r] > area[target])) target = r;
      }
    }
    if (target < 0) {
      stuck.add(small);
      continue;
    }
    // Merge small into target: areas add, shared lengths and touches carry over.
    root[small] = target;
    area[target] += area[small];
    const ts = groupShared.get(target) ?? groupShared.set(target, new Map()).get(target)!;
    for (const [q, len] of groupShared.get(small) ?? []) {
      const r = find(q);
      if (r === target) continue;
      ts.set(r, (ts.get(r) ?? 0) + len);
      const back = groupShared.get(r) ?? groupShared.set(r, new Map()).get(r)!;
      back.set(target, (back.get(target) ?? 0) + len);
    }
    const tt = groupTouch.get(target) ?? groupTouch.set(target, new Set()).get(target)!;
    for (const q of groupTouch.get(small) ?? []) {
      const r = find(q);
      if (r !== target) {
        tt.add(r);
        (groupTouch.get(r) ?? groupTouch.set(r, new Set()).get(r)!).add(target);
      }
    }
  }
  const members = new Map<number, number[]>();
  parts.forEach((_, i) => {
    const r = find(i);
    (members.get(r) ?? members.set(r, []).get(r)!).push(i);
  });
  const out: ClassPart[] = [];
  for (const [r, list] of members) {
    const geometry = list.length === 1 ? parts[r].geometry : unionAreas(list.map((i) => parts[i].geometry));
    if (geometry) out.push({ classIndex: cls[r], geometry });
  }
  return out;
}
