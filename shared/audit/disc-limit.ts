import { DEFAULT_LINE_ID, DEFAULT_LINE_NAME } from '../rates/totals';
import { discRpmFor, fastestDeliverableSpeedMps } from '../rates/seed-meter';
import type { DiscLimit } from '../schemas/as-applied.schema';
import { loggedSpeedAt } from './clean-log';
import { quantileSorted } from './controller-lag';
import type { LogColumns } from './log-columns';

/**
 * The disc at its limit (DOMAIN.md §4): where the applied rate fell short because, at the speed driven, the
 * seed disc would have had to turn faster than its top rpm to deliver the target.
 */

/**
 * Per zone, the kept points that fell short at the disc limit: the disc rpm the point's target needed at its
 * driven speed (GNSS, else the logged speed; points without one are passed over) exceeds `discRpmMax`, and the
 * applied rate is below target × (1 − bandFraction / 2). For each zone with such area: the area, the
 * area-weighted mean shortfall (target − applied) / target in %, the median driven speed there, and the fastest
 * speed at which the disc delivers the zone's target. Zone index −1 (in no zone) is reported as the default
 * rate, its target the area-weighted mean target of those points; −2 (outside) is skipped. Sorted by area,
 * largest first. Null when the planter's holes per disc are unknown.
 */
export function discLimitShortfall(
  c: LogColumns,
  keep: Uint8Array,
  zone: Int16Array,
  area: Float64Array,
  zones: { zoneId: string; name: string; targetSi: number }[],
  planter: { rowSpacingM: number; holesPerDisc: number | null; discRpmMax: number },
  bandFraction: number,
): DiscLimit | null {
  const n = c.n;
  if (keep.length !== n || zone.length !== n || area.length !== n) {
    throw new RangeError(
      `keep (${keep.length}), zone (${zone.length}) and area (${area.length}) must have one entry per point (${n})`,
    );
  }
  const holes = planter.holesPerDisc;
  if (holes === null) return null;
  const { rowSpacingM, discRpmMax } = planter;
  if (!(holes > 0)) throw new RangeError(`The holes per disc must be positive, got ${holes}`);
  if (!(rowSpacingM > 0)) throw new RangeError(`The row spacing must be positive, got ${rowSpacingM}`);
  if (!(discRpmMax > 0)) throw new RangeError(`The disc's top speed must be positive, got ${discRpmMax} rpm`);
  if (!(bandFraction > 0 && bandFraction < 1)) {
    throw new RangeError(`The band must be a fraction between 0 and 1, got ${bandFraction}`);
  }

  // Groups 0…G−1 the zones, G the default rate. One pass: sums and counts per group, and the points that fell
  // short (group and speed, in point order; usually few, so no arrays as long as the log). Then the speeds
  // are gathered by group, in point order.
  const G = zones.length;
  const sumArea = new Float64Array(G + 1);
  const sumShort = new Float64Array(G + 1);
  const sumTarget = new Float64Array(G + 1);
  const count = new Int32Array(G + 1);
  let hitGroup = new Int32Array(1024);
  let hitSpeed = new Float64Array(1024);
  let hits = 0;
  const { target, applied } = c;
  const keepShare = 1 - bandFraction / 2;
  for (let i = 0; i < n; i++) {
    const z = zone[i];
    if (!keep[i] || z < -1 || z >= G) continue;
    const tg = target[i];
    const ap = applied[i];
    if (!(tg > 0) || !Number.isFinite(ap) || !(ap < tg * keepShare)) continue;
    const v = loggedSpeedAt(c, i);
    if (!(v > 0) || !(discRpmFor(tg, rowSpacingM, v, holes) > discRpmMax)) continue;
    const g = z === -1 ? G : z;
    if (hits === hitGroup.length) {
      const group = new Int32Array(2 * hits);
      const speed = new Float64Array(2 * hits);
      group.set(hitGroup);
      speed.set(hitSpeed);
      [hitGroup, hitSpeed] = [group, speed];
    }
    hitGroup[hits] = g;
    hitSpeed[hits++] = v;
    const a = area[i];
    sumArea[g] += a;
    sumShort[g] += (a * (tg - ap)) / tg;
    sumTarget[g] += a * tg;
    count[g]++;
  }
  const offset = new Int32Array(G + 2);
  for (let g = 0; g <= G; g++) offset[g + 1] = offset[g] + count[g];
  const speeds = new Float64Array(offset[G + 1]);
  const fill = offset.slice(0, G + 1);
  for (let h = 0; h < hits; h++) speeds[fill[hitGroup[h]]++] = hitSpeed[h];

  const out: DiscLimit['zones'] = [];
  for (let g = 0; g <= G; g++) {
    if (!(sumArea[g] > 0)) continue;
    const own = speeds.subarray(offset[g], offset[g + 1]).sort();
    const zoneTarget = g < G ? zones[g].targetSi : sumTarget[g] / sumArea[g];
    out.push({
      zoneId: g < G ? zones[g].zoneId : DEFAULT_LINE_ID,
      name: g < G ? zones[g].name : DEFAULT_LINE_NAME,
      targetSi: zoneTarget,
      areaM2: sumArea[g],
      shortfallPct: (100 * sumShort[g]) / sumArea[g],
      drivenSpeedMps: quantileSorted(own, 0.5),
      fastestSpeedMps: fastestDeliverableSpeedMps(zoneTarget, rowSpacingM, holes, discRpmMax),
    });
  }
  out.sort((a, b) => b.areaM2 - a.areaM2);
  return { zones: out };
}
