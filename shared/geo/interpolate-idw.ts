import type { MultiPolygon, Polygon } from 'geojson';
import { GeoInputError } from './geo-input-error';
import { type GridFrame, cellsInside } from './grid-frame';

export { cellCentre, cellCorner } from './grid-frame';

/**
 * Values on square cells of `cellSizeM` metres in a local equirectangular projection about
 * (`centreLon`, `centreLat`), which makes them a regular lon/lat grid (see {@link GridFrame}): cell corners are
 * `cellCorner(grid, col, row)`. `values` holds one number per cell, NaN for cells whose centre is outside
 * the boundary.
 */
export type ValueGrid = GridFrame & {
  cellSizeM: number;
  centreLon: number;
  centreLat: number;
  values: Float64Array;
};

/** A data point: position in degrees (WGS84) and the attribute value in its own unit. */
export type ValuePoint = { lon: number; lat: number; value: number };

export type IdwOptions = {
  /** Cell side in metres (> 0). */
  cellSizeM: number;
  /** Distance exponent p in weight = 1 / dᵖ; 2 is customary. */
  power?: number;
  /** How many nearest points feed each cell. */
  maxNeighbours?: number;
};

/** Grids larger than this many cells are refused (a cell size far too small for the field). */
export const MAX_GRID_CELLS = 4_000_000;

// WGS84 (NGA TR8350.2).
const A = 6_378_137;
const F = 1 / 298.257223563;
const E2 = F * (2 - F);

/**
 * Metres per degree of longitude and of latitude at latitude φ on WGS84: the radii of curvature in the prime
 * vertical, N cos φ, and in the meridian, M, times π/180 (standard geodesy).
 */
export function metresPerDegree(latDeg: number): { lon: number; lat: number } {
  const phi = (latDeg * Math.PI) / 180;
  const w = 1 - E2 * Math.sin(phi) ** 2;
  const deg = Math.PI / 180;
  return { lon: ((A * Math.cos(phi)) / Math.sqrt(w)) * deg, lat: ((A * (1 - E2)) / w ** 1.5) * deg };
}

/** Planar (lon/lat) centroid of an area, holes subtracted; the bbox centre if it has no area. */
export function planarCentroid(area: Polygon | MultiPolygon): [number, number] {
  const polys = area.type === 'Polygon' ? [area.coordinates] : area.coordinates;
  let a2 = 0;
  let cx = 0;
  let cy = 0;
  let w = Infinity;
  let e = -Infinity;
  let s = Infinity;
  let n = -Infinity;
  for (const rings of polys) {
    rings.forEach((ring, r) => {
      // Exterior counts positive and holes negative whatever their winding.
      let ra = 0;
      let rx = 0;
      let ry = 0;
      for (let i = 0, len = ring.length, j = len - 1; i < len; j = i++) {
        const [x1, y1] = ring[j];
        const [x2, y2] = ring[i];
        const c = x1 * y2 - x2 * y1;
        ra += c;
        rx += (x1 + x2) * c;
        ry += (y1 + y2) * c;
        if (x2 < w) w = x2;
        if (x2 > e) e = x2;
        if (y2 < s) s = y2;
        if (y2 > n) n = y2;
      }
      const sign = (ra >= 0 ? 1 : -1) * (r === 0 ? 1 : -1);
      a2 += sign * ra;
      cx += sign * rx;
      cy += sign * ry;
    });
  }
  if (!Number.isFinite(w)) throw new GeoInputError('The boundary has no positions');
  if (Math.abs(a2) < 1e-18) return [(w + e) / 2, (s + n) / 2];
  return [cx / (3 * a2), cy / (3 * a2)];
}

/** Bounding box [west, south, east, north] of an area's positions. */
function bbox(area: Polygon | MultiPolygon): number[] {
  const b = [Infinity, Infinity, -Infinity, -Infinity];
  const polys = area.type === 'Polygon' ? [area.coordinates] : area.coordinates;
  for (const rings of polys)
    for (const [x, y] of rings[0]) {
      b[0] = Math.min(b[0], x);
      b[1] = Math.min(b[1], y);
      b[2] = Math.max(b[2], x);
      b[3] = Math.max(b[3], y);
    }
  return b;
}

/**
 * Points bucketed on a square grid of `size` metres in local coordinates (compressed rows: typed arrays only).
 */
type Buckets = {
  x0: number;
  y0: number;
  size: number;
  nx: number;
  ny: number;
  start: Int32Array;
  px: Float64Array;
  py: Float64Array;
  pv: Float64Array;
};

function bucketPoints(
  x: Float64Array,
  y: Float64Array,
  v: Float64Array,
  ext: number[],
  size: number,
): Buckets {
  const nx = Math.max(1, Math.ceil((ext[2] - ext[0]) / size));
  const ny = Math.max(1, Math.ceil((ext[3] - ext[1]) / size));
  const cell = new Int32Array(x.length);
  const start = new Int32Array(nx * ny + 1);
  for (let i = 0; i < x.length; i++) {
    const bx = Math.min(nx - 1, Math.max(0, Math.floor((x[i] - ext[0]) / size)));
    const by = Math.min(ny - 1, Math.max(0, Math.floor((y[i] - ext[1]) / size)));
    cell[i] = by * nx + bx;
    start[cell[i] + 1]++;
  }
  for (let b = 0; b < nx * ny; b++) start[b + 1] += start[b];
  const fill = start.slice(0, nx * ny);
  const px = new Float64Array(x.length);
  const py = new Float64Array(x.length);
  const pv = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) {
    const k = fill[cell[i]]++;
    px[k] = x[i];
    py[k] = y[i];
    pv[k] = v[i];
  }
  return { x0: ext[0], y0: ext[1], size, nx, ny, start, px, py, pv };
}

/**
 * Inverse distance weighting at (x, y) from the k nearest bucketed points: Σ wᵢvᵢ / Σ wᵢ with wᵢ = 1/dᵢᵖ
 * (Shepard 1968). A point closer than 1 µm gives its own value (the mean of such points if several).
 * `bestD`/`bestV` are scratch arrays of length k.
 */
function idwAt(
  b: Buckets,
  x: number,
  y: number,
  k: number,
  power: number,
  bestD: Float64Array,
  bestV: Float64Array,
): number {
  let found = 0;
  const bx = Math.min(b.nx - 1, Math.max(0, Math.floor((x - b.x0) / b.size)));
  const by = Math.min(b.ny - 1, Math.max(0, Math.floor((y - b.y0) / b.size)));
  const maxRing = Math.max(b.nx, b.ny);
  for (let ring = 0; ring <= maxRing; ring++) {
    for (let gy = by - ring; gy <= by + ring; gy++) {
      if (gy < 0 || gy >= b.ny) continue;
      const edgeRow = gy === by - ring || gy === by + ring;
      for (let gx = bx - ring; gx <= bx + ring; gx += edgeRow || ring === 0 ? 1 : 2 * ring) {
        if (gx < 0 || gx >= b.nx) continue;
        const cell = gy * b.nx + gx;
        for (let i = b.start[cell], end = b.start[cell + 1]; i < end; i++) {
          const dx = b.px[i] - x;
          const dy = b.py[i] - y;
          const d2 = dx * dx + dy * dy;
          // Insertion into the sorted best-k list: a free slot while filling, else the worst one.
          if (found < k) found++;
          else if (d2 >= bestD[k - 1]) continue;
          let j = found - 1;
          while (j > 0 && bestD[j - 1] > d2) {
            bestD[j] = bestD[j - 1];
            bestV[j] = bestV[j - 1];
            j--;
          }
          bestD[j] = d2;
          bestV[j] = b.pv[i];
        }
      }
    }
    // Every bucket beyond this ring is at least ring · size away.
    const reach = ring * b.size;
    if (found === k && bestD[k - 1] <= reach * reach) break;
  }
  if (found === 0) return NaN;
  let exactSum = 0;
  let exactN = 0;
  for (let j = 0; j < found && bestD[j] < 1e-12; j++) {
    exactSum += bestV[j];
    exactN++;
  }
  if (exactN) return exactSum / exactN;
  let sw = 0;
  let swv = 0;
  const half = power / 2;
  for (let j = 0; j < found; j++) {
    const w = 1 / bestD[j] ** half;
    sw += w;
    swv += w * bestV[j];
  }
  return swv / sw;
}

/**
 * Interpolates point values onto square cells of `cellSizeM` metres covering the boundary's bounding box, in
 * a local equirectangular projection about the boundary's planar centroid (metres per degree from WGS84 at
 * that latitude; fields do not cross the antimeridian). Only cells whose centre lies inside the boundary get a
 * value (inverse distance weighting of the `maxNeighbours` nearest points, default 12, with `power`, default
 * 2); the rest are NaN. Points with a non-finite position or value are ignored, and so are points more than
 * max(50 m, 10 cells) outside the boundary's box. Throws {@link GeoInputError} for a bad option, no usable
 * point or a grid of more than {@link MAX_GRID_CELLS} cells. Inputs are not mutated.
 */
export function idwGrid(
  points: readonly ValuePoint[],
  boundary: Polygon | MultiPolygon,
  options: IdwOptions,
): ValueGrid {
  const { cellSizeM } = options;
  const power = options.power ?? 2;
  const k = options.maxNeighbours ?? 12;
  if (!(cellSizeM > 0) || !Number.isFinite(cellSizeM))
    throw new GeoInputError(`The cell size must be a positive number of metres, not ${cellSizeM}`);
  if (!(power > 0) || !Number.isFinite(power))
    throw new GeoInputError(`The power must be a positive number, not ${power}`);
  if (!Number.isInteger(k) || k < 1 || k > 256)
    throw new GeoInputError(`The number of neighbours must be a whole number from 1 to 256, not ${k}`);

  const [centreLon, centreLat] = planarCentroid(boundary);
  const m = metresPerDegree(centreLat);
  const [w, s, e, n] = bbox(boundary);
  const lonStep = cellSizeM / m.lon;
  const latStep = cellSizeM / m.lat;
  const cols = Math.max(1, Math.ceil((e - w) / lonStep));
  const rows = Math.max(1, Math.ceil((n - s) / latStep));
  if (cols * rows > MAX_GRID_CELLS) {
    throw new GeoInputError(
      `A ${cellSizeM} m cell makes ${cols * rows} cells over this field, more than ${MAX_GRID_CELLS}: choose a larger cell`,
    );
  }
  const frame: GridFrame = { originLon: w, originLat: s, lonStep, latStep, cols, rows };

  // Local metres with the grid's south-west corner at (0, 0).
  const margin = Math.max(50, 10 * cellSizeM);
  const ext = [-margin, -margin, cols * cellSizeM + margin, rows * cellSizeM + margin];
  const xs: number[] = [];
  const ys: number[] = [];
  const vs: number[] = [];
  for (const p of points) {
    if (!Number.isFinite(p?.lon) || !Number.isFinite(p?.lat) || !Number.isFinite(p?.value)) continue;
    const x = (p.lon - w) * m.lon;
    const y = (p.lat - s) * m.lat;
    if (x < ext[0] || x > ext[2] || y < ext[1] || y > ext[3]) continue;
    xs.push(x);
    ys.push(y);
    vs.push(p.value);
  }
  if (xs.length === 0)
    throw new GeoInputError('No data point with a position and a numeric value lies in or near the boundary');
  // Buckets holding about eight points each on average, never smaller than a cell.
  const size = Math.max(cellSizeM, Math.sqrt(((ext[2] - ext[0]) * (ext[3] - ext[1]) * 8) / xs.length));
  const buckets = bucketPoints(
    Float64Array.from(xs),
    Float64Array.from(ys),
    Float64Array.from(vs),
    ext,
    size,
  );

  const inside = cellsInside(frame, boundary);
  const values = new Float64Array(cols * rows).fill(NaN);
  const kk = Math.min(k, xs.length);
  const bestD = new Float64Array(kk);
  const bestV = new Float64Array(kk);
  for (let row = 0; row < rows; row++) {
    const y = (row + 0.5) * cellSizeM;
    for (let col = 0; col < cols; col++) {
      const i = row * cols + col;
      if (inside[i]) values[i] = idwAt(buckets, (col + 0.5) * cellSizeM, y, kk, power, bestD, bestV);
    }
  }
  return { ...frame, cellSizeM, centreLon, centreLat, values };
}
