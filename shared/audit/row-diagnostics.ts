import { ROW_VALUE_KINDS, type RowDiagnostic } from '../schemas/as-applied.schema';
import type { LogColumns } from './log-columns';

/**
 * Per-row diagnostics (DEVELOPERS.md "Diagnostics"): which rows of the planter stand apart from the others, by
 * a robust z-score on the row means, and Kachman & Smith's (1995) uniformity indices for seed spacings
 * (DOMAIN.md §7).
 */

/**
 * Scales the median absolute deviation to the standard deviation for normally distributed data:
 * 1 / Φ⁻¹(3/4) = 1.4826 (standard statistics).
 */
export const MAD_TO_SD = 1.4826;
/** |robust z| above this flags a row: Iglewicz & Hoaglin (1993) recommend 3.5 for the modified z-score (from memory). */
export const DEFAULT_ROW_THRESHOLD = 3.5;
/**
 * The MAD used is at least this share of |median| (our own choice). When all rows but one agree exactly the
 * MAD is 0 and every difference would be infinitely far out; with this floor a row must differ from the median
 * by more than threshold × 1.4826 × 1 % (5.2 % at the default threshold) to be flagged.
 */
export const MAD_FLOOR_SHARE = 0.01;

/** Median of a sorted copy (the middle value, or the mean of the two middle values). */
function median(values: ArrayLike<number>): number {
  const s = Float64Array.from(values).sort();
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/**
 * Kachman & Smith (1995), Trans. ASAE 38(2) (DOMAIN.md §7), all in %: multiples D = share of spacings
 * ≤ 0.5 xRef; misses M = share > 1.5 xRef; quality of feed A = 100 − D − M; precision C = the SAMPLE standard
 * deviation (n − 1) of the spacings in (0.5, 1.5] xRef divided by xRef — the sample SD is what reproduces
 * DOMAIN.md's worked example (C 3.861 %; the population SD would give 3.525 %). Spacings that are not finite
 * numbers ≥ 0 are left out. Precision is NaN when fewer than two spacings are singles (no spread to measure).
 */
export function kachmanSmith(
  spacings: ArrayLike<number>,
  xRef: number,
): { multiples: number; misses: number; quality: number; precision: number } {
  if (!(Number.isFinite(xRef) && xRef > 0))
    throw new RangeError(`The theoretical spacing xRef must be a positive number, got ${xRef}`);
  let n = 0;
  let multiples = 0;
  let misses = 0;
  // Singles: Welford's running mean and sum of squared deviations (stable for many values).
  let singles = 0;
  let mean = 0;
  let m2 = 0;
  for (let i = 0; i < spacings.length; i++) {
    const x = spacings[i];
    if (!(Number.isFinite(x) && x >= 0)) continue;
    n++;
    if (x <= 0.5 * xRef) multiples++;
    else if (x > 1.5 * xRef) misses++;
    else {
      singles++;
      const d = x - mean;
      mean += d / singles;
      m2 += d * (x - mean);
    }
  }
  if (n === 0) throw new RangeError('There are no seed spacings (finite numbers ≥ 0) to assess');
  const D = (100 * multiples) / n;
  const M = (100 * misses) / n;
  const precision = singles >= 2 ? (100 * Math.sqrt(m2 / (singles - 1))) / xRef : Number.NaN;
  return { multiples: D, misses: M, quality: 100 - D - M, precision };
}

/**
 * For each kind of per-row value in the log (population, singulation, load, vacuum, spacing; in that order),
 * each row's mean over the kept points (values that are not finite left out; a row with none is left out),
 * the median of the row means, the MAD (median |mean − median|) and each row's robust z = (mean − median) /
 * (1.4826 × MAD), flagged when |z| > `threshold` (default 3.5). The MAD used — and reported — is at least
 * 1 % of |median| ({@link MAD_FLOOR_SHARE}), or where the median is 0, 1 % of the mean |row mean|; when that
 * too is 0 every row equals the median and z is 0. Two columns of the same row and kind are pooled.
 *
 * For spacing, also Kachman & Smith over every kept spacing of every row ({@link kachmanSmith}), with xRef
 * `opts.xRefM` or else the median spacing; null when there are not two single spacings to measure precision.
 */
export function rowDiagnostics(
  c: LogColumns,
  keep: Uint8Array,
  opts: { threshold?: number; xRefM?: number } = {},
): RowDiagnostic[] {
  if (keep.length !== c.n)
    throw new RangeError(`keep (${keep.length}) must have one entry per point (${c.n})`);
  const threshold = opts.threshold ?? DEFAULT_ROW_THRESHOLD;
  if (!(threshold > 0)) throw new RangeError(`The row threshold must be positive, got ${threshold}`);
  if (opts.xRefM !== undefined && !(opts.xRefM > 0))
    throw new RangeError(`The theoretical spacing must be positive, got ${opts.xRefM} m`);

  const out: RowDiagnostic[] = [];
  for (const kind of ROW_VALUE_KINDS) {
    const columns = c.rows.filter((r) => r.kind === kind);
    if (!columns.length) continue;
    const sums = new Map<number, { sum: number; count: number }>();
    for (const { row, values } of columns) {
      if (values.length !== c.n)
        throw new RangeError(`Row ${row} (${kind}) has ${values.length} values for ${c.n} points`);
      const acc = sums.get(row) ?? { sum: 0, count: 0 };
      for (let i = 0; i < c.n; i++) {
        const v = values[i];
        if (keep[i] && Number.isFinite(v)) {
          acc.sum += v;
          acc.count++;
        }
      }
      sums.set(row, acc);
    }
    const rows = [...sums]
      .filter(([, a]) => a.count > 0)
      .map(([row, a]) => ({ row, mean: a.sum / a.count }))
      .sort((a, b) => a.row - b.row);
    if (!rows.length) continue;
    const means = rows.map((r) => r.mean);
    const med = median(means);
    const rawMad = median(means.map((m) => Math.abs(m - med)));
    const base = med !== 0 ? Math.abs(med) : means.reduce((s, m) => s + Math.abs(m), 0) / means.length;
    const mad = Math.max(rawMad, MAD_FLOOR_SHARE * base);
    out.push({
      kind,
      rows: rows.map(({ row, mean }) => {
        const robustZ = mad > 0 ? (mean - med) / (MAD_TO_SD * mad) : 0;
        return { row, mean, robustZ, flagged: Math.abs(robustZ) > threshold };
      }),
      median: med,
      mad,
      threshold,
      uniformity: kind === 'spacing' ? uniformityOf(columns, keep, opts.xRefM) : null,
    });
  }
  return out;
}

function uniformityOf(
  columns: LogColumns['rows'],
  keep: Uint8Array,
  xRefM: number | undefined,
): RowDiagnostic['uniformity'] {
  const all: number[] = [];
  for (const { values } of columns)
    for (let i = 0; i < values.length; i++) {
      const v = values[i];
      if (keep[i] && Number.isFinite(v) && v >= 0) all.push(v);
    }
  if (!all.length) return null;
  const xRef = xRefM ?? median(all);
  if (!(xRef > 0)) return null;
  const k = kachmanSmith(all, xRef);
  return Number.isNaN(k.precision) ? null : { xRef, ...k };
}
