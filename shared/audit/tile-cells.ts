import type { LogColumns } from './log-columns';

/** Zooms served from pre-averaged cells; deeper zooms are served from the points themselves. */
export const CELL_ZOOMS = [12, 13, 14, 15, 16, 17, 18] as const;
/** Cells per tile side (a 256-pixel tile: one cell every two pixels). */
export const CELLS_PER_TILE = 128;
/** Tile extent of the vector tiles (MVT default). */
export const TILE_EXTENT = 4096;

export type TileCells = {
  z: Int16Array;
  tx: Int32Array;
  ty: Int32Array;
  gx: Int16Array;
  gy: Int16Array;
  n: Int32Array;
  target: Float64Array;
  applied: Float64Array;
  appliedTrue: Float64Array;
  speed: Float64Array;
  length: number;
};

/** Web Mercator tile coordinates (fractional) of a point at zoom z (the slippy-map convention). */
export function tileXY(lon: number, lat: number, z: number): [number, number] {
  const scale = 2 ** z;
  const s = Math.sin((lat * Math.PI) / 180);
  const x = ((lon + 180) / 360) * scale;
  const y = (0.5 - Math.log((1 + s) / (1 - s)) / (4 * Math.PI)) * scale;
  return [x, y];
}

/** Per cell: points, then Σ and count of target, applied, true applied and speed. */
const SUMS = 9;

/**
 * Cells keyed by their grid coordinates (cx, cy), numbered in the order they first appear, with SUMS sums
 * each: an open-addressing hash on two integers in flat typed arrays (a Map keyed by cx · side + cy, past the
 * small-integer range, with an array per cell, cost most of the time of this step).
 */
class CellSums {
  size = 0;
  cx: Int32Array;
  cy: Int32Array;
  sums: Float64Array;
  /** Hash slot → cell number + 1 (0: empty); kept at most half full. */
  private slots: Int32Array;

  constructor(expected: number) {
    const capacity = Math.max(16, expected);
    this.cx = new Int32Array(capacity);
    this.cy = new Int32Array(capacity);
    this.sums = new Float64Array(capacity * SUMS);
    this.slots = new Int32Array(2 ** Math.ceil(Math.log2(2 * capacity)));
  }

  /** The slot where cell (cx, cy) is or would go. */
  private slotOf(cx: number, cy: number): number {
    const mask = this.slots.length - 1;
    let h = (Math.imul(cx, 0x9e3779b1) ^ Math.imul(cy + 0x632be5ab, 0x85ebca77)) >>> 0;
    h = (h ^ (h >>> 15)) & mask;
    for (;;) {
      const k = this.slots[h] - 1;
      if (k < 0 || (this.cx[k] === cx && this.cy[k] === cy)) return h;
      h = (h + 1) & mask;
    }
  }

  /** The number of cell (cx, cy), or −1 when it is not there yet. */
  find(cx: number, cy: number): number {
    return this.slots[this.slotOf(cx, cy)] - 1;
  }

  /** Adds cell (cx, cy), which is not there yet, with all sums 0; returns its number. */
  add(cx: number, cy: number): number {
    if (2 * (this.size + 1) > this.slots.length) this.grow();
    const k = this.size++;
    if (k >= this.cx.length) {
      const cap = 2 * this.cx.length;
      const grown = (a: Int32Array) => {
        const b = new Int32Array(cap);
        b.set(a);
        return b;
      };
      this.cx = grown(this.cx);
      this.cy = grown(this.cy);
      const sums = new Float64Array(cap * SUMS);
      sums.set(this.sums);
      this.sums = sums;
    }
    this.cx[k] = cx;
    this.cy[k] = cy;
    this.slots[this.slotOf(cx, cy)] = k + 1;
    return k;
  }

  private grow() {
    this.slots = new Int32Array(2 * this.slots.length);
    for (let k = 0; k < this.size; k++) this.slots[this.slotOf(this.cx[k], this.cy[k])] = k + 1;
  }
}

/**
 * The kept points averaged onto a grid of CELLS_PER_TILE × CELLS_PER_TILE cells per tile, at each of
 * CELL_ZOOMS: what a map at those zooms can show at all (a cell is two screen pixels), computed once at
 * import so a tile is a small indexed read instead of an average over a million points. Means are plain
 * means of the points in the cell (NaN values left out; a cell with none of a value holds NaN).
 */
export function tileCells(c: LogColumns, keep: Uint8Array, trueApplied: Float64Array | null): TileCells {
  const speed = c.gnssMps ?? c.speedMps ?? c.wheelMps;
  const top = CELL_ZOOMS[CELL_ZOOMS.length - 1];
  const side = 2 ** top * CELLS_PER_TILE;
  // One pass over the points at the deepest zoom (sums and counts per cell), then each shallower zoom by
  // merging the cells of the one below: a cell at zoom z − 1 is four cells at zoom z. Cells are listed in the
  // order they first appear, and the sums added in point order (then child order), at every zoom.
  // About one cell per eight points to start with (a 10 Hz log moves about a cell in that time); it grows.
  let level = new CellSums(c.n >> 3);
  const k = side / 360;
  const ky = side / (4 * Math.PI);
  const ta = trueApplied;
  const { lon, lat, target, applied } = c;
  // Consecutive points mostly share a cell (a 10 Hz log moves a fraction of a cell a point): the last one found.
  let lastX = -1;
  let lastY = -1;
  let cell = -1;
  // The row of the last latitude: a point at the same latitude as the one before (a pass along a parallel
  // without position noise) skips the sine and the logarithm.
  let lastLat = Number.NaN;
  let cy = -1;
  for (let i = 0; i < c.n; i++) {
    if (!keep[i]) continue;
    // tileXY at the deepest zoom, scaled to cells, inlined (the hot loop of the import).
    const cx = Math.floor((lon[i] + 180) * k);
    if (lat[i] !== lastLat) {
      lastLat = lat[i];
      const sn = Math.sin((lastLat * Math.PI) / 180);
      cy = Math.floor(side / 2 - Math.log((1 + sn) / (1 - sn)) * ky);
    }
    if (!(cx >= 0 && cy >= 0 && cx < side && cy < side)) continue;
    if (cx !== lastX || cy !== lastY) {
      cell = level.find(cx, cy);
      if (cell < 0) cell = level.add(cx, cy);
      lastX = cx;
      lastY = cy;
    }
    const acc = level.sums;
    const o = cell * SUMS;
    acc[o]++;
    const tg = target[i];
    if (tg === tg) {
      acc[o + 1] += tg;
      acc[o + 2]++;
    }
    const ap = applied[i];
    if (ap === ap) {
      acc[o + 3] += ap;
      acc[o + 4]++;
    }
    if (ta) {
      const tr = ta[i];
      if (tr === tr) {
        acc[o + 5] += tr;
        acc[o + 6]++;
      }
    }
    if (speed) {
      const sp = speed[i];
      if (sp === sp) {
        acc[o + 7] += sp;
        acc[o + 8]++;
      }
    }
  }
  const levels: [number, CellSums][] = [[top, level]];
  for (let z = top - 1; z >= CELL_ZOOMS[0]; z--) {
    // At most as many cells as the level below: the table never grows.
    const next = new CellSums(level.size);
    const from = level.sums;
    const to = next.sums;
    for (let a = 0; a < level.size; a++) {
      const cx = Math.floor(level.cx[a] / 2);
      const cy = Math.floor(level.cy[a] / 2);
      let b = next.find(cx, cy);
      // The first child's sums are copied, the others' added (in the order of the level below).
      if (b < 0) {
        b = next.add(cx, cy);
        for (let j = 0; j < SUMS; j++) to[b * SUMS + j] = from[a * SUMS + j];
      } else {
        for (let j = 0; j < SUMS; j++) to[b * SUMS + j] += from[a * SUMS + j];
      }
    }
    levels.push([z, next]);
    level = next;
  }
  const n = levels.reduce((s, [, m]) => s + m.size, 0);
  const out: TileCells = {
    z: new Int16Array(n),
    tx: new Int32Array(n),
    ty: new Int32Array(n),
    gx: new Int16Array(n),
    gy: new Int16Array(n),
    n: new Int32Array(n),
    target: new Float64Array(n),
    applied: new Float64Array(n),
    appliedTrue: new Float64Array(n),
    speed: new Float64Array(n),
    length: n,
  };
  const mean = (s: number, k: number) => (k > 0 ? s / k : Number.NaN);
  let i = 0;
  for (const [z, m] of levels) {
    const a = m.sums;
    for (let j = 0; j < m.size; j++, i++) {
      const o = j * SUMS;
      out.z[i] = z;
      out.tx[i] = Math.floor(m.cx[j] / CELLS_PER_TILE);
      out.ty[i] = Math.floor(m.cy[j] / CELLS_PER_TILE);
      out.gx[i] = m.cx[j] % CELLS_PER_TILE;
      out.gy[i] = m.cy[j] % CELLS_PER_TILE;
      out.n[i] = a[o];
      out.target[i] = mean(a[o + 1], a[o + 2]);
      out.applied[i] = mean(a[o + 3], a[o + 4]);
      out.appliedTrue[i] = mean(a[o + 5], a[o + 6]);
      out.speed[i] = mean(a[o + 7], a[o + 8]);
    }
  }
  return out;
}
