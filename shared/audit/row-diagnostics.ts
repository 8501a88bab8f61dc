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
  return kachmanSmithOf([spacings], null, xRef);
}

/**
 * {@link kachmanSmith} over the spacings of several arrays one after the other (where `keep`, when given, is
 * set: each array has one entry per point), so the rows of a log need not be copied into one array first.
 */
function kachmanSmithOf(
  parts: ArrayLike<number>[],
  keep: Uint8Array | null,
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
  for (const spacings of parts)
    for (let i = 0; i < spacings.length; i++) {
      const x = spacings[i];
      if (!(Number.isFinite(x) && x >= 0) || (keep && !keep[i])) continue;
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
      // Summed in locals (the same additions in the same order), written back once per column.
      let { sum, count } = acc;
      for (let i = 0; i < c.n; i++) {
        const v = values[i];
        if (keep[i] && Number.isFinite(v)) {
          sum += v;
          count++;
        }
      }
      sums.set(row, { sum, count });
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
  // Every kept spacing of every row: rows × points of them, read where they are (no copy into one array).
  const parts = columns.map((r) => r.values);
  const xRef = xRefM ?? medianSpacing(parts, keep);
  if (Number.isNaN(xRef)) return null; // no spacings (or no median of none)
  if (!(xRef > 0)) return null;
  if (xRefM !== undefined && countSpacings(parts, keep) === 0) return null;
  const k = kachmanSmithOf(parts, keep, xRef);
  return Number.isNaN(k.precision) ? null : { xRef, ...k };
}

/** Whether value v at point i is a kept spacing (a finite number ≥ 0). */
const isSpacing = (v: number, keep: Uint8Array, i: number) => keep[i] !== 0 && Number.isFinite(v) && v >= 0;

function countSpacings(parts: Float64Array[], keep: Uint8Array): number {
  let n = 0;
  for (const values of parts) for (let i = 0; i < values.length; i++) if (isSpacing(values[i], keep, i)) n++;
  return n;
}

/**
 * The median of the kept spacings ({@link median} of them all: NaN when there are none), found by selection on
 * their bits instead of a sort of millions: for numbers ≥ 0 the order of the IEEE 754 bit patterns (read as
 * unsigned integers) is the numbers' order. A histogram of the top 16 bits finds the bucket of each middle
 * value, a second one of the next 16 bits narrows it, and only the values sharing those 32 bits are sorted.
 */
function medianSpacing(parts: Float64Array[], keep: Uint8Array): number {
  const f = new Float64Array(1);
  const u = new Uint32Array(f.buffer);
  const hiOf = (v: number) => {
    f[0] = v + 0; // −0 as 0: equal in the numeric order, different in bits
    return u[1];
  };
  /** The values whose high word `admits`, counted by `bucket` of that word. */
  const histogram = (admits: (hi: number) => boolean, bucket: (hi: number) => number) => {
    const h = new Float64Array(65_536);
    for (const values of parts)
      for (let i = 0; i < values.length; i++) {
        const v = values[i];
        if (!isSpacing(v, keep, i)) continue;
        const hi = hiOf(v);
        if (admits(hi)) h[bucket(hi)]++;
      }
    return h;
  };
  /** The bucket holding rank r (0-based) of the counted values, and the count in the buckets before it. */
  const find = (h: Float64Array, r: number) => {
    let before = 0;
    let b = 0;
    while (before + h[b] <= r) before += h[b++];
    return { b, before };
  };
  const top = histogram(
    () => true,
    (hi) => hi >>> 16,
  );
  const n = top.reduce((s, x) => s + x, 0);
  if (n === 0) return Number.NaN;
  const m = Math.floor(n / 2);
  const ranks = n % 2 ? [m] : [m - 1, m];
  // Each middle rank: narrow to the values sharing its top 32 bits, then sort those few.
  const valueAt = (r: number) => {
    const t = find(top, r);
    const sub = histogram(
      (hi) => hi >>> 16 === t.b,
      (hi) => hi & 0xffff,
    );
    const s = find(sub, r - t.before);
    const word = ((t.b << 16) | s.b) >>> 0;
    const same: number[] = [];
    for (const values of parts)
      for (let i = 0; i < values.length; i++) {
        const v = values[i];
        if (isSpacing(v, keep, i) && hiOf(v) === word) same.push(v);
      }
    return Float64Array.from(same).sort()[r - t.before - s.before];
  };
  const values = ranks.map(valueAt);
  return values.length === 1 ? values[0] : (values[0] + values[1]) / 2;
}
