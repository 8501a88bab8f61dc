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
  const rows: number[][] = [];
  for (const z of CELL_ZOOMS) {
    const index = new Map<number, number>();
    const scale = 2 ** z;
    for (let i = 0; i < c.n; i++) {
      if (!keep[i]) continue;
      const [x, y] = tileXY(c.lon[i], c.lat[i], z);
      const cx = Math.floor(x * CELLS_PER_TILE);
      const cy = Math.floor(y * CELLS_PER_TILE);
      if (!(cx >= 0 && cy >= 0 && cx < scale * CELLS_PER_TILE && cy < scale * CELLS_PER_TILE)) continue;
      const key = cx * scale * CELLS_PER_TILE + cy;
      let r = index.get(key);
      if (r === undefined) {
        r = rows.length;
        index.set(key, r);
        // z, cx, cy, n, Σtarget, ntarget, Σapplied, napplied, Σtrue, ntrue, Σspeed, nspeed
        rows.push([z, cx, cy, 0, 0, 0, 0, 0, 0, 0, 0, 0]);
      }
      const row = rows[r];
      row[3]++;
      const add = (v: number, at: number) => {
        if (Number.isFinite(v)) {
          row[at] += v;
          row[at + 1]++;
        }
      };
      add(c.target[i], 4);
      add(c.applied[i], 6);
      if (trueApplied) add(trueApplied[i], 8);
      if (speed) add(speed[i], 10);
    }
  }
  const n = rows.length;
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
  rows.forEach((r, i) => {
    out.z[i] = r[0];
    out.tx[i] = Math.floor(r[1] / CELLS_PER_TILE);
    out.ty[i] = Math.floor(r[2] / CELLS_PER_TILE);
    out.gx[i] = r[1] % CELLS_PER_TILE;
    out.gy[i] = r[2] % CELLS_PER_TILE;
    out.n[i] = r[3];
    out.target[i] = mean(r[4], r[5]);
    out.applied[i] = mean(r[6], r[7]);
    out.appliedTrue[i] = mean(r[8], r[9]);
    out.speed[i] = mean(r[10], r[11]);
  });
  return out;
}
