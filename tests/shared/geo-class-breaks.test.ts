/**
 * Class breaks, classify and histogram. Golden fixtures live in fixtures/geo/class-breaks/<case>/{in,out}.json;
 * run `REGEN=1 npm test -- --project shared tests/shared/geo-class-breaks.test.ts` to rewrite the out files on
 * purpose (then read the diff).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { type ClassMethod, classBreaks, classify, histogram } from '../../shared/geo/class-breaks';
import { GeoInputError } from '../../shared/geo/geo-input-error';
import { goldenCases } from './geo-golden';

describe('class-breaks golden fixtures', () => {
  goldenCases('class-breaks', (input) => {
    const values = input.values as number[];
    const breaks = classBreaks(values, input.classes as number, input.method as ClassMethod);
    return {
      breaks,
      classes: values.map((v) => classify(v, breaks)),
      histogram: histogram(values, input.bins as number),
    };
  });
});

const GROUPS = [1, 2, 3, 20, 21, 22, 50, 51, 52];

describe('classBreaks', () => {
  it('quantiles of 1..10 into 2 classes break at 5 (derived: five values a class)', () => {
    expect(classBreaks([1, 2, 3, 4, 5, 6, 7, 8, 9, 10], 2, 'quantile')).toEqual([5]);
    expect(classBreaks([9, 1, 8, 2, 7, 3, 6, 4, 5], 3, 'quantile')).toEqual([3, 6]); // derived: three a class
  });

  it('Jenks puts the breaks between obvious groups (derived: the grouping with zero spread between groups)', () => {
    const b = classBreaks(GROUPS, 3, 'jenks');
    expect(b).toEqual([3, 22]);
    expect(GROUPS.map((v) => classify(v, b))).toEqual([0, 0, 0, 1, 1, 1, 2, 2, 2]);
  });

  it('k-means finds the same groups, breaking midway between centres 2, 21 and 51 (derived)', () => {
    expect(classBreaks(GROUPS, 3, 'kmeans')).toEqual([11.5, 36]);
  });

  it('k-means is deterministic and each value sits with its nearest centre', () => {
    const values = Array.from(
      { length: 200 },
      (_, i) => Math.sin(i * 12.9898) * 43758.5453 - Math.floor(Math.sin(i * 12.9898) * 43758.5453),
    );
    const a = classBreaks(values, 4, 'kmeans');
    expect(classBreaks([...values].reverse(), 4, 'kmeans')).toEqual(a);
    expect(a).toHaveLength(3);
    // At a fixed point every break is the midpoint of the means of the classes on either side of it.
    const k = values.map((v) => classify(v, a));
    const mean = (c: number) => {
      const xs = values.filter((_, i) => k[i] === c);
      return xs.reduce((s, x) => s + x, 0) / xs.length;
    };
    a.forEach((b, i) => expect(b).toBeCloseTo((mean(i) + mean(i + 1)) / 2, 9));
  });

  it('Jenks is optimal: no other contiguous grouping has a smaller within-class spread (brute force)', () => {
    const ssd = (xs: number[]) => {
      const m = xs.reduce((s, x) => s + x, 0) / xs.length;
      return xs.reduce((s, x) => s + (x - m) ** 2, 0);
    };
    const cost = (sorted: number[], cuts: number[]) => {
      const edges = [0, ...cuts, sorted.length];
      return edges.slice(1).reduce((s, e, i) => s + ssd(sorted.slice(edges[i], e)), 0);
    };
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.integer({ min: 0, max: 1000 }), { minLength: 4, maxLength: 12 }),
        (values) => {
          const sorted = [...values].sort((a, b) => a - b);
          const breaks = classBreaks(values, 3, 'jenks');
          const cuts = breaks.map((b) => sorted.filter((v) => v <= b).length);
          let best = Infinity;
          for (let i = 1; i < sorted.length; i++)
            for (let j = i + 1; j < sorted.length; j++) best = Math.min(best, cost(sorted, [i, j]));
          expect(cost(sorted, cuts)).toBeCloseTo(best, 6);
        },
      ),
      { numRuns: 100, seed: 3 },
    );
  });

  it('gives fewer breaks when there are fewer distinct values than classes, none for one value', () => {
    expect(classBreaks([1, 1, 1, 2, 2], 4, 'quantile')).toEqual([1]);
    expect(classBreaks([1, 1, 1, 2, 2], 4, 'jenks')).toEqual([1]);
    expect(classBreaks([7, 7, 7], 3, 'kmeans')).toEqual([]);
  });

  it('ignores values that are not finite, and does not mutate its input', () => {
    const values = [NaN, 10, 1, Infinity, 2, 3, 4, 5, 6, 7, 8, 9];
    const copy = [...values];
    expect(classBreaks(values, 2, 'quantile')).toEqual([5]);
    expect(values).toEqual(copy);
  });

  it('refuses no values or a bad class count with GeoInputError', () => {
    expect(() => classBreaks([], 3, 'jenks')).toThrow(GeoInputError);
    expect(() => classBreaks([NaN], 3, 'jenks')).toThrow(GeoInputError);
    expect(() => classBreaks([1, 2], 0, 'quantile')).toThrow(GeoInputError);
    expect(() => classBreaks([1, 2], 2.5, 'quantile')).toThrow(GeoInputError);
  });

  it('handles a large input quickly enough (Jenks samples order statistics)', () => {
    const values = Float64Array.from({ length: 50_000 }, (_, i) => (i % 3) * 100 + (i % 97) / 10);
    const b = classBreaks(values, 3, 'jenks');
    expect(b).toHaveLength(2);
    expect(b[0]).toBeGreaterThanOrEqual(9.6); // derived: the groups are 0–9.6, 100–109.6, 200–209.6
    expect(b[0]).toBeLessThan(100);
    expect(b[1]).toBeGreaterThanOrEqual(109.6);
    expect(b[1]).toBeLessThan(200);
  });
});

describe('classify', () => {
  it('puts a value equal to a break in the lower class, above all breaks in the last, NaN in none', () => {
    const b = [5, 10];
    expect([1, 5, 5.0001, 10, 11].map((v) => classify(v, b))).toEqual([0, 0, 1, 1, 2]);
    expect(classify(NaN, b)).toBe(-1);
    expect(classify(3, [])).toBe(0);
  });
});

describe('histogram', () => {
  it('counts 0..10 in five bins of width 2, the last including the maximum (derived)', () => {
    const h = histogram([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10], 5);
    expect(h.edges).toEqual([0, 2, 4, 6, 8, 10]);
    expect(h.counts).toEqual([2, 2, 2, 2, 3]);
    expect(h.min).toBe(0);
    expect(h.max).toBe(10);
  });

  it('puts equal values in one bin and ignores non-finite values', () => {
    expect(histogram([3, 3, NaN], 4).counts).toEqual([2, 0, 0, 0]);
    expect(histogram([], 4).counts).toEqual([]);
  });
});
