import type { MultiPolygon } from 'geojson';
import { GeoInputError } from '../geo/geo-input-error';
import { metresPerDegree } from '../geo/interpolate-idw';
// The same codes as the rate grid's cells (−1 in the field but no zone, −2 outside).
import { IN_FIELD_NO_ZONE, OUT_OF_FIELD } from '../geo/rate-grid';

/**
 * Which zone each log point lies in (DEVELOPERS.md "As-applied logs", PERFORMANCE.md "the raster zone join").
 *
 * Result per point: the index of the first zone (in the order given) whose area holds it, {@link IN_FIELD_NO_ZONE}
 * inside the boundary but in no zone, {@link OUT_OF_FIELD} outside the boundary (or with a coordinate that is not
 * a number). Inside means the even–odd ray-casting rule over every ring of the MultiPolygon (PNPOLY: a ring
 * edge (x1, y1)–(x2, y2) is crossed when (y1 > y) ≠ (y2 > y) and x < x1 + (y − y1)(x2 − x1)/(y2 − y1)), so
 * holes are outside and the answer is the same as a plain ray cast for every point.
 *
 * Method: a grid over the boundary's bounding box (a cell of {@link ZONE_JOIN_CELL_M} m, larger when the grid
 * would pass {@link ZONE_JOIN_MAX_CELLS} cells). Every cell that an edge of the boundary or of a zone touches,
 * or passes within a millionth of a cell of, is marked as straddling; each other cell lies wholly in one region
 * and takes the label of its centre, found by one scanline per row over all rings at once. A point in a plain
 * cell takes the cell's label; a point in a straddling cell is ray-cast exactly against the edges whose
 * latitude range meets its grid row (every edge that can cross its ray is among them, because the row of a
 * latitude is a monotone function of it). Cost: O(cells + edges × cells they touch) to build, O(1) per point
 * away from edges.
 */
export { IN_FIELD_NO_ZONE, OUT_OF_FIELD };
/** Local copies: read per point. */
const OUTSIDE: number = OUT_OF_FIELD;
const NO_ZONE: number = IN_FIELD_NO_ZONE;

/** Side of a grid cell, metres (cells straddling an edge cost a ray cast; smaller cells make fewer of them). */
export const ZONE_JOIN_CELL_M = 2;
/** Largest grid (cells): about 6 MB of labels and flags. */
export const ZONE_JOIN_MAX_CELLS = 2_000_000;
/** Zone indexes must fit an Int16Array. */
const MAX_ZONES = 32_000;
/** Label of a cell an edge passes near. */
const STRADDLE = -3;
/** How close (in cells) an edge may pass to a cell before the cell counts as straddling. */
const EPS = 1e-6;

type Edges = {
  x1: Float64Array;
  y1: Float64Array;
  x2: Float64Array;
  y2: Float64Array;
  /** 0 the boundary, z + 1 zone z. */
  layer: Int32Array;
  count: number;
};

function collectEdges(polygons: MultiPolygon[]): Edges {
  let total = 0;
  for (const mp of polygons) for (const rings of mp.coordinates) for (const r of rings) total += r.length;
  const e: Edges = {
    x1: new Float64Array(total),
    y1: new Float64Array(total),
    x2: new Float64Array(total),
    y2: new Float64Array(total),
    layer: new Int32Array(total),
    count: 0,
  };
  polygons.forEach((mp, layer) => {
    for (const rings of mp.coordinates) {
      for (const ring of rings) {
        // Closed or not: the edge from the last position back to the first closes it (length 0 if closed).
        for (let i = 0, n = ring.length, j = n - 1; i < n; j = i++) {
          const [ax, ay] = ring[j];
          const [bx, by] = ring[i];
          const k = e.count++;
          e.x1[k] = ax;
          e.y1[k] = ay;
          e.x2[k] = bx;
          e.y2[k] = by;
          e.layer[k] = layer;
        }
      }
    }
  });
  return e;
}

function checkPolygon(mp: MultiPolygon, what: string) {
  if (!mp || mp.type !== 'MultiPolygon' || !Array.isArray(mp.coordinates)) {
    throw new GeoInputError(`${what} is not a MultiPolygon`);
  }
  for (const rings of mp.coordinates) {
    for (const ring of rings) {
      for (const p of ring) {
        if (!Number.isFinite(p[0]) || !Number.isFinite(p[1])) {
          throw new GeoInputError(
            `${what} has a position that is not a pair of numbers: ${JSON.stringify(p)}`,
          );
        }
      }
    }
  }
}

/** The zone each point (lon[i], lat[i]) lies in; see the comment at the top of this file. */
export function zoneIndexOf(
  lon: Float64Array,
  lat: Float64Array,
  zones: MultiPolygon[],
  boundary: MultiPolygon,
): Int16Array {
  if (lon.length !== lat.length) {
    throw new GeoInputError(`${lon.length} longitudes but ${lat.length} latitudes`);
  }
  if (zones.length > MAX_ZONES) throw new GeoInputError(`${zones.length} zones: at most ${MAX_ZONES}`);
  checkPolygon(boundary, 'The field boundary');
  zones.forEach((z, i) => checkPolygon(z, `Zone ${i + 1}`));
  const n = lon.length;
  const out = new Int16Array(n).fill(OUTSIDE);

  // The boundary's bounding box (all rings: a hole cannot lie outside its exterior anyway).
  let west = Infinity;
  let east = -Infinity;
  let south = Infinity;
  let north = -Infinity;
  for (const rings of boundary.coordinates) {
    for (const ring of rings) {
      for (const [x, y] of ring) {
        if (x < west) west = x;
        if (x > east) east = x;
        if (y < south) south = y;
        if (y > north) north = y;
      }
    }
  }
  if (!(west < east && south < north)) return out; // no area: every point is outside

  const perDeg = metresPerDegree((south + north) / 2);
  const widthM = (east - west) * perDeg.lon;
  const heightM = (north - south) * perDeg.lat;
  const cellM = Math.max(ZONE_JOIN_CELL_M, Math.sqrt((widthM * heightM) / ZONE_JOIN_MAX_CELLS) * 1.01);
  const lonStep = cellM / perDeg.lon;
  const latStep = cellM / perDeg.lat;
  // One cell of margin all round: a point outside the grid is then metres outside the boundary's box.
  const x0 = west - lonStep;
  const y0 = south - latStep;
  const cols = Math.ceil((east - west) / lonStep) + 2;
  const rows = Math.ceil((north - south) / latStep) + 2;
  const xMax = x0 + cols * lonStep;
  const yMax = y0 + rows * latStep;
  const rowOf = (y: number) => Math.floor((y - y0) / latStep);

  const e = collectEdges([boundary, ...zones]);
  const layers = zones.length + 1;

  // Edges by grid row (compressed rows): every edge whose latitude range meets the row.
  const rowStart = new Int32Array(rows + 1);
  const rLo = new Int32Array(e.count);
  const rHi = new Int32Array(e.count).fill(-1);
  for (let k = 0; k < e.count; k++) {
    if (e.y1[k] === e.y2[k]) continue; // a horizontal edge never crosses a ray (it still marks cells below)
    const lo = Math.max(0, rowOf(Math.min(e.y1[k], e.y2[k])));
    const hi = Math.min(rows - 1, rowOf(Math.max(e.y1[k], e.y2[k])));
    rLo[k] = lo;
    rHi[k] = hi;
    for (let r = lo; r <= hi; r++) rowStart[r + 1]++;
  }
  for (let r = 0; r < rows; r++) rowStart[r + 1] += rowStart[r];
  const rowEdges = new Int32Array(rowStart[rows]);
  const fill = rowStart.slice(0, rows);
  for (let k = 0; k < e.count; k++) for (let r = rLo[k]; r <= rHi[k]; r++) rowEdges[fill[r]++] = k;

  const label = labelCells(e, rowStart, rowEdges, { x0, y0, lonStep, latStep, cols, rows, layers });

  // Per point: the cell's label, or an exact ray cast against the edges of the point's row.
  const parity = new Uint8Array(layers);
  const touched = new Int32Array(layers);
  const stamp = new Int32Array(layers).fill(-1);
  for (let i = 0; i < n; i++) {
    const x = lon[i];
    const y = lat[i];
    if (!(x >= x0 && x < xMax && y >= y0 && y < yMax)) continue; // outside (or NaN): OUT_OF_FIELD
    const r = rowOf(y);
    const c = Math.floor((x - x0) / lonStep);
    const l = label[r * cols + c];
    if (l !== STRADDLE) {
      out[i] = l;
      continue;
    }
    let nTouched = 0;
    for (let p = rowStart[r], pe = rowStart[r + 1]; p < pe; p++) {
      const k = rowEdges[p];
      const ya = e.y1[k];
      const yb = e.y2[k];
      if (ya > y !== yb > y) {
        const xa = e.x1[k];
        if (x < xa + ((y - ya) * (e.x2[k] - xa)) / (yb - ya)) {
          const L = e.layer[k];
          if (stamp[L] !== i) {
            stamp[L] = i;
            touched[nTouched++] = L;
          }
          parity[L] ^= 1;
        }
      }
    }
    let result = OUTSIDE;
    if (parity[0]) {
      let best = layers;
      for (let t = 0; t < nTouched; t++) {
        const L = touched[t];
        if (L > 0 && parity[L] && L < best) best = L;
      }
      result = best < layers ? best - 1 : NO_ZONE;
    }
    out[i] = result;
    for (let t = 0; t < nTouched; t++) parity[touched[t]] = 0;
  }
  return out;
}

type Frame = {
  x0: number;
  y0: number;
  lonStep: number;
  latStep: number;
  cols: number;
  rows: number;
  layers: number;
};

/**
 * Label per cell: {@link STRADDLE} where an edge passes within {@link EPS} of a cell, otherwise the region of
 * the cell's centre (zone index, IN_FIELD_NO_ZONE or OUT_OF_FIELD).
 */
function labelCells(e: Edges, rowStart: Int32Array, rowEdges: Int32Array, f: Frame): Int16Array {
  const { x0, y0, lonStep, latStep, cols, rows, layers } = f;
  const label = new Int16Array(cols * rows);

  // Scanline through the centres of each row: crossings sorted by x, parity per layer swept west to east.
  const parity = new Uint8Array(layers);
  let most = 0;
  for (let r = 0; r < rows; r++) most = Math.max(most, rowStart[r + 1] - rowStart[r]);
  const xs = new Float64Array(most);
  const ls = new Int32Array(most);
  const order = new Uint32Array(most);
  for (let r = 0; r < rows; r++) {
    const y = y0 + (r + 0.5) * latStep;
    let m = 0;
    for (let p = rowStart[r], pe = rowStart[r + 1]; p < pe; p++) {
      const k = rowEdges[p];
      const cx = crossingX(e, k, y);
      if (Number.isNaN(cx)) continue;
      xs[m] = cx;
      ls[m] = e.layer[k];
      order[m] = m;
      m++;
    }
    const ord = order.subarray(0, m).sort((a, b) => xs[a] - xs[b]);
    parity.fill(0);
    let current = OUTSIDE;
    let col = 0;
    const rowBase = r * cols;
    for (let q = 0; q <= m; q++) {
      // Cells whose centre lies west of the next crossing take the current label (a centre on a crossing
      // lies on an edge, so its cell is straddling and relabelled below).
      const xNext = q < m ? xs[ord[q]] : Infinity;
      const cEnd = Math.min(cols, Math.ceil((xNext - x0) / lonStep - 0.5));
      for (; col < cEnd; col++) label[rowBase + col] = current;
      if (q === m) break;
      parity[ls[ord[q]]] ^= 1;
      current = regionOf(parity, layers);
    }
    for (; col < cols; col++) label[rowBase + col] = current;
  }

  // Straddling cells: each edge marks every cell within EPS of it, row band by row band.
  for (let k = 0; k < e.count; k++) {
    const u0 = (e.x1[k] - x0) / lonStep;
    const v0 = (e.y1[k] - y0) / latStep;
    const u1 = (e.x2[k] - x0) / lonStep;
    const v1 = (e.y2[k] - y0) / latStep;
    const vLo = Math.min(v0, v1);
    const vHi = Math.max(v0, v1);
    const r0 = Math.max(0, Math.floor(vLo - EPS));
    const r1 = Math.min(rows - 1, Math.floor(vHi + EPS));
    const dudv = v1 === v0 ? 0 : (u1 - u0) / (v1 - v0);
    for (let r = r0; r <= r1; r++) {
      const va = Math.max(vLo, r - EPS);
      const vb = Math.min(vHi, r + 1 + EPS);
      const ua = v1 === v0 ? u0 : u0 + (va - v0) * dudv;
      const ub = v1 === v0 ? u1 : u0 + (vb - v0) * dudv;
      const c0 = Math.max(0, Math.floor(Math.min(ua, ub) - EPS));
      const c1 = Math.min(cols - 1, Math.floor(Math.max(ua, ub) + EPS));
      for (let c = c0; c <= c1; c++) label[r * cols + c] = STRADDLE;
    }
  }
  return label;
}

/**
 * Where edge k crosses the parallel through y, by PNPOLY's rule (crossed when (y1 > y) ≠ (y2 > y)); NaN when
 * it does not cross (so `x < crossingX(…)` is false).
 */
function crossingX(e: Edges, k: number, y: number): number {
  const ya = e.y1[k];
  const yb = e.y2[k];
  if (ya > y === yb > y) return Number.NaN;
  const xa = e.x1[k];
  return xa + ((y - ya) * (e.x2[k] - xa)) / (yb - ya);
}

/** The region for a parity state: first zone with odd parity, else in the field, else outside. */
function regionOf(parity: Uint8Array, layers: number): number {
  if (!parity[0]) return OUTSIDE;
  for (let L = 1; L < layers; L++) if (parity[L]) return L - 1;
  return NO_ZONE;
}
