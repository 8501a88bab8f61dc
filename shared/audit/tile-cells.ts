import type { LogColumns } from './log-columns';

/** Zooms served from pre-averaged cells; deeper zooms are served from the points themselves. */
export const CELL_ZOOMS = [12, 13, 14, 15, 16, 17] as const;
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
  // merging the cells of the one below: a cell at zoom z − 1 is four cells at zoom z.
  type Acc = number[]; // cx, cy, n, Σtarget, ntarget, Σapplied, napplied, Σtrue, ntrue, Σspeed, nspeed
  let level = new Map<number, Acc>();
  const k = side / 360;
  const ky = side / (4 * Math.PI);
  const ta = trueApplied;
  for (let i = 0; i < c.n; i++) {
    if (!keep[i]) continue;
    // tileXY at the deepest zoom, scaled to cells, inlined (the hot loop of the import).
    const sn = Math.sin((c.lat[i] * Math.PI) / 180);
    const cx = Math.floor((c.lon[i] + 180) * k);
    const cy = Math.floor(side / 2 - Math.log((1 + sn) / (1 - sn)) * ky);
    if (!(cx >= 0 && cy >= 0 && cx < side && cy < side)) continue;
    const key = cx * side + cy;
    let acc = level.get(key);
    if (!acc) {
      acc = [cx, cy, 0, 0, 0, 0, 0, 0, 0, 0, 0];
      level.set(key, acc);
    }
    acc[2]++;
    const tg = c.target[i];
    if (tg === tg) {
      acc[3] += tg;
      acc[4]++;
    }
    const ap = c.applied[i];
    if (ap === ap) {
      acc[5] += ap;
      acc[6]++;
    }
    if (ta) {
      const tr = ta[i];
      if (tr === tr) {
        acc[7] += tr;
        acc[8]++;
      }
    }
    if (speed) {
      const sp = speed[i];
      if (sp === sp) {
        acc[9] += sp;
        acc[10]++;
      }
    }
  }
  const levels: [number, Map<number, Acc>][] = [[top, level]];
  for (let z = top - 1; z >= CELL_ZOOMS[0]; z--) {
    const next = new Map<number, Acc>();
    const zSide = 2 ** z * CELLS_PER_TILE;
    for (const a of level.values()) {
      const cx = Math.floor(a[0] / 2);
      const cy = Math.floor(a[1] / 2);
      const key = cx * zSide + cy;
      const b = next.get(key);
      if (!b) next.set(key, [cx, cy, ...a.slice(2)]);
      else for (let k = 2; k < a.length; k++) b[k] += a[k];
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
    for (const a of m.values()) {
      out.z[i] = z;
      out.tx[i] = Math.floor(a[0] / CELLS_PER_TILE);
      out.ty[i] = Math.floor(a[1] / CELLS_PER_TILE);
      out.gx[i] = a[0] % CELLS_PER_TILE;
      out.gy[i] = a[1] % CELLS_PER_TILE;
      out.n[i] = a[2];
      out.target[i] = mean(a[3], a[4]);
      out.applied[i] = mean(a[5], a[6]);
      out.appliedTrue[i] = mean(a[7], a[8]);
      out.speed[i] = mean(a[9], a[10]);
      i++;
    }
  }
  return out;
}
