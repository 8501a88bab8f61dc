import type { MultiPolygon } from 'geojson';
import { cellsInside, type GridFrame } from '../geo/grid-frame';
import { metresPerDegree } from '../geo/interpolate-idw';
import { bboxOf } from '../geo/polygon-clip';
import { countSections, minRowsPerSection } from '../rates/count-sections';
import type { Coverage } from '../schemas/as-applied.schema';
import { AREA_PASS_GAP_S } from './audit-log';
import type { LogColumns } from './log-columns';

/**
 * Skipped and double-planted area (DEVELOPERS.md "Diagnostics"): the swath of every pass painted on a raster
 * of the field.
 */

/** The raster is kept to about this many cells by enlarging the cells (4 M cells: 4 MB of counts). */
export const MAX_COVERAGE_CELLS = 4_000_000;
/** A step implying a speed above this (m/s) is a position jump, not travel (as in the audit's areas). */
const MAX_TRAVEL_MPS = 15;
/** Counts stop here, below OUTSIDE. */
const MAX_COUNT = 254;
const OUTSIDE = 255;

export type CoverageOptions = {
  /** Cell size, m (1 m in the pipeline); enlarged when the field would need more than MAX_COVERAGE_CELLS. */
  cellSizeM: number;
  /** Swath width where the log has no width column (or no finite width at a point), m. */
  swathFallbackM: number;
  rowSpacingM: number;
  rowCount: number;
  /** The planter's rows per section; null when not known (advice then only if the log has sectionsOn). */
  rowsPerSection: number | null;
  /** How many sections the display can control (DOMAIN.md §4). */
  displaySectionLimit: number;
  /** Target per point, SI (for the seed put down twice); else the log's target; NaN counts as 0. */
  targetSi?: Float64Array;
  /** A longer gap between kept points starts another pass, s (default 5, as the cleaning's passGapS). */
  passGapS?: number;
};

/** Called with the cells [c0, c1] of grid row `row` under a rectangle; returning false stops the scan. */
type RowSpan = (row: number, c0: number, c1: number) => boolean | void;

/** Corner scratch space for {@link scanRect} (not re-entrant: no span calls it). */
const PX = new Float64Array(4);
const PY = new Float64Array(4);

/**
 * Calls `span` for the cells of each grid row whose centres lie in the rectangle of half-width `h` around the
 * segment (x0, y0) → (x1, y1), all in cell units. Half-open on both axes (the rule of cellsInside), so two
 * rectangles sharing an edge never both take a cell on it.
 */
function scanRect(
  g: GridFrame,
  x0: number,
  y0: number,
  x1: number,
  y1: number,
  h: number,
  span: RowSpan,
): void {
  const dx = x1 - x0;
  const dy = y1 - y0;
  const len = Math.hypot(dx, dy);
  if (!(len > 1e-9) || !(h > 0)) return;
  const nx = (-dy / len) * h;
  const ny = (dx / len) * h;
  PX[0] = x0 + nx;
  PX[1] = x1 + nx;
  PX[2] = x1 - nx;
  PX[3] = x0 - nx;
  PY[0] = y0 + ny;
  PY[1] = y1 + ny;
  PY[2] = y1 - ny;
  PY[3] = y0 - ny;
  const minY = Math.min(PY[0], PY[1], PY[2], PY[3]);
  const maxY = Math.max(PY[0], PY[1], PY[2], PY[3]);
  const r0 = Math.max(0, Math.ceil(minY - 0.5));
  const r1 = Math.min(g.rows - 1, Math.ceil(maxY - 0.5) - 1);
  for (let r = r0; r <= r1; r++) {
    const y = r + 0.5;
    let xa = Infinity;
    let xb = -Infinity;
    for (let i = 0, j = 3; i < 4; j = i++) {
      if (PY[j] <= y !== PY[i] <= y) {
        const x = PX[j] + ((y - PY[j]) * (PX[i] - PX[j])) / (PY[i] - PY[j]);
        if (x < xa) xa = x;
        if (x > xb) xb = x;
      }
    }
    if (!(xb > xa)) continue;
    const c0 = Math.max(0, Math.ceil(xa - 0.5));
    const c1 = Math.min(g.cols - 1, Math.ceil(xb - 0.5) - 1);
    if (c1 >= c0 && span(r, c0, c1) === false) return;
  }
}

/** Standard base64 (RFC 4648) of bytes, without Buffer or btoa (isomorphic). */
function base64(bytes: Uint8Array): string {
  const abc = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
  const parts: string[] = [];
  let s = '';
  let i = 0;
  for (; i + 2 < bytes.length; i += 3) {
    const v = (bytes[i] << 16) | (bytes[i + 1] << 8) | bytes[i + 2];
    s += abc[v >> 18] + abc[(v >> 12) & 63] + abc[(v >> 6) & 63] + abc[v & 63];
    if (s.length >= 1 << 16) {
      parts.push(s);
      s = '';
    }
  }
  const rest = bytes.length - i;
  if (rest === 1) {
    const v = bytes[i] << 16;
    s += abc[v >> 18] + abc[(v >> 12) & 63] + '==';
  } else if (rest === 2) {
    const v = (bytes[i] << 16) | (bytes[i + 1] << 8);
    s += abc[v >> 18] + abc[(v >> 12) & 63] + abc[(v >> 6) & 63] + '=';
  }
  parts.push(s);
  return parts.join('');
}

/**
 * Skipped and double-planted area on a raster of the field.
 *
 * The grid: square cells of `cellSizeM` (enlarged, to whole centimetres, until the boundary's bounding box takes
 * at most {@link MAX_COVERAGE_CELLS}) in degrees at the box's middle latitude, row 0 south, like the rate grid;
 * a cell is in the field when its centre is ({@link cellsInside}). Cell area = cell size² (m²).
 *
 * The passes: consecutive kept points (the log sorted by time) belong to the same pass unless more than
 * `passGapS` seconds (default 5) or a jump faster than 15 m/s lie between them. Each step of a pass paints the
 * rectangle from one point to the next, as wide as the point's working width (widthM, else swathFallbackM) and
 * centred on the track (its direction is that of the step); the first and last steps are lengthened by half a
 * step outwards, as each point stands for the ground half-way to its neighbours. A pass of a single point paints
 * nothing. A cell whose centre a rectangle covers counts once per pass, however many of the pass's steps cover
 * it, so a pass never doubles itself. Then inside the field: 0 = skipped, 1 = once, 2+ = double (counts stop at
 * 254); 255 outside. `keep` should mark where the planter was planting: points the cleaning drops at pass ends
 * would show as skips.
 *
 * quantityInOverlap: each time a pass paints a field cell already painted by an earlier pass, the target of the
 * step's first point (opts.targetSi, else the log's target; not finite → 0) × the cell area — that is Σ over
 * double cells of (count − 1) × cell area × target.
 *
 * sectionAdvice (when the log has a sectionsOn column or `rowsPerSection` is known, and the planter's row
 * spacing, row count and display limit are positive): a simple model of automatic section control. The finest
 * layout the display can take is r′ = ceil(rowCount / displaySectionLimit) rows per section; when the planter
 * already has r ≤ r′, the model tries row-by-row control (1) instead, which may exceed the display. The same
 * passes are painted again in the same order, each step's swath cut across into round(width / (r′ × rowSpacing))
 * equal sections (at least one); a section is switched off for the step when every field cell of its footprint
 * was already planted by an earlier pass (cells outside the field count as planted, as a controller shuts
 * sections off past the boundary). overlapCutM2 = double area as logged − double area so re-painted (≥ 0).
 */
export function coverageOf(
  c: LogColumns,
  keep: Uint8Array,
  boundary: MultiPolygon,
  opts: CoverageOptions,
): Coverage {
  const n = c.n;
  if (keep.length !== n) throw new RangeError(`keep (${keep.length}) must have one entry per point (${n})`);
  if (!(opts.cellSizeM > 0))
    throw new RangeError(`The coverage cell size must be positive, got ${opts.cellSizeM} m`);
  if (!(opts.swathFallbackM > 0))
    throw new RangeError(`The working width must be positive, got ${opts.swathFallbackM} m`);
  const target = opts.targetSi ?? c.target;
  if (target.length !== n)
    throw new RangeError(`targetSi (${target.length}) must have one entry per point (${n})`);
  const gap = opts.passGapS ?? AREA_PASS_GAP_S;
  if (!(gap > 0)) throw new RangeError(`The pass gap must be positive, got ${gap} s`);
  if (!boundary.coordinates.some((rings) => (rings[0]?.length ?? 0) >= 4))
    throw new RangeError('The field has no boundary to measure coverage on');

  /* ---------------------------------------------------------------- the grid */
  const [west, south, east, north] = bboxOf(boundary);
  const perDeg = metresPerDegree((south + north) / 2);
  let cellM = opts.cellSizeM;
  const size = (m: number) => ({
    cols: Math.max(1, Math.ceil(((east - west) * perDeg.lon) / m - 1e-6)),
    rows: Math.max(1, Math.ceil(((north - south) * perDeg.lat) / m - 1e-6)),
  });
  let { cols, rows } = size(cellM);
  while (cols * rows > MAX_COVERAGE_CELLS) {
    cellM = Math.ceil(cellM * Math.sqrt((cols * rows) / MAX_COVERAGE_CELLS) * 100 + 1e-9) / 100;
    ({ cols, rows } = size(cellM));
  }
  const frame: GridFrame = {
    originLon: west,
    originLat: south,
    lonStep: cellM / perDeg.lon,
    latStep: cellM / perDeg.lat,
    cols,
    rows,
  };
  const cells = cols * rows;
  const cellArea = cellM * cellM;
  const inside = cellsInside(frame, boundary);

  /* ---------------------------------------------------------------- passes (ranges of kept points) */
  let kept = 0;
  for (let i = 0; i < n; i++) if (keep[i]) kept++;
  const idx = new Uint32Array(kept);
  for (let i = 0, k = 0; i < n; i++) if (keep[i]) idx[k++] = i;
  const X = new Float64Array(kept);
  const Y = new Float64Array(kept);
  for (let k = 0; k < kept; k++) {
    X[k] = (c.lon[idx[k]] - west) / frame.lonStep;
    Y[k] = (c.lat[idx[k]] - south) / frame.latStep;
  }
  const maxStepCells = MAX_TRAVEL_MPS / cellM;
  const passStarts: number[] = [];
  for (let k = 0; k < kept; k++) {
    if (!(Number.isFinite(X[k]) && Number.isFinite(Y[k]))) continue;
    const p = k - 1;
    const dt = p >= 0 ? c.t[idx[k]] - c.t[idx[p]] : Number.NaN;
    const joined =
      p >= 0 &&
      passStarts.length > 0 &&
      dt > 0 &&
      dt <= gap &&
      Math.hypot(X[k] - X[p], Y[k] - Y[p]) <= maxStepCells * dt;
    if (!joined) passStarts.push(k);
  }
  passStarts.push(kept);
  const widthAt = (k: number) => {
    const w = c.widthM ? c.widthM[idx[k]] : Number.NaN;
    return Number.isFinite(w) ? Math.max(0, w) : opts.swathFallbackM;
  };
  const targetAt = (k: number) => {
    const v = target[idx[k]];
    return Number.isFinite(v) ? v : 0;
  };

  /**
   * Every step of every pass, in order: `step(pass, k, x0, y0, x1, y1)` with the step from kept point k to k + 1
   * (the ends lengthened by half a step). A pass ends where a non-finite position or a gap breaks it.
   */
  const eachStep = (
    step: (pass: number, k: number, x0: number, y0: number, x1: number, y1: number) => void,
  ) => {
    for (let p = 0; p + 1 < passStarts.length; p++) {
      const a = passStarts[p];
      let b = passStarts[p + 1];
      while (b > a && !(Number.isFinite(X[b - 1]) && Number.isFinite(Y[b - 1]))) b--;
      for (let k = a; k + 1 < b; k++) {
        let x0 = X[k];
        let y0 = Y[k];
        let x1 = X[k + 1];
        let y1 = Y[k + 1];
        const hx = (x1 - x0) / 2;
        const hy = (y1 - y0) / 2;
        if (k === a) {
          x0 -= hx;
          y0 -= hy;
        }
        if (k + 2 === b) {
          x1 += hx;
          y1 += hy;
        }
        step(p + 1, k, x0, y0, x1, y1);
      }
    }
  };

  /* ---------------------------------------------------------------- as logged */
  const counts = new Uint8Array(cells);
  const stamp = new Int32Array(cells);
  let quantityInOverlap = 0;
  eachStep((pass, k, x0, y0, x1, y1) => {
    const t = targetAt(k) * cellArea;
    scanRect(frame, x0, y0, x1, y1, widthAt(k) / 2 / cellM, (r, c0, c1) => {
      for (let i = r * cols + c0, end = r * cols + c1; i <= end; i++) {
        if (stamp[i] === pass) continue;
        stamp[i] = pass;
        if (inside[i] && counts[i] > 0) quantityInOverlap += t;
        if (counts[i] < MAX_COUNT) counts[i]++;
      }
    });
  });
  let fieldCells = 0;
  let skippedCells = 0;
  let doubleCells = 0;
  for (let i = 0; i < cells; i++) {
    if (!inside[i]) {
      counts[i] = OUTSIDE;
      continue;
    }
    fieldCells++;
    if (counts[i] === 0) skippedCells++;
    else if (counts[i] >= 2) doubleCells++;
  }
  const doubleM2 = doubleCells * cellArea;

  return {
    cellSizeM: cellM,
    fieldM2: fieldCells * cellArea,
    plantedM2: (fieldCells - skippedCells) * cellArea,
    skippedM2: skippedCells * cellArea,
    doubleM2,
    quantityInOverlap,
    raster: {
      minLon: west,
      minLat: south,
      cellLonDeg: frame.lonStep,
      cellLatDeg: frame.latStep,
      columns: cols,
      rows,
      countsBase64: base64(counts),
    },
    sectionAdvice: sectionAdvice(),
  };

  /** The section-control model described above; null when it does not apply. */
  function sectionAdvice(): Coverage['sectionAdvice'] {
    const { rowSpacingM, rowCount, rowsPerSection: r, displaySectionLimit } = opts;
    const known = r !== null && Number.isInteger(r) && r >= 1;
    if (!c.sectionsOn && !known) return null;
    if (!(rowSpacingM > 0) || !Number.isInteger(rowCount) || rowCount < 1) return null;
    if (!Number.isInteger(displaySectionLimit) || displaySectionLimit < 1) return null;
    const finest = minRowsPerSection(rowCount, displaySectionLimit);
    const advised = known && finest >= r ? 1 : finest;
    const sectionM = advised * rowSpacingM;
    const sim = new Uint8Array(cells);
    const simStamp = new Int32Array(cells);
    let pass = 0;
    // The step being re-painted: its start, unit normal (to the left of travel), width and sections, in cells.
    let x0 = 0;
    let y0 = 0;
    let ux = 0;
    let uy = 0;
    let half = 0;
    let sw = 1;
    let count = 1;
    let needed = new Uint8Array(16);
    /** The section of a cell centre: by its offset across the step, from the right-hand edge. */
    const sectionOf = (row: number, col: number) => {
      const s = Math.floor(((col + 0.5 - x0) * ux + (row + 0.5 - y0) * uy + half) / sw);
      return s < 0 ? 0 : s >= count ? count - 1 : s;
    };
    // A section stays on when a field cell of its footprint was not planted by an earlier pass.
    const check: RowSpan = (row, c0, c1) => {
      for (let col = c0, i = row * cols + c0; col <= c1; col++, i++)
        if (inside[i] && sim[i] - (simStamp[i] === pass ? 1 : 0) < 1) needed[sectionOf(row, col)] = 1;
    };
    const paint: RowSpan = (row, c0, c1) => {
      for (let col = c0, i = row * cols + c0; col <= c1; col++, i++) {
        if (simStamp[i] === pass || !needed[sectionOf(row, col)]) continue;
        simStamp[i] = pass;
        if (sim[i] < MAX_COUNT) sim[i]++;
      }
    };
    eachStep((p, k, ax, ay, bx, by) => {
      const w = widthAt(k) / cellM;
      const len = Math.hypot(bx - ax, by - ay);
      if (!(w > 0) || !(len > 1e-9)) return;
      pass = p;
      [x0, y0, ux, uy, half] = [ax, ay, -(by - ay) / len, (bx - ax) / len, w / 2];
      count = Math.max(1, Math.round(w / (sectionM / cellM)));
      sw = w / count;
      if (needed.length < count) needed = new Uint8Array(count);
      needed.fill(0, 0, count);
      scanRect(frame, ax, ay, bx, by, half, check);
      if (needed.subarray(0, count).includes(1)) scanRect(frame, ax, ay, bx, by, half, paint);
    });
    let simDouble = 0;
    for (let i = 0; i < cells; i++) if (inside[i] && sim[i] >= 2) simDouble++;
    return {
      rowsPerSection: advised,
      sections: countSections(rowCount, advised),
      overlapCutM2: Math.max(0, doubleM2 - simDouble * cellArea),
      withinDisplayLimit: countSections(rowCount, advised) <= displaySectionLimit,
    };
  }
}
