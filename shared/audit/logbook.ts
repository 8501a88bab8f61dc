import type { LogColumns } from './log-columns';

/** What one log adds to its planter's lifetime counters. */
export type LogbookTotals = { areaM2: number; quantity: number; distanceM: number; hours: number };

/** removedBy codes (clean-log.ts: step index + 1) of points the planter did not plant: a repeated time, work off. */
const NOT_PLANTED = new Set([1, 2]);

/**
 * A log's contribution to the planter's lifetime counters, as a monitor counts them: every point the planter
 * was planting (work on), inside the field or not and whatever the audit's cleaning kept. Area is the point
 * areas (swath × distance), quantity the applied rate (corrected for the speed error when known) × area,
 * distance area ÷ width, hours the time between consecutive planting points up to `gapS`.
 */
export function logbookTotals(
  c: LogColumns,
  removedBy: Uint8Array,
  area: Float64Array,
  trueApplied: Float64Array | null,
  fallbackWidthM: number,
  gapS = 5,
): LogbookTotals {
  let areaM2 = 0;
  let quantity = 0;
  let distanceM = 0;
  let seconds = 0;
  let prevT = Number.NaN;
  for (let i = 0; i < c.n; i++) {
    if (NOT_PLANTED.has(removedBy[i])) {
      prevT = Number.NaN;
      continue;
    }
    const a = area[i];
    if (Number.isFinite(a)) {
      areaM2 += a;
      const rate = trueApplied && Number.isFinite(trueApplied[i]) ? trueApplied[i] : c.applied[i];
      if (Number.isFinite(rate)) quantity += rate * a;
      const w = c.widthM && c.widthM[i] > 0 ? c.widthM[i] : fallbackWidthM;
      if (w > 0) distanceM += a / w;
    }
    const dt = c.t[i] - prevT;
    if (dt > 0 && dt <= gapS) seconds += dt;
    prevT = c.t[i];
  }
  return { areaM2, quantity, distanceM, hours: seconds / 3600 };
}
