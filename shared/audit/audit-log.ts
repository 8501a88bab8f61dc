import { truePopulation } from '../rates/ground-speed';
import type { AuditResult, AuditStats, SpeedError } from '../schemas/as-applied.schema';
import { localScale, loggedSpeedAt, pointDistanceM } from './clean-log';
import { type LogColumns, SPEED_SOURCE_CODE } from './log-columns';

/**
 * The planting audit (DOMAIN.md §5–§6, DEVELOPERS.md "As-applied logs and the audit"): every figure is weighted
 * by the area a point stands for, never by point count.
 */

/** A pass continues while the next point comes within this many seconds (the default cleaning passGapS). */
export const AREA_PASS_GAP_S = 5;
/** A step implying a speed above this (m/s, the largest cleaning max speed) is a position jump, not travel. */
const MAX_TRAVEL_MPS = 15;
/** Slip above this share counts toward areaSlipOver5PctM2. */
const SLIP_FLAG = 0.05;
/** Ratio histogram: bins of 0.025 from 0.5 to 1.5, plus everything under and everything over. */
const HIST_LO = 0.5;
const HIST_HI = 1.5;
const HIST_STEP = 0.025;
/** The "over" bin is reported up to 10, the largest plausibility limit a cleaning may keep. */
const HIST_TOP = 10;
const MAX_SERIES = 2000;
/** Speed-source codes as local constants (they are read per point). */
const UNKNOWN = SPEED_SOURCE_CODE.unknown;
const WHEEL = SPEED_SOURCE_CODE.wheel;
const RADAR = SPEED_SOURCE_CODE.radar;
const GNSS = SPEED_SOURCE_CODE.gnss;

/** Median of the positive time steps up to `gap` s (from at most about 20 000 evenly spaced steps). */
function medianStep(t: Float64Array, gap: number): number {
  const n = t.length;
  const stride = Math.max(1, Math.floor(n / 20_000));
  const sample: number[] = [];
  for (let i = 0; i + 1 < n; i += stride) {
    const dt = t[i + 1] - t[i];
    if (dt > 0 && dt <= gap) sample.push(dt);
  }
  if (!sample.length) return 1;
  sample.sort((a, b) => a - b);
  return sample[sample.length >> 1];
}

/**
 * The area each point stands for, m²: working width (widthM, else `fallbackWidthM`) × the distance to the next
 * point of the same pass. Distances use a flat local approximation at the log's mean latitude
 * ({@link localScale}). The next point is in the same pass when it comes within `passGapS` seconds and the step
 * does not imply more than 15 m/s; otherwise (the last point of a pass) the distance is the point's logged
 * speed (or the speed from the previous step) × the median time step. Expects the log sorted by time.
 */
export function pointAreas(
  c: LogColumns,
  fallbackWidthM: number,
  opts: { passGapS?: number } = {},
): Float64Array {
  if (!(fallbackWidthM > 0))
    throw new RangeError(`The working width must be positive, got ${fallbackWidthM}`);
  const gap = opts.passGapS ?? AREA_PASS_GAP_S;
  const { n, t, widthM } = c;
  const scale = localScale(c.lat);
  const dtMedian = medianStep(t, gap);
  const area = new Float64Array(n);
  // The speed of the previous step is prevD ÷ prevDt, divided only where a pass end needs it.
  let prevD = Number.NaN;
  let prevDt = Number.NaN;
  for (let i = 0; i < n; i++) {
    const w = widthM && Number.isFinite(widthM[i]) ? Math.max(0, widthM[i]) : fallbackWidthM;
    let d = Number.NaN;
    let dt = Number.NaN;
    if (i + 1 < n) {
      dt = t[i + 1] - t[i];
      if (dt > 0 && dt <= gap) {
        const step = pointDistanceM(c, scale, i, i + 1);
        if (step <= MAX_TRAVEL_MPS * dt) d = step;
      }
    }
    if (Number.isNaN(d)) {
      let v = loggedSpeedAt(c, i);
      if (Number.isNaN(v)) v = prevD / prevDt;
      d = Number.isFinite(v) ? v * dtMedian : 0;
      prevD = Number.NaN;
    } else {
      prevD = d;
      prevDt = dt;
    }
    area[i] = w * d;
  }
  return area;
}

/** The sums kept per group, in this order, side by side in one array. */
const A = 0;
const AT = 1;
const AP = 2;
const AE2 = 3;
const AR = 4;
const AR2 = 5;
const AIN = 6;
const AOVER = 7;
const AUNDER = 8;
const COUNT = 9;
const WIDTH = 10;

/**
 * Area-weighted sums per group: zones 0…G−1, then G for points in no zone, then G + 1 for the field (the sum of
 * all the others, made by {@link Sums.finish}). One write per point.
 */
class Sums {
  readonly s: Float64Array;
  readonly field: number;

  constructor(
    groups: number,
    readonly band: number,
  ) {
    this.field = groups + 1;
    this.s = new Float64Array((groups + 2) * WIDTH);
  }

  /** g: a zone index, or −1 for no zone. */
  add(g: number, area: number, target: number, applied: number) {
    const s = this.s;
    const o = (g >= 0 ? g : this.field - 1) * WIDTH;
    const r = applied / target;
    const e = applied - target;
    s[o + COUNT]++;
    s[o + A] += area;
    s[o + AT] += area * target;
    s[o + AP] += area * applied;
    s[o + AE2] += area * e * e;
    s[o + AR] += area * r;
    s[o + AR2] += area * r * r;
    const off = r - 1;
    s[o + (off > this.band ? AOVER : off < -this.band ? AUNDER : AIN)] += area;
  }

  finish(): this {
    const f = this.field * WIDTH;
    for (let o = 0; o < f; o += WIDTH) for (let k = 0; k < WIDTH; k++) this.s[f + k] += this.s[o + k];
    return this;
  }

  stats(g: number, unitSize: number, price: number | null): AuditStats {
    const s = this.s;
    const o = g * WIDTH;
    const a = s[o + A];
    if (!(a > 0)) {
      return {
        areaM2: 0,
        points: s[o + COUNT],
        meanTargetSi: 0,
        meanAppliedSi: 0,
        biasPct: 0,
        rmseSi: 0,
        cvPct: 0,
        inBandShare: 0,
        areaOverM2: 0,
        areaUnderM2: 0,
        quantityDelta: 0,
        unitsDelta: 0,
        costDelta: price === null ? null : 0,
      };
    }
    const meanT = s[o + AT] / a;
    const meanP = s[o + AP] / a;
    const meanR = s[o + AR] / a;
    const varR = Math.max(0, s[o + AR2] / a - meanR * meanR);
    const quantityDelta = s[o + AP] - s[o + AT];
    const unitsDelta = quantityDelta / unitSize;
    return {
      areaM2: a,
      points: s[o + COUNT],
      meanTargetSi: meanT,
      meanAppliedSi: meanP,
      biasPct: meanT > 0 ? ((meanP - meanT) / meanT) * 100 : 0,
      rmseSi: Math.sqrt(s[o + AE2] / a),
      cvPct: meanR > 0 ? (Math.sqrt(varR) / meanR) * 100 : 0,
      inBandShare: s[o + AIN] / a,
      areaOverM2: s[o + AOVER],
      areaUnderM2: s[o + AUNDER],
      quantityDelta,
      unitsDelta,
      costDelta: price === null ? null : unitsDelta * price,
    };
  }
}

export type AuditInput = {
  /** The cleaned log, sorted by time (cleanLog's columns). */
  columns: LogColumns;
  keep: Uint8Array;
  /** Zone index per point (zoneIndexOf): ≥ 0 a zone of `zones`, −1 in no zone, −2 outside. */
  zone: Int16Array;
  zones: { zoneId: string; name: string; targetSi: number }[];
  /** The prescription's rate outside every zone. */
  defaultTargetSi: number;
  /** Tolerance band as a fraction (0.15 for ±15 %). */
  bandFraction: number;
  fallbackWidthM: number;
  /** What the controller metered on where the log does not say (no speed-source column, or "unknown"). */
  meteredOn: 'wheel' | 'radar' | 'gnss';
  /** Seeds (kg, m³) in one unit of the product. */
  unitSize: number;
  pricePerUnit: number | null;
};

export type AuditOutput = Omit<AuditResult, 'findings'> & {
  /** Applied rate corrected for the speed error per point; null when nothing needs correcting. */
  trueApplied: Float64Array | null;
  area: Float64Array;
};

const SOURCE_BY_CODE: Record<number, 'wheel' | 'radar' | 'gnss' | undefined> = {
  [WHEEL]: 'wheel',
  [RADAR]: 'radar',
  [GNSS]: 'gnss',
};

/**
 * The audit of a cleaned log. Over the kept points, area-weighted ({@link pointAreas}), per zone and for the
 * field: mean target and applied, bias, RMSE, CV of applied ÷ target, share of the area within the band, area
 * over and under it, and the quantity, units and cost more (+) or less (−) than prescribed. The target of a
 * point is its logged target; where that is missing or not positive, the prescription's (its zone's, else
 * `defaultTargetSi`).
 *
 * Speed error (DOMAIN.md §5), when the log has both wheel (or radar) and GNSS speeds: a point metered on wheel
 * or radar (its speed-source column, else `meteredOn`) really got logged × v_wheel / v_gnss
 * ({@link truePopulation}); never logged × (1 + slip). `speed` then gives the area-weighted slip, the population
 * error and the seed the log hides, and `fieldTrue` / `statsTrue` the statistics of the corrected rate.
 * When every kept point was metered on GNSS, the controller used the true speed, so the logged rate stands:
 * `speed` still reports the slip (meteredOn 'gnss', populationError and the hidden quantities 0) as
 * information about the tractor, and `trueApplied`, `fieldTrue` and `statsTrue` are null. Without both speeds
 * `speed` is null too.
 */
export function auditLog(input: AuditInput): AuditOutput {
  const { columns: c, keep, zone, zones, bandFraction, unitSize, pricePerUnit } = input;
  const n = c.n;
  if (keep.length !== n || zone.length !== n) {
    throw new RangeError(
      `keep (${keep.length}) and zone (${zone.length}) must have one entry per point (${n})`,
    );
  }
  if (!(unitSize > 0)) throw new RangeError(`The unit size must be positive, got ${unitSize}`);
  if (!(bandFraction > 0 && bandFraction < 1)) {
    throw new RangeError(`The band must be a fraction between 0 and 1, got ${bandFraction}`);
  }
  const area = pointAreas(c, input.fallbackWidthM);
  const G = zones.length;
  const zoneTarget = zones.map((z) => z.targetSi);
  const { wheelMps: wheel, gnssMps: gnss, speedSource } = c;

  // Which speed each kept point was metered on; the area on each decides `speed.meteredOn`.
  const fallbackCode = SPEED_SOURCE_CODE[input.meteredOn];
  const sourceOf = (i: number) => {
    const code = speedSource ? speedSource[i] : 0;
    return code === UNKNOWN ? fallbackCode : code;
  };
  const areaBySource = new Float64Array(4);
  if (speedSource) {
    for (let i = 0; i < n; i++) if (keep[i] && area[i] > 0) areaBySource[sourceOf(i)] += area[i];
  } else {
    // Every point on the fallback: the same sum, in the same order, without a call per point.
    let sum = 0;
    for (let i = 0; i < n; i++) if (keep[i] && area[i] > 0) sum += area[i];
    areaBySource[fallbackCode] = sum;
  }
  const bothSpeeds = wheel !== null && gnss !== null;
  const correct = bothSpeeds && areaBySource[WHEEL] + areaBySource[RADAR] > 0;
  const trueApplied = correct ? new Float64Array(n).fill(Number.NaN) : null;

  const logged = new Sums(G, bandFraction);
  const corrected = new Sums(G, bandFraction);
  const hist = new Float64Array(Math.round((HIST_HI - HIST_LO) / HIST_STEP) + 2);
  let slipArea = 0;
  let slipSum = 0;
  let slipOver = 0;
  let loggedQ = 0;
  let trueQ = 0;
  for (let i = 0; i < n; i++) {
    if (!keep[i]) continue;
    const a = area[i];
    const z = zone[i];
    const g = z >= 0 && z < G ? z : -1;
    let target = c.target[i];
    if (!(target > 0)) target = g >= 0 ? zoneTarget[g] : input.defaultTargetSi;
    const applied = c.applied[i];
    if (!Number.isFinite(applied) || !(target > 0)) continue;
    logged.add(g, a, target, applied);
    const r = applied / target;
    const bin =
      r < HIST_LO
        ? 0
        : r >= HIST_HI
          ? hist.length - 1
          : Math.min(hist.length - 2, 1 + Math.floor((r - HIST_LO) / HIST_STEP));
    hist[bin] += a;
    if (!bothSpeeds) continue;
    const w = wheel[i];
    const v = gnss[i];
    const speedsOk = w > 0 && v > 0;
    if (speedsOk) {
      slipArea += a;
      const s = 1 - v / w;
      slipSum += a * s;
      if (Math.abs(s) > SLIP_FLAG) slipOver += a;
    }
    if (trueApplied) {
      const src = sourceOf(i);
      const truth = speedsOk && (src === WHEEL || src === RADAR) ? truePopulation(applied, w, v) : applied;
      trueApplied[i] = truth;
      corrected.add(g, a, target, truth);
      loggedQ += a * applied;
      trueQ += a * truth;
    }
  }

  logged.finish();
  corrected.finish();

  let speed: SpeedError | null = null;
  if (bothSpeeds) {
    let main = fallbackCode;
    for (const code of [WHEEL, RADAR, GNSS]) {
      if (areaBySource[code] > areaBySource[main]) main = code;
    }
    const hidden = trueQ - loggedQ;
    const unitsHidden = hidden / unitSize;
    speed = {
      meteredOn: SOURCE_BY_CODE[main] ?? input.meteredOn,
      meanSlip: slipArea > 0 ? slipSum / slipArea : 0,
      populationError: loggedQ > 0 ? trueQ / loggedQ - 1 : 0,
      quantityHidden: hidden,
      unitsHidden,
      costHidden: pricePerUnit === null ? null : unitsHidden * pricePerUnit,
      areaSlipOver5PctM2: slipOver,
    };
  }

  const histogram = Array.from(hist, (areaM2, k) => {
    if (k === 0) return { from: 0, to: HIST_LO, areaM2 };
    if (k === hist.length - 1) return { from: HIST_HI, to: HIST_TOP, areaM2 };
    // Edges from whole multiples (k / 40) so they carry no accumulated round-off.
    return { from: (19 + k) / 40, to: (20 + k) / 40, areaM2 };
  });

  return {
    bandFraction,
    field: logged.stats(logged.field, unitSize, pricePerUnit),
    fieldTrue: trueApplied ? corrected.stats(corrected.field, unitSize, pricePerUnit) : null,
    zones: zones.map((z, k) => ({
      zoneId: z.zoneId,
      name: z.name,
      targetSi: z.targetSi,
      stats: logged.stats(k, unitSize, pricePerUnit),
      statsTrue: trueApplied ? corrected.stats(k, unitSize, pricePerUnit) : null,
    })),
    speed,
    histogram,
    speedSeries: speedSeries(c, input.meteredOn),
    trueApplied,
    area,
  };
}

/**
 * Wheel (or radar) and GNSS speed over the whole log, every point, in at most 2 000 samples: the means of
 * consecutive runs of points. A log with one speed column shows it as the source it was metered on.
 */
function speedSeries(c: LogColumns, meteredOn: 'wheel' | 'radar' | 'gnss') {
  const wheel = c.wheelMps ?? (meteredOn !== 'gnss' ? c.speedMps : null);
  const gnss = c.gnssMps ?? (meteredOn === 'gnss' ? c.speedMps : null);
  if (!wheel && !gnss) return [];
  const per = Math.max(1, Math.ceil(c.n / MAX_SERIES));
  const out: AuditResult['speedSeries'] = [];
  for (let start = 0; start < c.n; start += per) {
    let tS = 0;
    let tN = 0;
    let wS = 0;
    let wN = 0;
    let gS = 0;
    let gN = 0;
    for (let i = start, end = Math.min(c.n, start + per); i < end; i++) {
      if (Number.isFinite(c.t[i])) {
        tS += c.t[i];
        tN++;
      }
      if (wheel && Number.isFinite(wheel[i])) {
        wS += wheel[i];
        wN++;
      }
      if (gnss && Number.isFinite(gnss[i])) {
        gS += gnss[i];
        gN++;
      }
    }
    if (!tN) continue;
    out.push({ t: tS / tN, wheelMps: wN ? wS / wN : null, gnssMps: gN ? gS / gN : null });
  }
  return out;
}
