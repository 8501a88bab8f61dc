import type { MultiPolygon } from 'geojson';
import { cellsInside, type GridFrame } from '../geo/grid-frame';
import { metresPerDegree } from '../geo/interpolate-idw';
import { bboxOf } from '../geo/polygon-clip';
import { countSections, minRowsPerSection } from '../rates/count-sections';
import type { Coverage } from '../schemas/as-applied.schema';
import { AREA_PASS_GAP_S } from './audit-log';
import { hypot } from './diag-hypot';
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

/**
 * Row spans of one rectangle, filled by {@link rectSpans}: for span s, grid row SPAN_ROW[s] and its cells
 * SPAN_C0[s] … SPAN_C1[s]. Module scratch space grown on demand (not re-entrant): one rectangle's spans are
 * computed once and then read by both the as-logged count and the section model, without a closure per row.
 */
let SPAN_ROW = new Int32Array(64);
let SPAN_C0 = new Int32Array(64);
let SPAN_C1 = new Int32Array(64);
/** Corner scratch space for {@link rectSpans}. */
const PX = new Float64Array(4);
const PY = new Float64Array(4);

/**
 * Fills the span scratch with the cells of each grid row whose centres lie in the rectangle of half-width `h`
 * around the segment (x0, y0) → (x1, y1), all in cell units, and returns how many spans (rows with at least one
 * cell) there are. `len` is the segment's length (Math.hypot of its sides). Half-open on both axes (the rule of
 * cellsInside), so two rectangles sharing an edge never both take a cell on it.
 */
function rectSpans(
  g: GridFrame,
  x0: number,
  y0: number,
  x1: number,
  y1: number,
  len: number,
  h: number,
): number {
  if (!(len > 1e-9) || !(h > 0)) return 0;
  const dx = x1 - x0;
  const dy = y1 - y0;
  const nx = (-dy / len) * h;
  const ny = (dx / len) * h;
  // The corners 0…3; the edges j → i (3→0, 0→1, 1→2, 2→3) are interpolated from corner j, as a polygon
  // scanline does: the same arithmetic whichever row asks, so neighbouring rectangles agree on shared edges.
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
  if (r1 - r0 + 1 > SPAN_ROW.length) {
    const size = 2 * (r1 - r0 + 1);
    SPAN_ROW = new Int32Array(size);
    SPAN_C0 = new Int32Array(size);
    SPAN_C1 = new Int32Array(size);
  }
  let m = 0;
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
    if (c1 < c0) continue;
    SPAN_ROW[m] = r;
    SPAN_C0[m] = c0;
    SPAN_C1[m] = c1;
    m++;
  }
  return m;
}

/**
 * False when the rectangle {@link rectSpans} would scan for the step (x0, ·) → (x0 + dx, ·) with half-width h
 * (cell units) can hold no cell: no column of cell centres (a half-integer) lies within its corners' x. A step
 * of a 10 Hz log is a fraction of a cell long, so travelling along the rows most steps are passed over here,
 * before the exact geometry. The corners lie within h·|dy| / max(|dx|, |dy|) (at least |h·dy / length|) of the
 * track's x; the slack, far above any rounding, keeps the test one-sided: true whenever a cell is possible.
 */
function mayHoldCells(x0: number, dx: number, dy: number, h: number): boolean {
  const ax = Math.abs(dx);
  const ay = Math.abs(dy);
  const longer = ax > ay ? ax : ay;
  if (!(longer > 0) || !(h > 0)) return false; // a point or no width: nothing to paint
  const reach = (h * ay) / longer;
  const lo = Math.min(x0, x0 + dx) - reach;
  const hi = Math.max(x0, x0 + dx) + reach;
  const slack = 1e-7 * (1 + Math.abs(lo) + Math.abs(hi));
  return Math.ceil(lo - 0.5 - slack) <= Math.ceil(hi - 0.5 + slack) - 1;
}

/** The base64 alphabet as character codes. */
const B64 = new TextEncoder().encode('ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/');

/**
 * Standard base64 (RFC 4648) of bytes, without Buffer or btoa (isomorphic). The characters are written as ASCII
 * codes into one buffer and decoded once, instead of concatenating a million short strings.
 */
function base64(bytes: Uint8Array): string {
  const out = new Uint8Array(Math.ceil(bytes.length / 3) * 4);
  let i = 0;
  let o = 0;
  for (; i + 2 < bytes.length; i += 3) {
    const v = (bytes[i] << 16) | (bytes[i + 1] << 8) | bytes[i + 2];
    out[o++] = B64[v >> 18];
    out[o++] = B64[(v >> 12) & 63];
    out[o++] = B64[(v >> 6) & 63];
    out[o++] = B64[v & 63];
  }
  const rest = bytes.length - i;
  if (rest > 0) {
    const v = (bytes[i] << 16) | (rest === 2 ? bytes[i + 1] << 8 : 0);
    out[o++] = B64[v >> 18];
    out[o++] = B64[(v >> 12) & 63];
    out[o++] = rest === 2 ? B64[(v >> 6) & 63] : 61; // '='
    out[o++] = 61;
  }
  return new TextDecoder().decode(out);
}

/** One step of a pass: from kept point k (index into the log) to the next, in cell units, ends lengthened. */
type StepFn = (first: boolean, k: number, x0: number, y0: number, x1: number, y1: number) => void;

/**
 * Calls `step` for every step of every pass in order (the passes as {@link coverageOf} describes them), with
 * `first` true for the first step of a pass. Streamed over the log: a step is handed on once the point after
 * it shows whether the pass goes on, as the last step is lengthened; positions are converted as they are read
 * instead of into arrays as long as the log.
 */
function walkSteps(
  c: LogColumns,
  keep: Uint8Array,
  g: GridFrame,
  gap: number,
  maxStepCells: number,
  step: StepFn,
): void {
  const { lon, lat, t } = c;
  const { originLon, originLat, lonStep, latStep } = g;
  // The open pass's last point b and the one before it, a (−1: none); whether a is the pass's first point.
  let bi = -1;
  let bx = 0;
  let by = 0;
  let ai = -1;
  let ax = 0;
  let ay = 0;
  let aFirst = false;
  const emit = (last: boolean) => {
    let x0 = ax;
    let y0 = ay;
    let x1 = bx;
    let y1 = by;
    const hx = (x1 - x0) / 2;
    const hy = (y1 - y0) / 2;
    if (aFirst) {
      x0 -= hx;
      y0 -= hy;
    }
    if (last) {
      x1 += hx;
      y1 += hy;
    }
    step(aFirst, ai, x0, y0, x1, y1);
  };
  let prev = -1; // the kept point before, finite or not
  for (let i = 0; i < c.n; i++) {
    if (!keep[i]) continue;
    const p = prev;
    prev = i;
    const x = (lon[i] - originLon) / lonStep;
    const y = (lat[i] - originLat) / latStep;
    // A point without a position joins no pass, and the point after it cannot join its pass either.
    if (!(Number.isFinite(x) && Number.isFinite(y))) continue;
    const dt = p >= 0 ? t[i] - t[p] : Number.NaN;
    if (bi >= 0 && p === bi && dt > 0 && dt <= gap && hypot(x - bx, y - by) <= maxStepCells * dt) {
      if (ai >= 0) emit(false);
      aFirst = ai < 0;
    } else {
      if (ai >= 0) emit(true);
      bi = -1;
    }
    // Shift: b becomes a (within the pass), the point b; a new pass starts with b alone.
    ai = bi;
    ax = bx;
    ay = by;
    bi = i;
    bx = x;
    by = y;
  }
  if (ai >= 0) emit(true);
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

  /* ---------------------------------------------------------------- the section model's layout */
  const layout = sectionLayout(c, opts);
  const sectionCells = layout ? (layout.advised * opts.rowSpacingM) / cellM : 0;

  /*
   * One walk over every step of every pass paints both rasters: the counts as logged and, when the section
   * model applies, the re-painted counts. The two only share the steps' geometry (each keeps its own counts
   * and pass tags), so painting them step by step together gives what two walks would, with each step's
   * rectangle scanned once instead of three times.
   *
   * Pass tags mark the cells a pass has painted, so it counts a cell once. Any tag unique among the passes
   * since the last clearing will do: 16 bits, both tag rasters cleared when the tags run out.
   */
  const counts = new Uint8Array(cells);
  const stamp = new Uint16Array(cells);
  const sim = layout ? new Uint8Array(cells) : null;
  const simStamp = layout ? new Uint16Array(cells) : null;
  let pass = 0;
  let needed = new Uint8Array(16);
  let quantityInOverlap = 0;
  const width = c.widthM;
  const fallbackM = opts.swathFallbackM;
  walkSteps(c, keep, frame, gap, MAX_TRAVEL_MPS / cellM, (first, k, x0, y0, x1, y1) => {
    if (first && ++pass > 0xffff) {
      stamp.fill(0);
      simStamp?.fill(0);
      pass = 1;
    }
    const dx = x1 - x0;
    const dy = y1 - y0;
    const logged = width ? width[k] : Number.NaN;
    const widthM = Number.isFinite(logged) ? Math.max(0, logged) : fallbackM;
    const h = widthM / 2 / cellM;
    if (!mayHoldCells(x0, dx, dy, h)) return;
    const len = hypot(dx, dy);
    const spans = rectSpans(frame, x0, y0, x1, y1, len, h);
    if (spans === 0) return;

    // As logged: a cell counts once per pass; a field cell painted by an earlier pass adds to the overlap.
    const tg = target[k];
    const t = (Number.isFinite(tg) ? tg : 0) * cellArea;
    for (let s = 0; s < spans; s++) {
      for (let i = SPAN_ROW[s] * cols + SPAN_C0[s], end = SPAN_ROW[s] * cols + SPAN_C1[s]; i <= end; i++) {
        if (stamp[i] === pass) continue;
        stamp[i] = pass;
        if (inside[i] && counts[i] > 0) quantityInOverlap += t;
        if (counts[i] < MAX_COUNT) counts[i]++;
      }
    }

    if (!sim || !simStamp) return;
    // Re-painted: the step's swath cut across into sections, numbered from its right-hand edge by a cell
    // centre's offset along the unit normal (ux, uy) to the left of travel, in cells.
    const w = widthM / cellM;
    const half = w / 2;
    const ux = -dy / len;
    const uy = dx / len;
    const count = Math.max(1, Math.round(w / sectionCells));
    const sw = w / count;
    if (needed.length < count) needed = new Uint8Array(count);
    needed.fill(0, 0, count);
    // A section stays on when a field cell of its footprint was not planted by an earlier pass.
    let anyNeeded = false;
    for (let s = 0; s < spans; s++) {
      const row = SPAN_ROW[s];
      const along = (row + 0.5 - y0) * uy;
      for (let col = SPAN_C0[s], i = row * cols + col; col <= SPAN_C1[s]; col++, i++) {
        if (!inside[i] || sim[i] - (simStamp[i] === pass ? 1 : 0) >= 1) continue;
        const q = Math.floor(((col + 0.5 - x0) * ux + along + half) / sw);
        needed[q < 0 ? 0 : q >= count ? count - 1 : q] = 1;
        anyNeeded = true;
      }
    }
    if (!anyNeeded) return;
    for (let s = 0; s < spans; s++) {
      const row = SPAN_ROW[s];
      const along = (row + 0.5 - y0) * uy;
      for (let col = SPAN_C0[s], i = row * cols + col; col <= SPAN_C1[s]; col++, i++) {
        if (simStamp[i] === pass) continue;
        const q = Math.floor(((col + 0.5 - x0) * ux + along + half) / sw);
        if (!needed[q < 0 ? 0 : q >= count ? count - 1 : q]) continue;
        simStamp[i] = pass;
        if (sim[i] < MAX_COUNT) sim[i]++;
      }
    }
  });

  let fieldCells = 0;
  let skippedCells = 0;
  let doubleCells = 0;
  let simDouble = 0;
  for (let i = 0; i < cells; i++) {
    if (!inside[i]) {
      counts[i] = OUTSIDE;
      continue;
    }
    fieldCells++;
    if (counts[i] === 0) skippedCells++;
    else if (counts[i] >= 2) doubleCells++;
    if (sim && sim[i] >= 2) simDouble++;
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
    sectionAdvice: layout && {
      rowsPerSection: layout.advised,
      sections: countSections(opts.rowCount, layout.advised),
      overlapCutM2: Math.max(0, doubleM2 - simDouble * cellArea),
      withinDisplayLimit: countSections(opts.rowCount, layout.advised) <= opts.displaySectionLimit,
    },
  };
}

/** The rows per section the section model advises (described at {@link coverageOf}); null when it does not apply. */
function sectionLayout(c: LogColumns, opts: CoverageOptions): { advised: number } | null {
  const { rowSpacingM, rowCount, rowsPerSection: r, displaySectionLimit } = opts;
  const known = r !== null && Number.isInteger(r) && r >= 1;
  if (!c.sectionsOn && !known) return null;
  if (!(rowSpacingM > 0) || !Number.isInteger(rowCount) || rowCount < 1) return null;
  if (!Number.isInteger(displaySectionLimit) || displaySectionLimit < 1) return null;
  const finest = minRowsPerSection(rowCount, displaySectionLimit);
  return { advised: known && finest >= r ? 1 : finest };
}
