import type { RowValueKind } from '../schemas/as-applied.schema';

/**
 * An as-applied log in memory: one typed array per column, never an object per point (PERFORMANCE.md).
 * Everything SI: rates seeds/m² (kg/m², m³/m²), speeds m/s, widths m, time seconds since the Unix epoch.
 */
export const SPEED_SOURCE_CODE = { unknown: 0, wheel: 1, radar: 2, gnss: 3 } as const;
export type SpeedSourceName = Exclude<keyof typeof SPEED_SOURCE_CODE, 'unknown'>;

export type RowColumn = { row: number; kind: RowValueKind; values: Float64Array };

export type LogColumns = {
  n: number;
  t: Float64Array;
  lon: Float64Array;
  lat: Float64Array;
  /** Degrees clockwise from north; NaN where missing. */
  heading: Float64Array | null;
  target: Float64Array;
  applied: Float64Array;
  /** A single "speed" column, when the log has one. */
  speedMps: Float64Array | null;
  wheelMps: Float64Array | null;
  gnssMps: Float64Array | null;
  /** SPEED_SOURCE_CODE per point. */
  speedSource: Uint8Array | null;
  /** Working width in use, m. */
  widthM: Float64Array | null;
  /** Sections or rows on, as logged. */
  sectionsOn: Float64Array | null;
  /** 1 planting, 0 not. */
  workOn: Uint8Array | null;
  rows: RowColumn[];
};

type Optional =
  'heading' | 'speedMps' | 'wheelMps' | 'gnssMps' | 'speedSource' | 'widthM' | 'sectionsOn' | 'workOn';

/** Columns for n points; the optional ones only when asked for (filled with NaN, or 0 for codes). */
export function emptyColumns(
  n: number,
  have: Partial<Record<Optional, boolean>> = {},
  rows: Omit<RowColumn, 'values'>[] = [],
): LogColumns {
  const f = () => new Float64Array(n).fill(Number.NaN);
  return {
    n,
    t: f(),
    lon: f(),
    lat: f(),
    heading: have.heading ? f() : null,
    target: f(),
    applied: f(),
    speedMps: have.speedMps ? f() : null,
    wheelMps: have.wheelMps ? f() : null,
    gnssMps: have.gnssMps ? f() : null,
    speedSource: have.speedSource ? new Uint8Array(n) : null,
    widthM: have.widthM ? f() : null,
    sectionsOn: have.sectionsOn ? f() : null,
    workOn: have.workOn ? new Uint8Array(n) : null,
    rows: rows.map((r) => ({ ...r, values: f() })),
  };
}

function gather<T extends Float64Array | Uint8Array>(a: T, index: Uint32Array): T {
  const out = new (a.constructor as { new (n: number): T })(index.length);
  for (let i = 0; i < index.length; i++) out[i] = a[index[i]];
  return out;
}

/** The points at `index`, in that order (for sorting and keeping). */
export function selectColumns(c: LogColumns, index: Uint32Array): LogColumns {
  const g = <T extends Float64Array | Uint8Array>(a: T | null) => (a ? gather(a, index) : null);
  return {
    n: index.length,
    t: gather(c.t, index),
    lon: gather(c.lon, index),
    lat: gather(c.lat, index),
    heading: g(c.heading),
    target: gather(c.target, index),
    applied: gather(c.applied, index),
    speedMps: g(c.speedMps),
    wheelMps: g(c.wheelMps),
    gnssMps: g(c.gnssMps),
    speedSource: g(c.speedSource),
    widthM: g(c.widthM),
    sectionsOn: g(c.sectionsOn),
    workOn: g(c.workOn),
    rows: c.rows.map((r) => ({ row: r.row, kind: r.kind, values: gather(r.values, index) })),
  };
}

/** Indexes 0…n−1 sorted by time (stable: equal times keep their order). */
export function timeOrder(t: Float64Array): Uint32Array {
  const idx = new Uint32Array(t.length);
  for (let i = 0; i < idx.length; i++) idx[i] = i;
  let sorted = true;
  for (let i = 1; i < t.length; i++) if (t[i] < t[i - 1]) sorted = false;
  if (sorted) return idx;
  return idx.sort((a, b) => t[a] - t[b] || a - b);
}
