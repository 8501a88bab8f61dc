import { GeoInputError } from './geo-input-error';

/** How values are grouped into classes. */
export type ClassMethod = 'quantile' | 'jenks' | 'kmeans';

/** Above this many values, Jenks works on this many evenly spaced order statistics (the DP is O(k·n²)). */
export const JENKS_SAMPLE = 2000;

/** The finite values, sorted ascending (a new array). */
function sortedFinite(values: ArrayLike<number>): Float64Array {
  const out: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) out.push(values[i]);
  return Float64Array.from(out).sort();
}

/**
 * Quantile breaks: break i (1 ≤ i < n) is the largest value of the i-th of n equal-count groups of the sorted
 * values, i.e. sorted[ceil(i·N/n) − 1]. With {@link classify}, 1..10 in two classes gives [5]: 1–5 and 6–10.
 */
function quantileBreaks(sorted: Float64Array, n: number): number[] {
  const out: number[] = [];
  for (let i = 1; i < n; i++) out.push(sorted[Math.ceil((i * sorted.length) / n) - 1]);
  return out;
}

/** Evenly spaced order statistics of a sorted array, at most `max` of them (first and last kept). */
function orderSample(sorted: Float64Array, max: number): Float64Array {
  if (sorted.length <= max) return sorted;
  const out = new Float64Array(max);
  for (let i = 0; i < max; i++) out[i] = sorted[Math.round((i * (sorted.length - 1)) / (max - 1))];
  return out;
}

/**
 * Fisher–Jenks natural breaks: the grouping of sorted values into n contiguous classes that minimises the
 * sum of squared deviations from the class means (Fisher 1958, exact dynamic programme). Breaks are the
 * largest value of each lower class. Large inputs are sampled first (see {@link JENKS_SAMPLE}).
 */
function jenksBreaks(sortedAll: Float64Array, n: number): number[] {
  const x = orderSample(sortedAll, JENKS_SAMPLE);
  const m = x.length;
  const s1 = new Float64Array(m + 1);
  const s2 = new Float64Array(m + 1);
  for (let i = 0; i < m; i++) {
    s1[i + 1] = s1[i] + x[i];
    s2[i + 1] = s2[i] + x[i] * x[i];
  }
  // Sum of squared deviations of x[i..j] inclusive.
  const ssd = (i: number, j: number) => {
    const c = j - i + 1;
    const s = s1[j + 1] - s1[i];
    return s2[j + 1] - s2[i] - (s * s) / c;
  };
  // cost[k][j]: best cost of x[0..j] in k + 1 classes; from[k][j]: first index of the last class.
  let prev = new Float64Array(m);
  for (let j = 0; j < m; j++) prev[j] = ssd(0, j);
  const from: Int32Array[] = [new Int32Array(m)];
  for (let k = 1; k < n; k++) {
    const cur = new Float64Array(m).fill(Infinity);
    const arg = new Int32Array(m);
    for (let j = k; j < m; j++) {
      for (let i = k; i <= j; i++) {
        const c = prev[i - 1] + ssd(i, j);
        if (c < cur[j]) {
          cur[j] = c;
          arg[j] = i;
        }
      }
    }
    from.push(arg);
    prev = cur;
  }
  const breaks: number[] = [];
  let j = m - 1;
  for (let k = n - 1; k > 0; k--) {
    const i = from[k][j];
    breaks.unshift(x[i - 1]);
    j = i - 1;
  }
  return breaks;
}

/**
 * One-dimensional k-means (Lloyd's algorithm) started deterministically from the means of the n quantile
 * classes, iterated until the assignment is stable (at most 100 rounds). Breaks are the midpoints between
 * neighbouring centres, so each value falls in the class of its nearest centre.
 */
function kmeansBreaks(sorted: Float64Array, n: number): number[] {
  const N = sorted.length;
  const centres: number[] = [];
  for (let c = 0; c < n; c++) {
    const a = Math.floor((c * N) / n);
    const b = Math.floor(((c + 1) * N) / n);
    let s = 0;
    for (let i = a; i < b; i++) s += sorted[i];
    centres.push(b > a ? s / (b - a) : sorted[Math.min(a, N - 1)]);
  }
  let breaks = centres.slice(1).map((c, i) => (centres[i] + c) / 2);
  for (let round = 0; round < 100; round++) {
    const sum = new Float64Array(n);
    const count = new Float64Array(n);
    for (let i = 0; i < N; i++) {
      const k = classify(sorted[i], breaks);
      sum[k] += sorted[i];
      count[k] += 1;
    }
    const next = centres.map((c, k) => (count[k] ? sum[k] / count[k] : c)).sort((p, q) => p - q);
    const nextBreaks = next.slice(1).map((c, i) => (next[i] + c) / 2);
    const stable = nextBreaks.every((b, i) => b === breaks[i]);
    centres.splice(0, n, ...next);
    breaks = nextBreaks;
    if (stable) break;
  }
  return breaks;
}

/**
 * Inner class breaks, ascending, for grouping `values` into `n` classes (at most n − 1 breaks; fewer when
 * there are fewer distinct values than classes, so that no class is empty by construction). Non-finite values
 * are ignored. Units are those of the values. Throws {@link GeoInputError} when there is no finite value or n
 * is not a whole number from 1 to 50.
 */
export function classBreaks(values: ArrayLike<number>, n: number, method: ClassMethod): number[] {
  if (!Number.isInteger(n) || n < 1 || n > 50)
    throw new GeoInputError(`The number of classes must be a whole number from 1 to 50, not ${n}`);
  const sorted = sortedFinite(values);
  if (sorted.length === 0) throw new GeoInputError('There are no numeric values to class');
  let distinct = 1;
  for (let i = 1; i < sorted.length; i++) if (sorted[i] !== sorted[i - 1]) distinct++;
  const k = Math.min(n, distinct);
  if (k < 2) return [];
  const raw =
    method === 'quantile'
      ? quantileBreaks(sorted, k)
      : method === 'jenks'
        ? jenksBreaks(sorted, k)
        : kmeansBreaks(sorted, k);
  // Ties can repeat a break (quantiles of repeated values) or put one at the maximum: drop those.
  const max = sorted[sorted.length - 1];
  return raw.filter((b, i) => b < max && (i === 0 || b > raw[i - 1]));
}

/**
 * The class index (0 … breaks.length) of a value: the number of breaks strictly below it, so a value equal to
 * a break belongs to the lower class. NaN gives −1.
 */
export function classify(value: number, breaks: readonly number[]): number {
  if (Number.isNaN(value)) return -1;
  let lo = 0;
  let hi = breaks.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (breaks[mid] < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Equal-width histogram of the finite values: `bins` counts over [min, max] (the last bin includes max). */
export type Histogram = { min: number; max: number; edges: number[]; counts: number[] };

/** Counts of the finite values in `bins` equal-width bins from their minimum to their maximum. */
export function histogram(values: ArrayLike<number>, bins: number): Histogram {
  const nb = Math.max(1, Math.floor(bins));
  const counts = new Array<number>(nb).fill(0);
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!Number.isFinite(v)) continue;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (min > max) return { min: NaN, max: NaN, edges: [], counts: [] };
  const width = (max - min) / nb;
  const edges = Array.from({ length: nb + 1 }, (_, i) => (i === nb ? max : min + i * width));
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!Number.isFinite(v)) continue;
    counts[width > 0 ? Math.min(nb - 1, Math.floor((v - min) / width)) : 0] += 1;
  }
  return { min, max, edges, counts };
}
