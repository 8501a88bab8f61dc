import type { AlarmReplay } from '../schemas/as-applied.schema';
import type { LogColumns } from './log-columns';

/**
 * Alarm replay (DOMAIN.md §6): what an off-rate alarm with a tolerance band and a delay would have told the
 * operator while this log was planted. An alarm fires when the rate stays outside the band for at least the
 * delay without returning inside; it sounds from then until the rate comes back.
 */

/** A gap longer than this between kept points ends an episode (the default cleaning passGapS). */
export const ALARM_PASS_GAP_S = 5;
/** At most this many alarms are listed (all are counted). */
export const MAX_ALARMS_LISTED = 500;
/** Durations within this of the delay count as reaching it (sums of time steps carry round-off). */
const EPS_S = 1e-6;

/**
 * The time step most kept points stand for: the median of the kept steps within `gap` (from at most about
 * 20 000 of them); 1 s when there are none.
 */
export function typicalStepS(t: Float64Array, keep: Uint8Array, gap: number): number {
  const stride = Math.max(1, Math.floor(t.length / 20_000));
  const steps: number[] = [];
  // Only every stride-th point is sampled, each with the usable point before it (kept, with a finite time):
  // found by looking back, so the points between samples are not walked one by one.
  for (let i = stride; i < t.length; i += stride) {
    if (!keep[i] || !Number.isFinite(t[i])) continue;
    let prev = i - 1;
    while (prev >= 0 && !(keep[prev] && Number.isFinite(t[prev]))) prev--;
    if (prev < 0) continue;
    const dt = t[i] - t[prev];
    if (dt > 0 && dt <= gap) steps.push(dt);
  }
  if (steps.length === 0) return 1;
  // The steps are finite: the typed array's numeric sort orders them as a comparator would.
  const sorted = Float64Array.from(steps).sort();
  return sorted[sorted.length >> 1];
}

/**
 * Replays the alarm over the kept points in time order. A point is out of band when
 * |applied − target| / target > bandFraction (points without a positive target or a finite applied rate are
 * passed over). An episode is a run of out-of-band points that no in-band point interrupts and no gap longer
 * than `passGapS` (default 5 s) splits. Each point stands for the time until the next kept point (the typical
 * step for the last point before a gap), so an episode of k points at 1 Hz lasts k s. An alarm fires when an
 * episode lasts at least `delayS`; it is recorded where and when the episode began, over or under by the
 * time-weighted mean sign of the error. Unreported: out of band while no alarm sounded — whole episodes shorter
 * than the delay and the first `delayS` of each alarm's episode (a point straddling that instant is split
 * pro rata). Areas are the given per-point areas. Expects the log sorted by time (cleanLog's columns).
 */
export function replayAlarms(
  c: LogColumns,
  keep: Uint8Array,
  zone: Int16Array,
  area: Float64Array,
  opts: { bandFraction: number; delayS: number; passGapS?: number },
): AlarmReplay {
  const n = c.n;
  if (keep.length !== n || zone.length !== n || area.length !== n) {
    throw new RangeError(
      `keep (${keep.length}), zone (${zone.length}) and area (${area.length}) must have one entry per point (${n})`,
    );
  }
  const { bandFraction: band, delayS } = opts;
  const gap = opts.passGapS ?? ALARM_PASS_GAP_S;
  if (!(band > 0 && band < 1))
    throw new RangeError(`The band must be a fraction between 0 and 1, got ${band}`);
  if (!(delayS >= 0 && Number.isFinite(delayS)))
    throw new RangeError(`The alarm delay must be 0 s or more, got ${delayS}`);
  if (!(gap > 0)) throw new RangeError(`The pass gap must be positive, got ${gap}`);
  const { t, target, applied } = c;
  const step = typicalStepS(t, keep, gap);

  const alarms: AlarmReplay['alarms'] = [];
  let count = 0;
  let outTime = 0;
  let outArea = 0;
  let unrepTime = 0;
  let unrepArea = 0;

  // The open episode: first point, start time, time so far, Σ sign × time.
  let first = -1;
  let start = 0;
  let dur = 0;
  let signTime = 0;
  const close = () => {
    if (first < 0) return;
    unrepTime += Math.min(dur, delayS);
    if (dur + EPS_S >= delayS) {
      count++;
      {
        alarms.push({
          startT: start,
          endT: start + dur,
          durationS: dur,
          lon: c.lon[first],
          lat: c.lat[first],
          zone: zone[first],
          direction: signTime >= 0 ? 'over' : 'under',
        });
      }
    }
    first = -1;
  };

  // Walk the usable points (kept, with a positive target, a finite applied rate and a finite time) with one
  // point of look-ahead: each is handled once its successor (and so its time step) is known. One loop with no
  // call per point, as a log's replay runs once per import, mostly before the code is optimised.
  const usable = (i: number) =>
    keep[i] !== 0 && target[i] > 0 && Number.isFinite(applied[i]) && Number.isFinite(t[i]);
  let i = 0;
  while (i < n && !usable(i)) i++;
  while (i < n) {
    let next = i + 1;
    while (next < n && !usable(next)) next++;
    if (next < n && t[next] < t[i])
      throw new RangeError(`The log must be sorted by time: point ${next} comes before point ${i}`);
    const r = (applied[i] - target[i]) / target[i];
    const out = r > band ? 1 : r < -band ? -1 : 0; // 0 in band, +1 over, −1 under
    const dtNext = next < n ? t[next] - t[i] : Number.NaN;
    const joined = dtNext >= 0 && dtNext <= gap;
    const dt = joined ? dtNext : step;
    if (out !== 0) {
      if (first < 0) {
        first = i;
        start = t[i];
        dur = 0;
        signTime = 0;
      }
      const a = area[i];
      outTime += dt;
      outArea += a;
      // The part of this point's time before the alarm would have sounded.
      const before = Math.min(dt, Math.max(0, start + delayS - t[i]));
      if (before > 0) unrepArea += dt > 0 ? (a * before) / dt : a;
      dur += dt;
      signTime += out * dt;
    } else if (first >= 0) {
      close();
    }
    if (!joined && first >= 0) close();
    i = next;
  }

  return {
    bandFraction: band,
    delayS,
    alarms: spreadOver(alarms, MAX_ALARMS_LISTED),
    count,
    outOfBandTimeS: outTime,
    outOfBandAreaM2: outArea,
    unreportedTimeS: unrepTime,
    unreportedAreaM2: unrepArea,
  };
}

/**
 * At most `max` of the alarms, spread evenly over the whole log (the first and the last always among them),
 * so a map of where alarms began covers the field, not only its first passes.
 */
function spreadOver<T>(all: T[], max: number): T[] {
  if (all.length <= max) return all;
  const out: T[] = [];
  for (let k = 0; k < max; k++) out.push(all[Math.round((k * (all.length - 1)) / (max - 1))]);
  return out;
}
