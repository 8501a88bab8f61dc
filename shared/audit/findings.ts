import { type RateUnit, formatRate } from '../rates/rate-units';
import type { AuditResult, AuditStats, Finding } from '../schemas/as-applied.schema';
import { type UnitSystem, areaToDisplay, areaUnitLabel } from '../units';

/**
 * The audit in plain sentences (one finding, one sentence), figures in the reader's units. Severity against the
 * tolerance band b: an error over b/2 is a problem, over b/4 a notice, less is information.
 */

export type FindingsContext = {
  rateUnit: RateUnit;
  unitSystem: UnitSystem;
  /** What the product comes in, plural: "units", "bags". */
  unitName: string;
  /** ISO 4217 code for money, e.g. "USD". */
  currency: string;
  productKind: 'seed' | 'other';
  locale?: string;
};

/** Below this population error (fraction) the speed source changed nothing worth a sentence. */
export const SPEED_ERROR_NEGLIGIBLE = 0.005;
/** A zone smaller than this share of the audited area gets no sentence of its own. */
const MIN_ZONE_SHARE = 0.01;
/** More zones off than this get one summary sentence and only the farthest few named. */
const MAX_ZONE_SENTENCES = 5;
const ZONES_NAMED_WITH_SUMMARY = 3;

type Severity = Finding['severity'];

const pct = (fraction: number) => `${(Math.abs(fraction) * 100).toFixed(1)} %`;

function severityOf(errorFraction: number, band: number): Severity {
  const e = Math.abs(errorFraction);
  if (e > band / 2) return 'problem';
  if (e > band / 4) return 'notice';
  return 'info';
}

function money(amount: number, currency: string, locale: string): string {
  try {
    return new Intl.NumberFormat(locale, { style: 'currency', currency, maximumFractionDigits: 0 }).format(
      Math.abs(amount),
    );
  } catch {
    return `${Math.round(Math.abs(amount)).toLocaleString(locale)} ${currency}`;
  }
}

function units(count: number, name: string, locale: string): string {
  const v = Math.abs(count);
  const digits = v < 10 ? 1 : 0;
  const shown = v.toLocaleString(locale, { maximumFractionDigits: digits, minimumFractionDigits: 0 });
  // "1 unit", "5.4 units", "2 boxes" (English plural of the purchase unit's name).
  const plural =
    shown === '1' || /s$/.test(name) ? name : /(x|z|ch|sh)$/.test(name) ? `${name}es` : `${name}s`;
  return `${shown} ${plural}`;
}

function area(m2: number, ctx: FindingsContext): string {
  const v = areaToDisplay(m2, ctx.unitSystem);
  return `${v.toLocaleString(ctx.locale ?? 'en-US', { maximumFractionDigits: 1 })} ${areaUnitLabel(ctx.unitSystem)}`;
}

const SOURCE_WORDS = { wheel: 'wheel speed', radar: 'radar speed', gnss: 'GNSS speed' } as const;

/** The findings of an audit, most important first. */
export function findingsOf(r: Omit<AuditResult, 'findings'>, ctx: FindingsContext): Finding[] {
  const locale = ctx.locale ?? 'en-US';
  const band = r.bandFraction;
  const bandText = `±${Math.round(band * 1000) / 10} %`;
  const what = ctx.productKind === 'seed' ? 'seed' : 'product';
  const done = ctx.productKind === 'seed' ? 'planted' : 'applied';
  const out: Finding[] = [];
  const add = (kind: Finding['kind'], severity: Severity, text: string, zoneId: string | null = null) =>
    out.push({ kind, severity, text, zoneId });

  if (!(r.field.areaM2 > 0)) {
    add('coverage', 'problem', `No ${done} points were left after cleaning, so there is nothing to audit.`);
    return out;
  }

  // Speed source (DOMAIN.md §5).
  const sp = r.speed;
  if (sp && sp.meteredOn !== 'gnss' && Math.abs(sp.populationError) >= SPEED_ERROR_NEGLIGIBLE) {
    const moreLess = sp.populationError > 0 ? 'more' : 'less';
    const cost = sp.costHidden === null ? '' : `, ${money(sp.costHidden, ctx.currency, locale)}`;
    // Hidden seed is never mere information: at least a notice.
    const sev = severityOf(sp.populationError, band);
    add(
      'speed-source',
      sev === 'info' ? 'notice' : sev,
      `The planter metered on ${SOURCE_WORDS[sp.meteredOn]}: about ${pct(sp.populationError)} ${moreLess} ` +
        `${what} than the log shows, ${units(sp.unitsHidden, ctx.unitName, locale)}${cost}.`,
    );
    add('note', 'info', 'The logged rate hides this: the controller believed it applied the target.');
    if (sp.areaSlipOver5PctM2 > 0) {
      const where = `on ${area(sp.areaSlipOver5PctM2, ctx)} of ${area(r.field.areaM2, ctx)}`;
      add(
        'speed-source',
        'info',
        sp.meteredOn === 'wheel' && sp.meanSlip >= 0
          ? `Wheel slip averaged ${pct(sp.meanSlip)} and passed 5 % ${where}.`
          : `The ${sp.meteredOn} read ${pct(sp.meanSlip)} ${sp.meanSlip > 0 ? 'fast' : 'slow'} against GNSS ` +
              `on average, and more than 5 % off ${where}.`,
      );
    }
  } else if (sp && sp.meteredOn === 'gnss' && Math.abs(sp.meanSlip) >= 0.005) {
    add(
      'speed-source',
      'info',
      `The planter metered on GNSS speed, so wheel slip (${pct(sp.meanSlip)} on average) did not change the rate.`,
    );
  } else if (sp) {
    add(
      'speed-source',
      'info',
      `The planter metered on ${SOURCE_WORDS[sp.meteredOn]}, which agreed with GNSS speed to within ` +
        `${pct(SPEED_ERROR_NEGLIGIBLE)}: the logged rate stands.`,
    );
  }

  // Over the field: the logged rate, then the corrected one.
  const fieldSentence = (s: AuditStats, lead: string) => {
    const b = s.biasPct / 100;
    const dir = Math.abs(b) < 0.0005 ? 'on' : b > 0 ? `${pct(b)} above` : `${pct(b)} below`;
    return (
      `${lead} ${dir} target over the field; ${Math.round(s.inBandShare * 100)} % of the ${done} area ` +
      `was within ${bandText}.`
    );
  };
  const corrected =
    r.fieldTrue !== null && sp !== null && Math.abs(sp.populationError) >= SPEED_ERROR_NEGLIGIBLE;
  add(
    'bias',
    corrected ? 'info' : severityOf(r.field.biasPct / 100, band),
    fieldSentence(r.field, corrected ? 'The log shows applied' : 'Applied was'),
  );
  if (corrected && r.fieldTrue) {
    add(
      'bias',
      severityOf(r.fieldTrue.biasPct / 100, band),
      fieldSentence(r.fieldTrue, 'Corrected for the speed error, applied was'),
    );
  }

  // Off the band: the truest statistics there are.
  const best = corrected && r.fieldTrue ? r.fieldTrue : r.field;
  const outShare = 1 - best.inBandShare;
  if (outShare > 0.1) {
    add(
      'out-of-band',
      outShare > 0.25 ? 'problem' : 'notice',
      `${Math.round(outShare * 100)} % of the ${done} area was more than ${bandText.slice(1)} off target: ` +
        `${area(best.areaOverM2, ctx)} over and ${area(best.areaUnderM2, ctx)} under.`,
    );
  }

  // Zones: each one off target, or, when many are, a summary and the farthest few.
  const offZones: { z: (typeof r.zones)[number]; s: AuditStats; e: number; sev: Severity }[] = [];
  for (const z of r.zones) {
    const s = corrected && z.statsTrue ? z.statsTrue : z.stats;
    if (!(s.areaM2 > 0)) {
      add('coverage', 'notice', `No ${done} points of the cleaned log fell in ${z.name}.`, z.zoneId);
      continue;
    }
    if (s.areaM2 < MIN_ZONE_SHARE * best.areaM2) continue;
    const e = s.biasPct / 100;
    const sev = severityOf(e, band);
    if (sev !== 'info') offZones.push({ z, s, e, sev });
  }
  const why = corrected ? ', corrected for the speed error' : '';
  let listed = offZones;
  if (offZones.length > MAX_ZONE_SENTENCES) {
    const es = offZones.map((o) => o.e);
    const lo = Math.min(...es);
    const hi = Math.max(...es);
    const signed = (e: number) => `${pct(e)} ${e > 0 ? 'more' : 'less'}`;
    const spread =
      lo > 0 || hi < 0
        ? `${pct(lo > 0 ? lo : hi)} to ${signed(lo > 0 ? hi : lo)}`
        : `${signed(lo)} to ${signed(hi)}`;
    add(
      'zone-off',
      offZones.some((o) => o.sev === 'problem') ? 'problem' : 'notice',
      `${offZones.length} of ${r.zones.length} zones were more than ${pct(band / 4)} off target, ` +
        `from ${spread} than prescribed${why ? ` (${why.slice(2)})` : ''}.`,
    );
    listed = [...offZones].sort((a, b) => Math.abs(b.e) - Math.abs(a.e)).slice(0, ZONES_NAMED_WITH_SUMMARY);
  }
  for (const { z, s, e, sev } of listed) {
    add(
      'zone-off',
      sev,
      `${z.name} got ${pct(e)} ${e > 0 ? 'more' : 'less'} than prescribed ` +
        `(${formatRate(s.meanAppliedSi, ctx.rateUnit, locale)} vs ${formatRate(s.meanTargetSi, ctx.rateUnit, locale)}${why}).`,
      z.zoneId,
    );
  }
  return out;
}
