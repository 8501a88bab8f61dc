import type { ControllerLag } from '../schemas/as-applied.schema';
import { localScale, loggedSpeedAt, pointDistanceM } from './clean-log';
import type { LogColumns } from './log-columns';

/**
 * Controller lag (DOMAIN.md §6): how long the applied rate takes to follow a step of the target, measured on
 * the log's own target steps (zone edges), and what planting at the old rate meanwhile cost: distance =
 * speed × latency (at 5 mph, 3 s = 6.706 m).
 */

/** A step counts when the target moves by at least this share of the old target. */
export const LAG_MIN_STEP_FRACTION = 0.05;
/** A step whose applied rate has not crossed halfway within this many seconds is passed over. */
export const LAG_MAX_S = 15;
/** The target must hold this many seconds before and after a step. */
export const LAG_STEADY_S = 3;
/** A gap longer than this between kept points ends a run (the default cleaning passGapS). */
const LAG_GAP_S = 5;
/** The applied levels before and after a step are its medians over this many seconds. */
const LEVEL_S = 5;
/** At most this many transitions are listed. */
const MAX_LISTED = 200;

/** The q-quantile (0–1) of sorted values, interpolating between neighbours (R type 7). */
export function quantileSorted(sorted: ArrayLike<number>, q: number): number {
  const m = sorted.length;
  if (m === 0) return Number.NaN;
  const h = (m - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(m - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/** Scratch space for {@link levelOf}, grown on demand. */
let levelValues = new Float64Array(256);

/**
 * Median applied rate over the usable points of a…b (indices into the log) from time `since` on (NaN when
 * none). The values are finite, so the typed array's own numeric sort orders them as a comparator would,
 * without a call per comparison.
 */
function levelOf(c: LogColumns, usable: (i: number) => boolean, a: number, b: number, since: number): number {
  let k = 0;
  for (let i = b; i >= a; i--) {
    if (!usable(i)) continue;
    if (!(c.t[i] >= since)) break;
    const v = c.applied[i];
    if (!Number.isFinite(v)) continue;
    if (k === levelValues.length) {
      const grown = new Float64Array(2 * k);
      grown.set(levelValues);
      levelValues = grown;
    }
    levelValues[k++] = v;
  }
  return quantileSorted(levelValues.subarray(0, k).sort(), 0.5);
}

const sameLevel = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b));

/**
 * Latency of the controller from the target steps of the log. Over the kept points (time order, positive
 * target), runs of one target value are split at gaps over 5 s; a transition is a change between two runs of
 * the same stretch by at least `minStepFraction` (default 5 %) of the old target, each run holding at least
 * 3 s. The change happens halfway between the last old and the first new point. Step fitting: among the
 * points from the change up to `maxLagS` (default 15 s) later, and before the target changes again, the
 * applied series is fitted with a step (least squares) between the levels the applied rate held: its medians
 * over the last 5 s before the change and over the last 5 s of the new target (so a controller that sits off
 * target, as a disc at its limit does, is still timed). The applied rate crosses halfway between those levels
 * where the fitted step falls, interpolated between the two points either side (their midpoint when they do
 * not straddle halfway). A step the applied rate did not follow (its levels moving less than
 * `minStepFraction`, or the other way) or does not cross within the window is passed over. latencyS is the
 * median, spreadS the interquartile range, metresAtOldRate the median ground speed at the changes (GNSS, else
 * the logged speed, else from the positions) × the latency, leadS the latency. The area affected sums the areas of the points between each
 * change and its crossing; the quantity affected Σ |new − old target| × that area. Expects the log sorted by
 * time; the pipeline passes every planting point as `keep` (the cleaning drops the points after a change).
 */
export function controllerLag(
  c: LogColumns,
  keep: Uint8Array,
  area: Float64Array,
  opts: { minStepFraction?: number; maxLagS?: number } = {},
): ControllerLag {
  const n = c.n;
  if (keep.length !== n || area.length !== n) {
    throw new RangeError(
      `keep (${keep.length}) and area (${area.length}) must have one entry per point (${n})`,
    );
  }
  const minStep = opts.minStepFraction ?? LAG_MIN_STEP_FRACTION;
  const maxLag = opts.maxLagS ?? LAG_MAX_S;
  if (!(minStep > 0 && minStep < 1))
    throw new RangeError(`The smallest step must be a fraction between 0 and 1, got ${minStep}`);
  if (!(maxLag > 0)) throw new RangeError(`The longest lag must be positive, got ${maxLag}`);
  const { t, target, applied } = c;

  // The usable points: kept, with a positive target and a finite time, read where they are (no array of
  // their indices as long as the log). The runs of one target value (split at gaps): first and last points.
  const usable = (i: number) => keep[i] !== 0 && target[i] > 0 && Number.isFinite(t[i]);
  const runFirst: number[] = [];
  const runLast: number[] = [];
  const joinedToPrev: boolean[] = []; // the run follows the one before without a gap
  let p = -1;
  for (let i = 0; i < n; i++) {
    if (!usable(i)) continue;
    if (p >= 0) {
      const dt = t[i] - t[p];
      if (dt < 0) throw new RangeError(`The log must be sorted by time: point ${i} comes before point ${p}`);
      const gap = dt > LAG_GAP_S;
      if (gap || !sameLevel(target[i], target[p])) {
        runLast.push(p);
        runFirst.push(i);
        joinedToPrev.push(!gap);
      }
    } else {
      runFirst.push(i);
      joinedToPrev.push(false);
    }
    p = i;
  }
  if (p >= 0) runLast.push(p);

  const scale = localScale(c.lat);
  const latencies: number[] = [];
  const speeds: number[] = [];
  const perTransition: ControllerLag['perTransition'] = [];
  let areaAffected = 0;
  let quantityAffected = 0;
  const runs = runFirst.length;
  for (let r = 1; r < runs; r++) {
    if (!joinedToPrev[r]) continue;
    const oldFirst = runFirst[r - 1];
    const oldLast = runLast[r - 1];
    const first = runFirst[r];
    const last = runLast[r];
    const oldTarget = target[oldLast];
    const newTarget = target[first];
    if (Math.abs(newTarget - oldTarget) < minStep * oldTarget) continue;
    const tc = (t[oldLast] + t[first]) / 2;
    const tEnd = r + 1 < runs && joinedToPrev[r + 1] ? (t[last] + t[runFirst[r + 1]]) / 2 : t[last];
    if (tc - t[oldFirst] < LAG_STEADY_S || tEnd - tc < LAG_STEADY_S) continue;

    // The levels the applied rate held: its median over the last seconds of the old run and of the new one
    // (the controller may sit off target, e.g. a disc at its limit). A step it did not follow is passed over.
    const from = levelOf(c, usable, oldFirst, oldLast, tc - LEVEL_S);
    const to = levelOf(c, usable, first, last, Math.max(tc, tEnd - LEVEL_S));
    const sgn = Math.sign(newTarget - oldTarget);
    if (!(sgn * (to - from) >= minStep * Math.abs(from))) continue;

    // Least-squares step between those levels: a point fits the new level better when it lies past halfway,
    // so the best split minimises the running sum of sgn × (a − halfway) over the points left at the old level.
    // i0 is the last point left at the old level (at first the old run's last), i1 the point after it once the
    // window has reached it (−1 until then).
    const half = (from + to) / 2;
    let i0 = oldLast;
    let i1 = -1;
    let bestSum = 0;
    let sum = 0;
    for (let i = first; i <= last; i++) {
      if (!usable(i)) continue;
      if (!(t[i] - tc <= maxLag)) break;
      if (i1 < 0) i1 = i;
      const a = applied[i];
      if (Number.isFinite(a)) sum += sgn * (a - half);
      if (sum < bestSum) {
        bestSum = sum;
        i0 = i;
        i1 = -1;
      }
    }
    if (i1 < 0) continue; // every point fits the old level: never crossed within the window

    const a0 = applied[i0];
    const a1 = applied[i1];
    const straddle = (a0 - half) * (a1 - half) <= 0 && a0 !== a1;
    const tx = straddle ? t[i0] + ((half - a0) / (a1 - a0)) * (t[i1] - t[i0]) : (t[i0] + t[i1]) / 2;
    const latency = tx - tc;
    latencies.push(latency);
    if (perTransition.length < MAX_LISTED) perTransition.push({ t: tc, latencyS: latency });

    let stepArea = 0;
    for (let i = first; i <= i0; i++) if (usable(i)) stepArea += area[i];
    areaAffected += stepArea;
    quantityAffected += Math.abs(newTarget - oldTarget) * stepArea;

    let v = loggedSpeedAt(c, first);
    if (!Number.isFinite(v)) v = pointDistanceM(c, scale, oldLast, first) / (t[first] - t[oldLast]);
    if (Number.isFinite(v)) speeds.push(v);
  }

  latencies.sort((a, b) => a - b);
  speeds.sort((a, b) => a - b);
  const latencyS = latencies.length ? quantileSorted(latencies, 0.5) : null;
  const speed = speeds.length ? quantileSorted(speeds, 0.5) : null;
  return {
    transitions: latencies.length,
    latencyS,
    spreadS: latencies.length ? quantileSorted(latencies, 0.75) - quantileSorted(latencies, 0.25) : null,
    metresAtOldRate: latencyS !== null && speed !== null ? speed * latencyS : null,
    areaAffectedM2: areaAffected,
    quantityAffected,
    leadS: latencyS,
    perTransition,
  };
}
