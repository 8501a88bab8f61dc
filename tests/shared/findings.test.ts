/**
 * Findings: plain sentences with the figures in the reader's units; severity against the band (over half the
 * band a problem, over a quarter a notice).
 */
import { describe, expect, it } from 'vitest';
import type { MultiPolygon } from 'geojson';
import { auditLog } from '../../shared/audit/audit-log';
import { cleanLog } from '../../shared/audit/clean-log';
import { findingsOf, type FindingsContext } from '../../shared/audit/findings';
import { syntheticLog } from '../../shared/audit/synthetic-log';
import { zoneIndexOf } from '../../shared/audit/zone-join';
import {
  type AuditResult,
  type AuditStats,
  cleaningSettingsSchema,
} from '../../shared/schemas/as-applied.schema';
import { acToM2, perAcToPerM2, perHaToPerM2 } from '../../shared/units';

const IMPERIAL: FindingsContext = {
  rateUnit: 'seeds/ac',
  unitSystem: 'imperial',
  unitName: 'units',
  currency: 'USD',
  productKind: 'seed',
};

function stats(over: Partial<AuditStats>): AuditStats {
  return {
    areaM2: acToM2(80),
    points: 50_000,
    meanTargetSi: perAcToPerM2(34_000),
    meanAppliedSi: perAcToPerM2(34_000),
    biasPct: 0,
    rmseSi: 0,
    cvPct: 4,
    inBandShare: 0.97,
    areaOverM2: 0,
    areaUnderM2: 0,
    quantityDelta: 0,
    unitsDelta: 0,
    costDelta: 0,
    ...over,
  };
}

type Result = Omit<AuditResult, 'findings'>;
const base = (over: Partial<Result> = {}): Result => ({
  bandFraction: 0.15,
  field: stats({}),
  fieldTrue: null,
  zones: [],
  speed: null,
  histogram: [],
  speedSeries: [],
  ...over,
});

const wheelError = {
  meteredOn: 'wheel' as const,
  meanSlip: 0.033,
  populationError: 0.0345,
  quantityHidden: 41 * 80_000,
  unitsHidden: 41,
  costHidden: 11_726,
  areaSlipOver5PctM2: 0,
};

describe('findingsOf', () => {
  it('says how much seed a wheel-metered planter put down beyond the log, in units and money, with a caution', () => {
    const f = findingsOf(
      base({ speed: wheelError, fieldTrue: stats({ biasPct: 3.45, inBandShare: 0.9 }) }),
      IMPERIAL,
    );
    const speed = f.find((x) => x.kind === 'speed-source')!;
    expect(speed.text).toBe(
      'The planter metered on wheel speed: about 3.5 % more seed than the log shows, 41 units, $11,726.',
    );
    expect(speed.severity).toBe('notice'); // under a quarter of ±15 %, but hidden seed is at least a notice
    const note = f.find((x) => x.kind === 'note')!;
    expect(note).toMatchObject({ severity: 'info' });
    expect(note.text).toBe('The logged rate hides this: the controller believed it applied the target.');
    // The logged bias is information; the corrected one is the finding.
    const bias = f.filter((x) => x.kind === 'bias');
    expect(bias.map((b) => b.text)).toEqual([
      'The log shows applied on target over the field; 97 % of the planted area was within ±15 %.',
      'Corrected for the speed error, applied was 3.5 % above target over the field; 90 % of the planted area was within ±15 %.',
    ]);
  });

  it('states the field bias and in-band share', () => {
    const f = findingsOf(base({ field: stats({ biasPct: 2.1, inBandShare: 0.88 }) }), IMPERIAL);
    const bias = f.find((x) => x.kind === 'bias')!;
    expect(bias.text).toBe(
      'Applied was 2.1 % above target over the field; 88 % of the planted area was within ±15 %.',
    );
    expect(bias.severity).toBe('info'); // 2.1 % < 15 % / 4
    expect(f.some((x) => x.kind === 'note')).toBe(false);
    expect(f.some((x) => x.kind === 'out-of-band')).toBe(true); // 12 % of the area out of band > 10 %
  });

  it('names a zone far off target in the reader’s rate unit, with the severity by the band', () => {
    const zone = (biasPct: number) => ({
      zoneId: 'z1',
      name: 'Better ground',
      targetSi: perAcToPerM2(35_100),
      stats: stats({
        areaM2: acToM2(20),
        meanTargetSi: perAcToPerM2(35_100),
        meanAppliedSi: perAcToPerM2(35_100 * (1 + biasPct / 100)),
        biasPct,
      }),
      statsTrue: null,
    });
    const off = findingsOf(base({ zones: [zone(-6.2)] }), IMPERIAL).find((x) => x.kind === 'zone-off')!;
    expect(off.text).toBe(
      'Better ground got 6.2 % less than prescribed (32,924 seeds/ac vs 35,100 seeds/ac).',
    );
    expect(off.severity).toBe('notice');
    expect(off.zoneId).toBe('z1');
    expect(
      findingsOf(base({ zones: [zone(-8)] }), IMPERIAL).find((x) => x.kind === 'zone-off')!.severity,
    ).toBe(
      'problem', // 8 % > 15 % / 2
    );
    expect(findingsOf(base({ zones: [zone(3)] }), IMPERIAL).some((x) => x.kind === 'zone-off')).toBe(false);
  });

  it('many zones off: one summary sentence, then the three farthest by name', () => {
    const zones = [4, 5, 6, -7, 8, 9, 1].map((biasPct, k) => ({
      zoneId: `z${k}`,
      name: `Zone ${k + 1}`,
      targetSi: perAcToPerM2(34_000),
      stats: stats({
        areaM2: acToM2(10),
        meanAppliedSi: perAcToPerM2(34_000 * (1 + biasPct / 100)),
        biasPct,
      }),
      statsTrue: null,
    }));
    const f = findingsOf(base({ zones }), IMPERIAL).filter((x) => x.kind === 'zone-off');
    // Six of seven are over 15 % / 4 = 3.75 % off; 8 % and 9 % are over half the band (by hand).
    expect(f[0]).toMatchObject({ severity: 'problem', zoneId: null });
    expect(f[0].text).toBe(
      '6 of 7 zones were more than 3.8 % off target, from 7.0 % less to 9.0 % more than prescribed.',
    );
    expect(f.slice(1).map((x) => x.zoneId)).toEqual(['z5', 'z4', 'z3']);
  });

  it('a radar reading off GNSS is not called wheel slip', () => {
    const f = findingsOf(
      base({
        speed: {
          ...wheelError,
          meteredOn: 'radar',
          meanSlip: -0.031,
          populationError: -0.03,
          areaSlipOver5PctM2: 4047,
        },
        fieldTrue: stats({}),
      }),
      IMPERIAL,
    );
    expect(f[0].text).toBe(
      'The planter metered on radar speed: about 3.0 % less seed than the log shows, 41 units, $11,726.',
    );
    expect(f.find((x) => x.text.startsWith('The radar read'))!.text).toBe(
      'The radar read 3.1 % slow against GNSS on average, and more than 5 % off on 1 ac of 80 ac.',
    );
  });

  it('metric units, euros, another product', () => {
    const ctx: FindingsContext = {
      rateUnit: 'seeds/ha',
      unitSystem: 'metric',
      unitName: 'bags',
      currency: 'EUR',
      productKind: 'other',
    };
    const f = findingsOf(
      base({
        speed: { ...wheelError, areaSlipOver5PctM2: 52_000 },
        fieldTrue: stats({}),
        zones: [
          {
            zoneId: 'z2',
            name: 'Low ground',
            targetSi: perHaToPerM2(80_000),
            stats: stats({
              areaM2: 100_000,
              meanTargetSi: perHaToPerM2(80_000),
              meanAppliedSi: perHaToPerM2(70_000),
              biasPct: -12.5,
            }),
            statsTrue: null,
          },
        ],
      }),
      ctx,
    );
    expect(f[0].text).toBe(
      'The planter metered on wheel speed: about 3.5 % more product than the log shows, 41 bags, €11,726.',
    );
    expect(f.find((x) => x.text.startsWith('Wheel slip'))!.text).toBe(
      'Wheel slip averaged 3.3 % and passed 5 % on 5.2 ha of 32.4 ha.', // 80 ac = 32.37 ha (NIST SP 811)
    );
    expect(f.find((x) => x.kind === 'zone-off')!.text).toBe(
      'Low ground got 12.5 % less than prescribed (70,000 seeds/ha vs 80,000 seeds/ha, corrected for the speed error).',
    );
  });

  it('GNSS metering: slip only as information, no caution', () => {
    const f = findingsOf(
      base({ speed: { ...wheelError, meteredOn: 'gnss', populationError: 0, quantityHidden: 0 } }),
      IMPERIAL,
    );
    const s = f.find((x) => x.kind === 'speed-source')!;
    expect(s.severity).toBe('info');
    expect(s.text).toBe(
      'The planter metered on GNSS speed, so wheel slip (3.3 % on average) did not change the rate.',
    );
    expect(f.some((x) => x.kind === 'note')).toBe(false);
  });

  it('an empty audit says so; a zone without points is a coverage notice', () => {
    expect(findingsOf(base({ field: stats({ areaM2: 0, points: 0 }) }), IMPERIAL)).toEqual([
      {
        kind: 'coverage',
        severity: 'problem',
        text: 'No planted points were left after cleaning, so there is nothing to audit.',
        zoneId: null,
      },
    ]);
    const f = findingsOf(
      base({
        zones: [
          {
            zoneId: 'z9',
            name: 'Wet corner',
            targetSi: 8,
            stats: stats({ areaM2: 0, points: 0 }),
            statsTrue: null,
          },
        ],
      }),
      IMPERIAL,
    );
    expect(f.find((x) => x.kind === 'coverage')).toMatchObject({ severity: 'notice', zoneId: 'z9' });
  });
});

describe('findingsOf on a synthetic log', () => {
  it('a zone held back by the disc limit is named with its figures', () => {
    // About 400 m × 300 m at 42° N (invented), with a strip across its middle; corners in degrees.
    const box = (w: number, so: number, e: number, n: number): MultiPolygon => ({
      type: 'MultiPolygon',
      coordinates: [
        [
          [
            [w, so],
            [e, so],
            [e, n],
            [w, n],
            [w, so],
          ],
        ],
      ],
    });
    const field = box(-93.61, 41.99, -93.6052, 41.9927);
    const better = box(-93.6082, 41.989, -93.607, 41.9928);
    const log = syntheticLog({
      boundary: field,
      zones: [{ geometry: better, targetSi: perAcToPerM2(38_000) }],
      defaultTargetSi: perAcToPerM2(32_000),
      faults: { discLimitSi: perAcToPerM2(36_000) },
      seed: 5,
      startTime: 1_760_000_000,
      hz: 1,
      speedMps: 2.5,
      swathM: 12,
    });
    const cleaned = cleanLog(
      log,
      cleaningSettingsSchema.parse({}),
      zoneIndexOf(log.lon, log.lat, [better], field),
    );
    const result = auditLog({
      columns: cleaned.columns,
      keep: cleaned.keep,
      zone: cleaned.zone!,
      zones: [{ zoneId: 'z1', name: 'Better ground', targetSi: perAcToPerM2(38_000) }],
      defaultTargetSi: perAcToPerM2(32_000),
      bandFraction: 0.15,
      fallbackWidthM: 12,
      meteredOn: 'gnss',
      unitSize: 80_000,
      pricePerUnit: 280,
    });
    const f = findingsOf(result, IMPERIAL);
    // 36 000 ÷ 38 000 − 1 = −5.3 % (derived): over a quarter of ±15 %, under half.
    expect(f.find((x) => x.kind === 'zone-off')).toEqual({
      kind: 'zone-off',
      severity: 'notice',
      text: 'Better ground got 5.3 % less than prescribed (36,000 seeds/ac vs 38,000 seeds/ac).',
      zoneId: 'z1',
    });
    // Metered on GNSS with both speeds in the log: slip as information only.
    expect(f.find((x) => x.kind === 'speed-source')!.severity).toBe('info');
    expect(f.some((x) => x.kind === 'note')).toBe(false);
  });

  it('a speed error over half the band is a problem', () => {
    const f = findingsOf(
      base({ speed: { ...wheelError, populationError: 0.111, unitsHidden: 130, costHidden: 36_400 } }),
      IMPERIAL,
    );
    expect(f[0]).toMatchObject({ kind: 'speed-source', severity: 'problem' });
    expect(f[0].text).toBe(
      'The planter metered on wheel speed: about 11.1 % more seed than the log shows, 130 units, $36,400.',
    );
  });
});
