import { describe, expect, it } from 'vitest';
import { diagnosticFindings } from '../../shared/audit/diagnostic-findings';
import type { Diagnostics } from '../../shared/schemas/as-applied.schema';
import { acToM2, mphToMps } from '../../shared/units';
import { rateToSi } from '../../shared/rates/rate-units';

const ctx = { rateUnit: 'seeds/ac' as const, unitSystem: 'imperial' as const, productKind: 'seed' as const };
const replay = (delayS: number, count: number, unreportedTimeS: number, unreportedAreaM2: number) => ({
  bandFraction: 0.15,
  delayS,
  alarms: [],
  count,
  outOfBandTimeS: 100,
  outOfBandAreaM2: acToM2(3),
  unreportedTimeS,
  unreportedAreaM2,
});
const empty: Diagnostics = {
  alarms: [replay(2, 0, 0, 0), replay(30, 0, 0, 0)],
  lag: null,
  discLimit: null,
  rows: [],
  coverage: null,
};

describe('diagnostic findings', () => {
  it('says nothing when nothing stands out', () => {
    expect(diagnosticFindings(empty, ctx)).toEqual([]);
  });

  it('compares the two alarm delays with the time and area a long delay leaves unreported', () => {
    const [f] = diagnosticFindings(
      { ...empty, alarms: [replay(2, 12, 20, acToM2(0.2)), replay(30, 1, 1800, acToM2(2.5))] },
      ctx,
    );
    expect(f.kind).toBe('alarm');
    expect(f.text).toBe(
      'With a ±15 % band, 12 alarms would have sounded after 2 s; after 30 s only 1, leaving 30 min (2.5 ac) out of the band with no alarm.',
    );
    expect(f.severity).toBe('notice');
  });

  it('gives the lag in seconds and the distance at the old rate in feet (DOMAIN.md §6: 5 mph × 3 s = 6.706 m)', () => {
    const metres = mphToMps(5) * 3; // 6.7056 m, derived
    const [f] = diagnosticFindings(
      {
        ...empty,
        lag: {
          transitions: 40,
          latencyS: 3,
          spreadS: 0.4,
          metresAtOldRate: metres,
          areaAffectedM2: acToM2(1.5),
          quantityAffected: 1,
          leadS: 3,
          perTransition: [],
        },
      },
      ctx,
    );
    expect(f.kind).toBe('lag');
    expect(f.text).toMatch(
      /about 3\.0 s to follow a change of rate \(40 changes; spread 0\.4 s\): about 22 ft planted at the old rate/,
    ); // 6.7056 / 0.3048 = 22.0 ft
    expect(f.text).toMatch(/1\.5 ac in all/);
  });

  it('names the zone the disc could not keep up in and the speed that would have delivered it, leaving out slivers', () => {
    const zone = (name: string, areaM2: number) => ({
      zoneId: name,
      name,
      targetSi: rateToSi(155_000, 'seeds/ac'),
      areaM2,
      shortfallPct: 8,
      drivenSpeedMps: mphToMps(6.9),
      fastestSpeedMps: mphToMps(3.4),
    });
    const fs = diagnosticFindings(
      { ...empty, discLimit: { zones: [zone('Better ground', acToM2(29)), zone('Lower ground', 40)] } },
      ctx,
    );
    expect(fs).toHaveLength(1);
    expect(fs[0].text).toBe(
      'In Better ground the seed disc was at its top speed: at 6.9 mph it could not reach 155,000 seeds/ac and fell 8.0 % short over 29 ac; at 3.4 mph or slower it would have delivered the rate.',
    );
  });

  it('names a row that stands apart by its number, and the overlap with the section layout that would cut it', () => {
    const fs = diagnosticFindings(
      {
        ...empty,
        rows: [
          {
            kind: 'population',
            rows: [
              { row: 6, mean: 10, robustZ: 0.2, flagged: false },
              { row: 7, mean: 9, robustZ: -7, flagged: true },
            ],
            median: 10,
            mad: 0.1,
            threshold: 3.5,
            uniformity: null,
          },
        ],
        coverage: {
          cellSizeM: 1,
          fieldM2: acToM2(80),
          plantedM2: acToM2(79),
          skippedM2: acToM2(0.2),
          doubleM2: acToM2(4),
          quantityInOverlap: 131_000,
          raster: {
            minLon: 0,
            minLat: 0,
            cellLonDeg: 1,
            cellLatDeg: 1,
            columns: 1,
            rows: 1,
            countsBase64: 'AQ==',
          },
          sectionAdvice: {
            rowsPerSection: 2,
            sections: 12,
            overlapCutM2: acToM2(3),
            withinDisplayLimit: true,
          },
        },
      },
      ctx,
    );
    expect(fs[0].text).toMatch(/^Row 7 stands apart in population: 10\.0 % below the planter's median/);
    expect(fs[1].text).toBe(
      '4.0 ac planted twice (about 131,000 seeds put down a second time) and 0.2 ac of the field skipped. Sections of 2 rows (12 sections, within the display’s limit) would have cut the overlap by 3.0 ac.',
    );
  });
});
