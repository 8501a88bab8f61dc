import type { Diagnostics, Finding } from '../schemas/as-applied.schema';
import { formatRate, type RateUnit } from '../rates/rate-units';
import { m2ToAc, m2ToHa, mpsToKmh, mpsToMph, type UnitSystem } from '../units';

export type DiagnosticContext = {
  rateUnit: RateUnit;
  unitSystem: UnitSystem;
  productKind: 'seed' | 'other';
  locale?: string;
};

const num = (v: number, digits: number, locale: string) =>
  v.toLocaleString(locale, { maximumFractionDigits: digits, minimumFractionDigits: digits });

function area(m2: number, ctx: DiagnosticContext) {
  const v = ctx.unitSystem === 'imperial' ? m2ToAc(m2) : m2ToHa(m2);
  return `${num(v, v < 10 ? 1 : 0, ctx.locale ?? 'en-US')} ${ctx.unitSystem === 'imperial' ? 'ac' : 'ha'}`;
}
function speed(mps: number, ctx: DiagnosticContext) {
  const v = ctx.unitSystem === 'imperial' ? mpsToMph(mps) : mpsToKmh(mps);
  return `${num(v, 1, ctx.locale ?? 'en-US')} ${ctx.unitSystem === 'imperial' ? 'mph' : 'km/h'}`;
}
function length(m: number, ctx: DiagnosticContext) {
  return ctx.unitSystem === 'imperial'
    ? `${num(m / 0.3048, 0, ctx.locale ?? 'en-US')} ft`
    : `${num(m, 1, ctx.locale ?? 'en-US')} m`;
}
function duration(s: number) {
  if (s < 120) return `${Math.round(s)} s`;
  const min = Math.round(s / 60);
  return min < 120 ? `${min} min` : `${(s / 3600).toFixed(1)} h`;
}

/** Less area than this (a twentieth of a hectare) is the edge of a zone, not a finding. */
const MIN_AREA_M2 = 500;
/** Coverage is worth a sentence when over half a percent of the field was doubled or skipped. */
const COVERAGE_SHARE = 0.005;

const ROW_KIND_WORDS: Record<string, string> = {
  population: 'population',
  singulation: 'singulation',
  load: 'meter load',
  vacuum: 'vacuum',
  spacing: 'seed spacing',
};

/**
 * The diagnostics in plain sentences with their sizes, in the reader's units: what a long alarm delay hid,
 * how late the controller followed rate changes, where the disc could not keep up, rows that stand apart,
 * and double-planted or skipped ground.
 */
export function diagnosticFindings(d: Diagnostics, ctx: DiagnosticContext): Finding[] {
  const out: Finding[] = [];
  const locale = ctx.locale ?? 'en-US';

  const [short, long] = d.alarms;
  if (short && long && (short.count > 0 || long.unreportedAreaM2 >= MIN_AREA_M2)) {
    const band = `±${Math.round(short.bandFraction * 100)} %`;
    const text =
      `With a ${band} band, ${short.count} alarm${short.count === 1 ? '' : 's'} would have sounded after ${short.delayS} s; ` +
      `after ${long.delayS} s only ${long.count}, leaving ${duration(long.unreportedTimeS)} (${area(long.unreportedAreaM2, ctx)}) ` +
      `out of the band with no alarm.`;
    out.push({
      kind: 'alarm',
      severity: long.unreportedAreaM2 > 4 * short.unreportedAreaM2 + 1000 ? 'notice' : 'info',
      text,
      zoneId: null,
    });
  }

  const lag = d.lag;
  if (lag && lag.latencyS != null && lag.latencyS >= 0.75 && lag.metresAtOldRate != null) {
    out.push({
      kind: 'lag',
      severity: lag.latencyS >= 2 ? 'notice' : 'info',
      text:
        `The controller took about ${num(lag.latencyS, 1, locale)} s to follow a change of rate ` +
        `(${lag.transitions} changes; spread ${num(lag.spreadS ?? 0, 1, locale)} s): about ${length(lag.metresAtOldRate, ctx)} ` +
        `planted at the old rate past each zone edge, ${area(lag.areaAffectedM2, ctx)} in all. ` +
        `A controller that changes rate ${num(lag.leadS ?? lag.latencyS, 1, locale)} s ahead of the edge would make up for it.`,
      zoneId: null,
    });
  }

  for (const z of (d.discLimit?.zones ?? []).filter((x) => x.areaM2 >= MIN_AREA_M2)) {
    out.push({
      kind: 'disc-limit',
      severity: 'problem',
      text:
        `In ${z.name} the seed disc was at its top speed: at ${speed(z.drivenSpeedMps, ctx)} it could not reach ` +
        `${formatRate(z.targetSi, ctx.rateUnit, locale)} and fell ${num(z.shortfallPct, 1, locale)} % short over ` +
        `${area(z.areaM2, ctx)}; at ${speed(z.fastestSpeedMps, ctx)} or slower it would have delivered the rate.`,
      zoneId: z.zoneId,
    });
  }

  for (const r of d.rows) {
    for (const row of r.rows.filter((x) => x.flagged)) {
      const pct = r.median !== 0 ? ((row.mean - r.median) / r.median) * 100 : 0;
      out.push({
        kind: 'row',
        severity: 'problem',
        text:
          `Row ${row.row} stands apart in ${ROW_KIND_WORDS[r.kind] ?? r.kind}: ${num(Math.abs(pct), 1, locale)} % ` +
          `${pct < 0 ? 'below' : 'above'} the planter's median. Check that row unit (meter, seed tube, drive) before next season.`,
        zoneId: null,
      });
    }
    if (r.uniformity) {
      const u = r.uniformity;
      out.push({
        kind: 'row',
        severity: u.quality < 90 ? 'notice' : 'info',
        text:
          `Seed spacing: multiples ${num(u.multiples, 1, locale)} %, misses ${num(u.misses, 1, locale)} %, ` +
          `quality of feed ${num(u.quality, 1, locale)} %, precision ${num(u.precision, 1, locale)} % (Kachman & Smith indices).`,
        zoneId: null,
      });
    }
  }

  const cov = d.coverage;
  if (
    cov &&
    (cov.doubleM2 >= COVERAGE_SHARE * cov.fieldM2 || cov.skippedM2 >= COVERAGE_SHARE * cov.fieldM2)
  ) {
    const advice = cov.sectionAdvice;
    const quantity = Math.round(cov.quantityInOverlap).toLocaleString(locale);
    out.push({
      kind: 'coverage',
      severity: cov.doubleM2 > 0.02 * cov.fieldM2 || cov.skippedM2 > 0.02 * cov.fieldM2 ? 'notice' : 'info',
      text:
        `${area(cov.doubleM2, ctx)} planted twice${ctx.productKind === 'seed' ? ` (about ${quantity} seeds put down a second time)` : ''} ` +
        `and ${area(cov.skippedM2, ctx)} of the field skipped.` +
        (advice && advice.overlapCutM2 > 0
          ? ` Sections of ${advice.rowsPerSection} row${advice.rowsPerSection === 1 ? '' : 's'} (${advice.sections} sections` +
            `${advice.withinDisplayLimit ? ', within the display’s limit' : ', more than the display controls'}) would have cut the overlap by ${area(advice.overlapCutM2, ctx)}.`
          : ''),
      zoneId: null,
    });
  }
  return out;
}
