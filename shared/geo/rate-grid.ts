import type { Feature, MultiPolygon, Polygon } from 'geojson';
import { DEFAULT_LINE_NAME } from '../rates/totals';
import { GeoInputError } from './geo-input-error';
import type { GridFrame } from './grid-frame';
import { metresPerDegree } from './interpolate-idw';
import { bboxOf } from './polygon-clip';
import { ringOrientation } from './rewind';

/**
 * A prescription laid on a regular grid (DEVELOPERS.md "Prescriptions", FORMATS.md "ISO 11783-10"): square
 * cells of `cellSizeM` metres at the field's centre latitude, given in degrees. Cell (column, row) spans
 * [minLon + column·cellLonDeg, minLon + (column + 1)·cellLonDeg] × [minLat + row·cellLatDeg, …]; row 0 is the
 * southernmost, column 0 the westernmost, and the arrays are row-major: index = row · columns + column.
 */
export type RateGrid = {
  /** South-west corner of the grid (the south-west corner of the boundary's bounding box), degrees. */
  minLat: number;
  minLon: number;
  cellLatDeg: number;
  cellLonDeg: number;
  columns: number;
  rows: number;
  cellSizeM: number;
  /** The SI rate of each cell (seeds/m², kg/m² or m³/m²). */
  rates: Float64Array;
  /**
   * The zone covering most of each cell (its index in the input), {@link IN_FIELD_NO_ZONE} inside the field
   * but mostly in no zone (default rate), {@link OUT_OF_FIELD} outside the boundary (out-of-field rate).
   */
  zoneIndex: Int32Array;
};

export const IN_FIELD_NO_ZONE = -1;
export const OUT_OF_FIELD = -2;

/** Grids with more cells than this are refused: the binary would be too large for a rate controller. */
export const MAX_RATE_GRID_CELLS = 2_000_000;

export type RateGridZone = { geometry: MultiPolygon; rateSi: number; name: string };

export type RateGridInput = {
  boundary: MultiPolygon;
  /** Zones as clipped to the boundary (the part of a zone outside the boundary would still count). */
  zones: RateGridZone[];
  defaultRateSi: number;
  outOfFieldRateSi: number;
  cellSizeM: number;
};

/** The grid as a {@link GridFrame} (for cellCentre / cellCorner / cellsInside). */
export function rateGridFrame(g: RateGrid): GridFrame {
  return {
    originLon: g.minLon,
    originLat: g.minLat,
    lonStep: g.cellLonDeg,
    latStep: g.cellLatDeg,
    cols: g.columns,
    rows: g.rows,
  };
}

/**
 * The share (0–1) of each cell of the frame that the area covers, row-major from the south-west like the frame.
 *
 * Method: exact planar clipping in lon/lat, without building the clipped polygons. Along any parallel y, the
 * part of cell column c inside the area has length Σ over edge crossings of ±(clamp(x, x_c, x_c+1) − x_c), the
 * sign that of the edge's direction in y (exterior rings counter-clockwise, holes clockwise); integrating in y,
 * each edge adds ∫ (clamp(x(y), x_c, x_c+1) − x_c) dy to every cell of its row band. We cut each edge at the
 * grid lines: a piece inside column k adds its trapezoid to cell k and its full width × dy to every cell west of
 * k (kept as a running sum from the east). So the cost is one step per cell an edge crosses plus one per cell,
 * and the result is exact for straight edges in lon/lat up to floating-point round-off (about 1e-12 of a cell).
 * Over a cell of at most 100 m the lon/lat plane and the ellipsoid differ by less than 1e-5 of the cell's area.
 * Rings may be wound either way and closed or not; holes are subtracted; the parts of a MultiPolygon must not
 * overlap (they would count twice, capped at 1).
 */
export function cellCoverage(frame: GridFrame, area: Polygon | MultiPolygon): Float64Array {
  const { cols, rows } = frame;
  const direct = new Float64Array(cols * rows);
  // carry[r · (cols + 1) + k]: added to every cell of row r west of column k.
  const carry = new Float64Array((cols + 1) * rows);
  const polygons = area.type === 'Polygon' ? [area.coordinates] : area.coordinates;
  for (const rings of polygons) {
    rings.forEach((ring, ringNo) => {
      const o = ringOrientation(ring);
      if (o === 0 || ring.length < 3) return;
      // Exterior counts positive and holes negative, whatever the winding.
      const sign = (o > 0 ? 1 : -1) * (ringNo === 0 ? 1 : -1);
      for (let i = 0, n = ring.length; i < n; i++) {
        const a = ring[i];
        const b = ring[(i + 1) % n];
        addEdge(
          frame,
          (a[0] - frame.originLon) / frame.lonStep,
          (a[1] - frame.originLat) / frame.latStep,
          (b[0] - frame.originLon) / frame.lonStep,
          (b[1] - frame.originLat) / frame.latStep,
          sign,
          direct,
          carry,
        );
      }
    });
  }
  for (let r = 0; r < rows; r++) {
    let west = 0;
    for (let c = cols - 1; c >= 0; c--) {
      west += carry[r * (cols + 1) + c + 1];
      const v = direct[r * cols + c] + west;
      direct[r * cols + c] = v < 0 ? 0 : v > 1 ? 1 : v;
    }
  }
  return direct;
}

/** One edge from (u0, v0) to (u1, v1) in cell units (see {@link cellCoverage}). */
function addEdge(
  frame: GridFrame,
  u0: number,
  v0: number,
  u1: number,
  v1: number,
  sign: number,
  direct: Float64Array,
  carry: Float64Array,
) {
  if (v0 === v1) return;
  const { cols, rows } = frame;
  const rLo = Math.max(0, Math.floor(Math.min(v0, v1)));
  const rHi = Math.min(rows - 1, Math.floor(Math.max(v0, v1)));
  const dudv = (u1 - u0) / (v1 - v0);
  for (let r = rLo; r <= rHi; r++) {
    const va = Math.min(Math.max(v0, r), r + 1);
    const vb = Math.min(Math.max(v1, r), r + 1);
    if (va === vb) continue;
    const ua = u0 + (va - v0) * dudv;
    const ub = u0 + (vb - v0) * dudv;
    const dv = (vb - va) * sign;
    // Cut the piece at the vertical grid lines inside the grid, in the order the piece meets them.
    const lo = Math.min(ua, ub);
    const hi = Math.max(ua, ub);
    const first = Math.max(0, Math.floor(lo) + 1);
    const last = Math.min(cols, Math.ceil(hi) - 1);
    const count = Math.max(0, last - first + 1);
    let prevU = ua;
    let prevT = 0;
    for (let j = 0; j <= count; j++) {
      const cut = j === count ? ub : ua < ub ? first + j : last - j;
      const t = j === count ? 1 : (cut - ua) / (ub - ua);
      addPiece(r, prevU, cut, dv * (t - prevT), cols, direct, carry);
      prevU = cut;
      prevT = t;
    }
  }
}

/** A piece lying within one column (or wholly west or east of the grid). */
function addPiece(
  r: number,
  us: number,
  ue: number,
  dv: number,
  cols: number,
  direct: Float64Array,
  carry: Float64Array,
) {
  if (dv === 0) return;
  const mid = (us + ue) / 2;
  if (mid < 0) return;
  const k = Math.floor(mid);
  if (k >= cols) {
    carry[r * (cols + 1) + cols] += dv;
    return;
  }
  direct[r * cols + k] += dv * (mid - k);
  carry[r * (cols + 1) + k] += dv;
}

const finite = (v: number) => typeof v === 'number' && Number.isFinite(v);

/**
 * The prescription on square cells of `cellSizeM` metres (see {@link RateGrid}). Metres become degrees at the
 * latitude of the middle of the boundary's bounding box through WGS84's radii of curvature (meridian M and
 * prime vertical N cos φ: {@link metresPerDegree}), so cells are square there and off by under 0.1 % at the
 * north and south ends of a 5 km field.
 *
 * A cell is inside the field when more than half of its area is inside the boundary; it then takes the zone
 * covering the largest part of it, unless the part of it in no zone is larger still (default rate). Areas are
 * exact planar clips ({@link cellCoverage}); ties go to the zone listed first. Throws {@link GeoInputError}
 * for a grid of more than {@link MAX_RATE_GRID_CELLS} cells, a cell size that is not a positive number, or an
 * empty boundary.
 */
export function rateGrid(input: RateGridInput): RateGrid {
  const { boundary, zones, defaultRateSi, outOfFieldRateSi, cellSizeM } = input;
  if (!finite(cellSizeM) || cellSizeM <= 0) {
    throw new GeoInputError(
      `The grid cell size must be a positive number of metres, got ${String(cellSizeM)}`,
    );
  }
  if (!finite(defaultRateSi) || !finite(outOfFieldRateSi)) {
    throw new GeoInputError('The default and out-of-field rates must be numbers');
  }
  zones.forEach((z, i) => {
    if (!finite(z.rateSi)) throw new GeoInputError(`Zone "${z.name}" has no rate`, { feature: i });
  });
  if (
    boundary.coordinates.length === 0 ||
    boundary.coordinates.every((rings) => (rings[0]?.length ?? 0) < 4)
  ) {
    throw new GeoInputError('The field has no boundary to lay a grid on');
  }
  const [west, south, east, north] = bboxOf(boundary);
  const perDeg = metresPerDegree((south + north) / 2);
  const cellLatDeg = cellSizeM / perDeg.lat;
  const cellLonDeg = cellSizeM / perDeg.lon;
  // A cell's millionth (0.01 mm at 10 m) beyond a whole number of cells is round-off, not another column.
  const columns = Math.max(1, Math.ceil((east - west) / cellLonDeg - 1e-6));
  const rows = Math.max(1, Math.ceil((north - south) / cellLatDeg - 1e-6));
  const cells = columns * rows;
  if (cells > MAX_RATE_GRID_CELLS) {
    const fits = Math.ceil(cellSizeM * Math.sqrt(cells / MAX_RATE_GRID_CELLS));
    throw new GeoInputError(
      `A grid of ${cellSizeM} m cells over this field would have ${cells.toLocaleString('en-US')} cells, ` +
        `more than the ${MAX_RATE_GRID_CELLS.toLocaleString('en-US')} a rate controller can take: ` +
        `choose larger cells (${fits} m or more)`,
    );
  }
  const grid: RateGrid = {
    minLat: south,
    minLon: west,
    cellLatDeg,
    cellLonDeg,
    columns,
    rows,
    cellSizeM,
    rates: new Float64Array(cells),
    zoneIndex: new Int32Array(cells),
  };
  const frame = rateGridFrame(grid);
  const inField = cellCoverage(frame, boundary);
  const best = new Float64Array(cells);
  const covered = new Float64Array(cells);
  grid.zoneIndex.fill(IN_FIELD_NO_ZONE);
  zones.forEach((zone, z) => {
    const share = cellCoverage(frame, zone.geometry);
    for (let i = 0; i < cells; i++) {
      const s = share[i];
      if (s === 0) continue;
      covered[i] += s;
      if (s > best[i]) {
        best[i] = s;
        grid.zoneIndex[i] = z;
      }
    }
  });
  for (let i = 0; i < cells; i++) {
    if (!(inField[i] > 0.5)) {
      grid.zoneIndex[i] = OUT_OF_FIELD;
    } else if (inField[i] - covered[i] > best[i]) {
      grid.zoneIndex[i] = IN_FIELD_NO_ZONE;
    }
    const z = grid.zoneIndex[i];
    grid.rates[i] = z >= 0 ? zones[z].rateSi : z === IN_FIELD_NO_ZONE ? defaultRateSi : outOfFieldRateSi;
  }
  return grid;
}

export type GridCellProps = { rateSi: number; zone: string };

/**
 * One Polygon feature per cell inside the field (counter-clockwise, corners as computed, not rounded), with its
 * SI rate and the name of the zone covering most of it (`zoneNames[zoneIndex]`, or `defaultName` for a cell
 * in no zone). Features run row by row from the south-west.
 */
export function gridCellFeatures(
  grid: RateGrid,
  zoneNames: string[],
  defaultName: string = DEFAULT_LINE_NAME,
): Feature<Polygon, GridCellProps>[] {
  const out: Feature<Polygon, GridCellProps>[] = [];
  for (let row = 0; row < grid.rows; row++) {
    const s = grid.minLat + row * grid.cellLatDeg;
    const n = grid.minLat + (row + 1) * grid.cellLatDeg;
    for (let col = 0; col < grid.columns; col++) {
      const i = row * grid.columns + col;
      const z = grid.zoneIndex[i];
      if (z === OUT_OF_FIELD) continue;
      const w = grid.minLon + col * grid.cellLonDeg;
      const e = grid.minLon + (col + 1) * grid.cellLonDeg;
      out.push({
        type: 'Feature',
        properties: { rateSi: grid.rates[i], zone: z >= 0 ? (zoneNames[z] ?? `Zone ${z + 1}`) : defaultName },
        geometry: {
          type: 'Polygon',
          coordinates: [
            [
              [w, s],
              [e, s],
              [e, n],
              [w, n],
              [w, s],
            ],
          ],
        },
      });
    }
  }
  return out;
}
