import type { MultiPolygon } from 'geojson';
import { offsetPosition } from '../geo/offset-position';
import { SPEED_SOURCE_CODE, type LogColumns } from './log-columns';

/**
 * Deterministic (seeded) as-applied logs with faults of known size, for tests, the demo and the benchmark.
 * Nothing here is measured: back-and-forth passes over a field, the rate of the zone under each point, and
 * the faults DOMAIN.md §5–§6 describe (wheel slip, controller lag, the disc at its limit, a low row).
 */

export type SyntheticLogOptions = {
  boundary: MultiPolygon;
  /** Zones in order of precedence: a point takes the rate of the first zone holding it. */
  zones: { geometry: MultiPolygon; targetSi: number }[];
  /** The rate where no zone holds the point (and in turns). */
  defaultTargetSi: number;
  /** The planter's working width, m: the distance between passes (less faults.overlapM). */
  swathM: number;
  speedMps: number;
  /** Points per second. */
  hz: number;
  /** Time of the first point, seconds since the Unix epoch. */
  startTime: number;
  seed: number;
  /** false (default): passes run east–west, along parallels; true: north–south, along meridians. */
  headingAlongLat?: boolean;
  faults?: {
    /** Wheel over-reads: v_wheel = v_true / (1 − s) (everywhere, or only inside `where`); the controller meters on the wheel. */
    slip?: { fraction: number; where?: MultiPolygon };
    /** Applied follows the target this many seconds late. */
    lagS?: number;
    /** Applied capped at this rate (the disc at its top speed). */
    discLimitSi?: number;
    /** Per-row population (`rowCount` rows), row `row` at `factor` × the others. */
    lowRow?: { row: number; factor: number; rowCount: number };
    /** Applied noise, coefficient of variation. */
    noiseCv?: number;
    /**
     * Neighbouring passes overlap by this many metres: passes are spaced swathM − overlapM apart (the first
     * still starts swathM / 2 in from the edge). The log then also has a sectionsOn column: 1 (as a fraction
     * of the total: every section on, no automatic section control) where planting, 0 in turns.
     */
    overlapM?: number;
  };
  /** Stop at this many points; a field covered sooner is covered again (time running on) until then. */
  maxPoints?: number;
};

/** Seconds between the end of one pass and the start of the next. */
export const TURN_S = 10;
/** Speed in turns, m/s. */
export const TURN_SPEED_MPS = 1.5;
/** Seconds between one coverage of the field and the next (with maxPoints). */
const COVERAGE_GAP_S = 60;
/** Relative noise of the true ground speed, and the absolute noise of the GNSS speed (m/s): invented. */
const SPEED_CV = 0.01;
const GNSS_NOISE_MPS = 0.005;

/** A small seeded random number generator (mulberry32): the same numbers on every machine. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal numbers from a uniform source (Box–Muller). */
function normal(random: () => number): () => number {
  return () => {
    const u = 1 - random();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
  };
}

/* ------------------------------------------------------------------ WGS84 radii */

const A = 6_378_137;
const F = 1 / 298.257223563;
const E2 = F * (2 - F);
const RAD = Math.PI / 180;
/** Metres per degree along a parallel at latitude `lat` (N cos φ). */
const mPerDegLon = (lat: number) =>
  (A * Math.cos(lat * RAD) * RAD) / Math.sqrt(1 - E2 * Math.sin(lat * RAD) ** 2);
/** Metres per degree along a meridian at latitude `lat` (meridional radius M). */
const mPerDegLat = (lat: number) => (A * (1 - E2) * RAD) / (1 - E2 * Math.sin(lat * RAD) ** 2) ** 1.5;

/* ------------------------------------------------------------------ point in polygon */

/** Even–odd ray casting over every ring (holes and parts included). */
export function inMultiPolygon(lon: number, lat: number, g: MultiPolygon): boolean {
  let inside = false;
  for (const poly of g.coordinates)
    for (const ring of poly)
      for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
        const [xi, yi] = ring[i];
        const [xj, yj] = ring[j];
        if (yi > lat !== yj > lat && lon < xj + ((lat - yj) * (xi - xj)) / (yi - yj)) inside = !inside;
      }
  return inside;
}

/**
 * Where a pass (the line v = const; v latitude for east–west passes, longitude for north–south) crosses the
 * rings of an area: sorted positions along the pass. A point u is inside when an odd number lie below it.
 */
function crossings(g: MultiPolygon, v: number, alongLon: boolean): Float64Array {
  const out: number[] = [];
  for (const poly of g.coordinates)
    for (const ring of poly)
      for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
        const [ui, vi] = alongLon ? ring[i] : [ring[i][1], ring[i][0]];
        const [uj, vj] = alongLon ? ring[j] : [ring[j][1], ring[j][0]];
        if (vi > v !== vj > v) out.push(uj + ((v - vj) * (ui - uj)) / (vi - vj));
      }
  return Float64Array.from(out).sort();
}

/** Whether u is inside, given an area's crossings along the pass (binary search). */
function insideAt(c: Float64Array, u: number): boolean {
  let lo = 0;
  let hi = c.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (c[mid] < u) lo = mid + 1;
    else hi = mid;
  }
  return (lo & 1) === 1;
}

function bboxOf(g: MultiPolygon): [number, number, number, number] {
  let [w, s, e, n] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const poly of g.coordinates)
    for (const [x, y] of poly[0]) {
      w = Math.min(w, x);
      e = Math.max(e, x);
      s = Math.min(s, y);
      n = Math.max(n, y);
    }
  return [w, s, e, n];
}

/* ------------------------------------------------------------------ growable columns */

class Column<T extends Float64Array | Uint8Array> {
  a: T;
  constructor(
    private readonly make: (n: number) => T,
    cap: number,
  ) {
    this.a = make(cap);
  }
  set(i: number, v: number) {
    if (i >= this.a.length) {
      const b = this.make(Math.ceil(this.a.length * 1.5) + 16);
      b.set(this.a);
      this.a = b;
    }
    this.a[i] = v;
  }
  done(n: number): T {
    return this.a.length === n ? this.a : (this.a.slice(0, n) as T);
  }
}

/* ------------------------------------------------------------------ the log */

/** Where and when a pass ended: position along it (u), the line (v), direction (±1), time. */
type PassEnd = { u: number; v: number; dir: number; t: number };

/**
 * A log of back-and-forth passes spaced `swathM` (less faults.overlapM) apart over the boundary's bounding
 * box, one point every 1/hz s at `speedMps` (± 1 % seeded noise), kept only inside the boundary; between
 * passes the time jumps by TURN_S with a few slow (TURN_SPEED_MPS) points outside the boundary marked work
 * off (applied 0). Each point carries the target of the zone holding it and an applied rate with the faults
 * asked for: lag (the target of lagS seconds earlier), noise (noiseCv), the disc limit (min), and slip (the
 * wheel reads v_true / (1 − s); the controller meters on it, so the true population is target / (1 − s) while
 * the LOGGED applied stays at target: the log hides it, DOMAIN.md §5). Wheel and GNSS speeds are both filled;
 * the speed source is the wheel for every point when slip is given, else GNSS. Same options, same arrays.
 */
export function syntheticLog(opts: SyntheticLogOptions): LogColumns {
  const { boundary, zones, defaultTargetSi, swathM, speedMps, hz, startTime, seed } = opts;
  const faults = opts.faults ?? {};
  if (!(swathM > 0) || !(speedMps > 0) || !(hz > 0))
    throw new Error('swathM, speedMps and hz must be positive');
  const overlapM = faults.overlapM ?? 0;
  if (!(overlapM >= 0 && overlapM < swathM))
    throw new Error(`faults.overlapM must be at least 0 and less than swathM (${swathM} m), got ${overlapM}`);
  const spacingM = swathM - overlapM;
  const maxPoints = opts.maxPoints ?? Infinity;
  const alongLon = !opts.headingAlongLat;
  const random = seededRandom(seed);
  const gauss = normal(random);
  const dt = 1 / hz;
  const slip = faults.slip;
  const slipFactor = slip ? 1 / (1 - slip.fraction) : 1;

  const cap = Math.min(Number.isFinite(maxPoints) ? maxPoints : 1 << 16, 1 << 24);
  const f64 = (n: number) => new Float64Array(n);
  const u8 = (n: number) => new Uint8Array(n);
  const col = {
    t: new Column(f64, cap),
    lon: new Column(f64, cap),
    lat: new Column(f64, cap),
    heading: new Column(f64, cap),
    target: new Column(f64, cap),
    wheel: new Column(f64, cap),
    gnss: new Column(f64, cap),
    noise: new Column(f64, cap),
    work: new Column(u8, cap),
  };
  let n = 0;
  const push = (p: {
    t: number;
    lon: number;
    lat: number;
    heading: number;
    target: number;
    v: number;
    slipping: boolean;
    work: number;
  }) => {
    const gGnss = gauss();
    const gApplied = gauss();
    col.t.set(n, p.t);
    col.lon.set(n, p.lon);
    col.lat.set(n, p.lat);
    col.heading.set(n, p.heading);
    col.target.set(n, p.target);
    col.wheel.set(n, p.slipping ? p.v * slipFactor : p.v);
    col.gnss.set(n, p.v + GNSS_NOISE_MPS * gGnss);
    col.noise.set(n, gApplied);
    col.work.set(n, p.work);
    n++;
  };

  const [w, s, e, nn] = bboxOf(boundary);
  const midLat = (s + nn) / 2;
  // Pass k runs along v_k: a latitude (east–west passes, stepped north along the meridian: exact spacing) or
  // a longitude (north–south passes, stepped east along the middle parallel).
  const passV = (k: number) =>
    alongLon
      ? offsetPosition([w, s], 0, swathM / 2 + k * spacingM)[1]
      : w + (swathM / 2 + k * spacingM) / mPerDegLon(midLat);
  const vEnd = alongLon ? nn : e;
  const zoneGeoms = zones.map((z) => z.geometry);
  const zoneBoxes = zoneGeoms.map(bboxOf);

  let t = startTime;
  while (n < maxPoints) {
    const before = n;
    let lastPass = null as PassEnd | null;
    for (let k = 0; n < maxPoints; k++) {
      const v = passV(k);
      if (v > vEnd) break;
      const inField = crossings(boundary, v, alongLon);
      if (inField.length < 2) continue;
      const zc = zones.map((_, z) => {
        const [zw, zs, ze, zn] = zoneBoxes[z];
        const hits = alongLon ? v >= zs && v <= zn : v >= zw && v <= ze;
        return hits ? crossings(zoneGeoms[z], v, alongLon) : null;
      });
      const slipC = slip?.where ? crossings(slip.where, v, alongLon) : null;
      const dir = k % 2 === 0 ? 1 : -1;
      const heading = alongLon ? (dir > 0 ? 90 : 270) : dir > 0 ? 0 : 180;
      const uFirst = dir > 0 ? inField[0] : inField[inField.length - 1];
      const uLast = dir > 0 ? inField[inField.length - 1] : inField[0];
      // The turn from the last pass: slow points outside the field, then the time jumps to this pass.
      if (lastPass) {
        turn(lastPass, v);
        t = lastPass.t + TURN_S;
      }
      let u = uFirst;
      let emitted = false;
      let uPrev = u;
      let tPrev = t;
      for (;;) {
        const vTrue = speedMps * (1 + SPEED_CV * gauss());
        const step = (vTrue * dt) / (alongLon ? mPerDegLon(v) : mPerDegLat(u));
        // The first point half a step inside the field.
        if (!emitted && u === uFirst) u += (dir * step) / 2;
        if (dir > 0 ? u > uLast : u < uLast) break;
        if (insideAt(inField, u)) {
          const [lon, lat] = alongLon ? [u, v] : [v, u];
          let target = defaultTargetSi;
          for (let z = 0; z < zc.length; z++) {
            const c = zc[z];
            if (c && insideAt(c, u)) {
              target = zones[z].targetSi;
              break;
            }
          }
          const slipping = slip ? (slipC ? insideAt(slipC, u) : true) : false;
          push({ t, lon, lat, heading, target, v: vTrue, slipping, work: 1 });
          emitted = true;
          uPrev = u;
          tPrev = t;
          if (n >= maxPoints) break;
        }
        u += dir * step;
        t += dt;
      }
      if (emitted) lastPass = { u: uPrev, v, dir, t: tPrev };
      else if (lastPass)
        lastPass = { u: lastPass.u, v: lastPass.v, dir: lastPass.dir, t: lastPass.t + TURN_S };
    }
    if (n === before) throw new Error('No pass of the synthetic log falls inside the boundary');
    t = (lastPass ? lastPass.t : t) + COVERAGE_GAP_S;
    if (!Number.isFinite(maxPoints)) break;
  }

  /** Slow points of a U-turn from the end of one pass towards the line `vNext`, kept where outside the field. */
  function turn(from: PassEnd, vNext: number) {
    const count = Math.round(TURN_S * hz) - 1;
    const r = swathM / 2;
    const side = Math.sign(vNext - from.v) || 1;
    const startHeading = alongLon ? (from.dir > 0 ? 90 : 270) : from.dir > 0 ? 0 : 180;
    // Turning towards the next pass: left or right depending on direction and side.
    const leftTurn = alongLon ? from.dir > 0 === side > 0 : from.dir > 0 !== side > 0;
    for (let j = 1; j <= count && n < maxPoints; j++) {
      const theta = (Math.PI * j) / (count + 1);
      const forwardM = 3 + r * Math.sin(theta);
      const lateralM = r * (1 - Math.cos(theta));
      const latHere = alongLon ? from.v : from.u;
      const u = from.u + (from.dir * forwardM) / (alongLon ? mPerDegLon(latHere) : mPerDegLat(latHere));
      const vv = from.v + (side * lateralM) / (alongLon ? mPerDegLat(latHere) : mPerDegLon(latHere));
      const [lon, lat] = alongLon ? [u, vv] : [vv, u];
      const vTurn = TURN_SPEED_MPS * (1 + SPEED_CV * gauss());
      if (inMultiPolygon(lon, lat, boundary)) continue;
      const deg = (theta * 180) / Math.PI;
      const heading = (((leftTurn ? startHeading - deg : startHeading + deg) % 360) + 360) % 360;
      push({
        t: from.t + j * dt,
        lon,
        lat,
        heading,
        target: defaultTargetSi,
        v: vTurn,
        slipping: false,
        work: 0,
      });
    }
  }

  /* ---------------------------------------------------------------- the rates */
  const T = col.t.done(n);
  const target = col.target.done(n);
  const work = col.work.done(n);
  const noise = col.noise.done(n);
  const applied = new Float64Array(n);
  const lagS = faults.lagS ?? 0;
  const cv = faults.noiseCv ?? 0;
  const limit = faults.discLimitSi ?? Infinity;
  let j = 0;
  for (let i = 0; i < n; i++) {
    let commanded = target[i];
    if (lagS > 0) {
      const when = T[i] - lagS + 1e-9;
      while (j + 1 < i && T[j + 1] <= when) j++;
      commanded = T[j] <= when ? target[j] : target[0];
    }
    applied[i] = work[i] ? Math.min(commanded * (1 + cv * noise[i]), limit) : 0;
  }
  const rows: LogColumns['rows'] = [];
  const low = faults.lowRow;
  if (low) {
    // The rows average to the logged rate: others x, the low row factor × x, (rowCount − 1 + factor) x = rowCount × applied.
    const others = low.rowCount / (low.rowCount - 1 + low.factor);
    for (let r = 1; r <= low.rowCount; r++) {
      const k = r === low.row ? low.factor * others : others;
      const values = new Float64Array(n);
      for (let i = 0; i < n; i++) values[i] = applied[i] * k;
      rows.push({ row: r, kind: 'population', values });
    }
  }
  return {
    n,
    t: T,
    lon: col.lon.done(n),
    lat: col.lat.done(n),
    heading: col.heading.done(n),
    target,
    applied,
    speedMps: null,
    wheelMps: col.wheel.done(n),
    gnssMps: col.gnss.done(n),
    speedSource: new Uint8Array(n).fill(slip ? SPEED_SOURCE_CODE.wheel : SPEED_SOURCE_CODE.gnss),
    widthM: new Float64Array(n).fill(swathM),
    sectionsOn: faults.overlapM === undefined ? null : Float64Array.from(work),
    workOn: work,
    rows,
  };
}
