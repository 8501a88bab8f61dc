import { metresPerDegree } from '../geo/interpolate-idw';
import {
  CLEANING_STEPS,
  CLEANING_STEP_LABELS,
  type CleaningReport,
  type CleaningSettings,
} from '../schemas/as-applied.schema';
import { type LogColumns, selectColumns, timeOrder } from './log-columns';
import { OUT_OF_FIELD } from './zone-join';

/**
 * Cleaning an as-applied log in FORMATS.md's order (Sudduth & Drummond 2007; Simbahan et al. 2004; Colaço et
 * al. 2014): each step looks only at the points the steps before it kept, and a point is counted against the
 * first step that removes it.
 */

/* ---------------------------------------------------------------- local geometry, shared with the audit */

/**
 * Metres per degree of longitude and latitude at the log's mean latitude (WGS84 radii of curvature,
 * {@link metresPerDegree}). A flat local approximation: over a field of 5 km north–south the scale at the
 * ends differs from the middle by under 0.1 %, and distances between points seconds apart by far less.
 */
export function localScale(lat: Float64Array): { lon: number; lat: number } {
  let sum = 0;
  let count = 0;
  const step = Math.max(1, Math.floor(lat.length / 10_000));
  for (let i = 0; i < lat.length; i += step) {
    if (Number.isFinite(lat[i])) {
      sum += lat[i];
      count++;
    }
  }
  return metresPerDegree(count ? sum / count : 0);
}

/** Distance in metres between points i and j (local flat approximation, see {@link localScale}). */
export function pointDistanceM(c: LogColumns, scale: { lon: number; lat: number }, i: number, j: number) {
  const dx = (c.lon[j] - c.lon[i]) * scale.lon;
  const dy = (c.lat[j] - c.lat[i]) * scale.lat;
  return Math.sqrt(dx * dx + dy * dy);
}

/**
 * The ground speed the log gives at point i, m/s: GNSS speed (the true speed over ground), else the single
 * speed column, else wheel or radar speed; NaN when the log has none of them there.
 */
export function loggedSpeedAt(c: LogColumns, i: number): number {
  const g = c.gnssMps ? c.gnssMps[i] : Number.NaN;
  if (Number.isFinite(g)) return g;
  const s = c.speedMps ? c.speedMps[i] : Number.NaN;
  if (Number.isFinite(s)) return s;
  const w = c.wheelMps ? c.wheelMps[i] : Number.NaN;
  return Number.isFinite(w) ? w : Number.NaN;
}

/* ---------------------------------------------------------------- cleaning */

export type CleanedLog = {
  /** The log sorted by time (every point, removed ones too). */
  columns: LogColumns;
  /** The zone array in the same order, or null when none was given. */
  zone: Int16Array | null;
  /** 1 kept, 0 removed. */
  keep: Uint8Array;
  /** 0 kept, else 1 + the index in CLEANING_STEPS of the step that removed the point. */
  removedBy: Uint8Array;
  report: CleaningReport;
};

/** removedBy code of each step: 1 + its index in CLEANING_STEPS (plain numbers: these run per point). */
const code = (step: (typeof CLEANING_STEPS)[number]) => CLEANING_STEPS.indexOf(step) + 1;
const SORT_DEDUPE = code('sort-dedupe');
const WORK_OFF = code('work-off');
const SPEED = code('speed');
const PASS_ENDS = code('pass-ends');
const TARGET_CHANGE = code('target-change');
const PLAUSIBILITY = code('plausibility');
const BOUNDARY = code('boundary');
/** The zone of a point outside the boundary (zone-join.ts), as a local constant. */
const OUTSIDE = OUT_OF_FIELD;

/** A number for a setting text: at most two decimals, no trailing zeros. */
const num = (v: number) => String(Math.round(v * 100) / 100);

/** The settings of each step in words (SI units). */
export function cleaningSettingText(s: CleaningSettings, hasZones: boolean): Record<string, string> {
  return {
    'sort-dedupe': 'a repeated time keeps its first point; points without a time are dropped',
    'work-off': 'work switch off, or no sections on',
    speed: `${num(s.minSpeedMps)}–${num(s.maxSpeedMps)} m/s, at most ${num(s.maxAccelMps2)} m/s²`,
    'pass-ends':
      `first ${num(s.trimPassStartS)} s and last ${num(s.trimPassEndS)} s of each pass; ` +
      `a gap over ${num(s.passGapS)} s starts a new pass; turning faster than ${num(s.turnDegPerS)}°/s`,
    'target-change': `${num(s.afterTargetChangeS)} s after each change of target`,
    plausibility: `applied ÷ target from ${num(s.plausibleRatioMin)} to ${num(s.plausibleRatioMax)}`,
    boundary: !hasZones
      ? 'no boundary given'
      : s.clipToBoundary
        ? 'points outside the boundary dropped'
        : 'off: points outside the boundary kept',
  };
}

/**
 * Indexes sorted by time with points lacking a time at the end; null when the log is already in that order
 * (every time a number, none smaller than the one before: the usual log, read without an index array).
 */
function sortOrder(t: Float64Array): Uint32Array | null {
  let inOrder = true;
  for (let i = 0; i < t.length; i++) {
    if (Number.isNaN(t[i]) || (i > 0 && t[i] < t[i - 1])) {
      inOrder = false;
      break;
    }
  }
  if (inOrder) return null;
  let hasNaN = false;
  for (let i = 0; i < t.length; i++) if (Number.isNaN(t[i])) hasNaN = true;
  const order = hasNaN
    ? timeOrder(Float64Array.from(t, (v) => (Number.isNaN(v) ? Infinity : v)))
    : timeOrder(t);
  return isIdentity(order) ? null : order;
}

const isIdentity = (order: Uint32Array) => {
  for (let i = 0; i < order.length; i++) if (order[i] !== i) return false;
  return true;
};

/**
 * Signed smallest difference of two headings, degrees in (−180, 180]: ((a − b) mod 360 + 540) mod 360 − 180,
 * with the second remainder taken by subtraction (exact here: Sterbenz), so no fmod call for the usual case.
 */
function headingDiff(a: number, b: number): number {
  let x = a - b;
  if (!(x > -360 && x < 360)) x %= 360;
  let y = x + 540;
  y = y >= 720 ? y - 720 : y >= 360 ? y - 360 : y;
  const d = y - 180;
  return d === -180 ? 180 : d;
}

/**
 * Cleans a log (FORMATS.md "As-applied logs", in this order):
 * 1. sort by time; drop repeated times (the first point of a time stays) and points without a time;
 * 2. work off: work switch 0, or sections on 0;
 * 3. speed outside [min, max], or |Δv| / Δt above maxAccel against the previous point the steps before kept
 *    (GNSS speed, else the single speed, else the wheel; else distance ÷ time from the positions);
 * 4. pass ends: passes split at gaps over passGapS and at turns (heading, else course from the positions,
 *    changing faster than turnDegPerS); turn points go, and so do the first trimPassStartS and the last
 *    trimPassEndS seconds of each pass;
 * 5. target change: the points less than afterTargetChangeS after each change of the logged target (changes
 *    are seen on every timed point, planting or not: the controller follows the target all the time);
 * 6. plausibility: applied ÷ target outside [plausibleRatioMin, plausibleRatioMax], or not a number;
 * 7. boundary: zone === −2 (outside the field), when clipToBoundary and a zone array is given.
 *
 * The steps run in three passes over the points (1–3 with the turns of 4; the pass ends of 4; 5–7): a step
 * only looks at points before the current one, or (the pass ends) at the points the steps before it kept.
 */
export function cleanLog(c: LogColumns, settings: CleaningSettings, zone: Int16Array | null): CleanedLog {
  if (zone && zone.length !== c.n) {
    throw new RangeError(`The zone array has ${zone.length} entries for a log of ${c.n} points`);
  }
  const order = sortOrder(c.t);
  const s = order ? selectColumns(c, order) : c;
  const z = zone ? (order ? Int16Array.from(order, (i) => zone[i]) : zone) : null;
  const n = s.n;
  const t = s.t;
  const removedBy = new Uint8Array(n);
  const scale = localScale(s.lat);
  const { workOn, sectionsOn, gnssMps, speedMps, wheelMps, heading, lon, lat } = s;
  const { minSpeedMps, maxSpeedMps, maxAccelMps2, passGapS, turnDegPerS } = settings;

  // Steps 1–3, and the turns of step 4 over the points steps 1–3 keep (seq, in time order).
  const seq = new Int32Array(n);
  const turn = new Uint8Array(n); // per entry of seq: 1 a turn point
  const newPass = new Uint8Array(n); // per entry of seq: 1 where a pass starts
  let m = 0;
  let prev = -1; // the previous point steps 1 and 2 kept (step 3 compares with it)
  let vPrev = Number.NaN;
  let hPrev = Number.NaN;
  for (let i = 0; i < n; i++) {
    // 1. Sort and drop repeated times.
    const ti = t[i];
    if (!Number.isFinite(ti) || (i > 0 && ti === t[i - 1])) {
      removedBy[i] = SORT_DEDUPE;
      continue;
    }
    // 2. Work off.
    if ((workOn && workOn[i] === 0) || (sectionsOn && sectionsOn[i] === 0)) {
      removedBy[i] = WORK_OFF;
      continue;
    }
    // 3. Speed: range, then acceleration against the previous point the steps before kept (loggedSpeedAt).
    let v = gnssMps ? gnssMps[i] : Number.NaN;
    if (!Number.isFinite(v)) {
      v = speedMps ? speedMps[i] : Number.NaN;
      if (!Number.isFinite(v)) {
        v = wheelMps ? wheelMps[i] : Number.NaN;
        if (!Number.isFinite(v)) v = Number.NaN;
      }
    }
    const dt = prev >= 0 ? ti - t[prev] : Number.NaN;
    if (Number.isNaN(v) && prev >= 0) v = pointDistanceM(s, scale, prev, i) / dt;
    const fast = v < minSpeedMps || v > maxSpeedMps || (dt > 0 && Math.abs(v - vPrev) / dt > maxAccelMps2);
    prev = i;
    vPrev = v;
    if (fast) {
      removedBy[i] = SPEED;
      continue;
    }
    // 4. Turns, and where a pass starts (a gap), against the previous point steps 1–3 kept.
    const q = m++;
    seq[q] = i;
    let h = heading ? heading[i] : Number.NaN;
    if (q === 0) {
      newPass[q] = 1;
      hPrev = h;
      continue;
    }
    const p = seq[q - 1];
    const dtq = ti - t[p];
    if (dtq > passGapS) {
      newPass[q] = 1;
      hPrev = h; // the logged heading, never a course across the gap
      continue;
    }
    if (Number.isNaN(h)) {
      // bearingDeg(p, i), inline.
      const dx = (lon[i] - lon[p]) * scale.lon;
      const dy = (lat[i] - lat[p]) * scale.lat;
      h = dx * dx + dy * dy > 1e-6 ? (Math.atan2(dx, dy) * 180) / Math.PI : Number.NaN;
    }
    if (Math.abs(headingDiff(h, hPrev)) / dtq > turnDegPerS) turn[q] = 1;
    hPrev = h;
  }

  // 4. Pass ends: turn points, and the first and last seconds of each pass.
  {
    let q = 0;
    while (q < m) {
      if (turn[q]) {
        removedBy[seq[q]] = PASS_ENDS;
        q++;
        continue;
      }
      // A pass: from q to the point before the next turn or new pass.
      let e = q;
      while (e + 1 < m && !turn[e + 1] && !newPass[e + 1]) e++;
      const t0 = t[seq[q]];
      const t1 = t[seq[e]];
      for (let k = q; k <= e; k++) {
        const tk = t[seq[k]];
        if (tk - t0 < settings.trimPassStartS || t1 - tk < settings.trimPassEndS) {
          removedBy[seq[k]] = PASS_ENDS;
        }
      }
      q = e + 1;
    }
  }

  // 5. Window after each change of target; 6. plausibility of applied ÷ target; 7. outside the boundary.
  const { target, applied } = s;
  const afterChange = settings.afterTargetChangeS;
  const { plausibleRatioMin, plausibleRatioMax } = settings;
  const clip = z !== null && settings.clipToBoundary;
  let last = Number.NaN;
  let changedAt = -Infinity;
  for (let i = 0; i < n; i++) {
    let r = removedBy[i];
    if (r === SORT_DEDUPE) continue;
    if (afterChange > 0) {
      const v = target[i];
      if (Number.isFinite(v)) {
        if (Number.isFinite(last) && Math.abs(v - last) > 1e-9 * Math.max(Math.abs(v), Math.abs(last))) {
          changedAt = t[i];
        }
        last = v;
      }
      if (!r && t[i] - changedAt < afterChange) r = TARGET_CHANGE;
    }
    if (!r) {
      const ratio = applied[i] / target[i];
      if (!(ratio >= plausibleRatioMin && ratio <= plausibleRatioMax)) r = PLAUSIBILITY;
      else if (clip && z[i] === OUTSIDE) r = BOUNDARY;
    }
    removedBy[i] = r;
  }

  const keep = new Uint8Array(n);
  const removed = new Array<number>(CLEANING_STEPS.length).fill(0);
  for (let i = 0; i < n; i++) {
    if (removedBy[i]) removed[removedBy[i] - 1]++;
    else keep[i] = 1;
  }
  const text = cleaningSettingText(settings, z !== null);
  const report: CleaningReport = CLEANING_STEPS.map((step, k) => ({
    step,
    label: CLEANING_STEP_LABELS[step],
    setting: text[step],
    removed: removed[k],
  }));
  return { columns: s, zone: z, keep, removedBy, report };
}
