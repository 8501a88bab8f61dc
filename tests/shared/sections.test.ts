import { describe, expect, it } from 'vitest';
import { countSections, minRowsPerSection } from '../../shared/rates/count-sections';

describe('section count (DOMAIN.md §4)', () => {
  it('a display limited to 16 sections on a 24-row planter needs 2 rows per section (common practice)', () => {
    expect(minRowsPerSection(24, 16)).toBe(2);
    expect(countSections(24, 1)).toBe(24);
    expect(countSections(24, 2)).toBe(12);
  });

  it('rounds a partial last section up: 23 rows at 2 per section are 12 sections (derived)', () => {
    expect(countSections(23, 2)).toBe(12);
  });

  it('refuses nonsense', () => {
    expect(() => countSections(0, 1)).toThrow(RangeError);
    expect(() => countSections(24, 0)).toThrow(RangeError);
    expect(() => countSections(24, 1.5)).toThrow(RangeError);
    expect(() => minRowsPerSection(24, 0)).toThrow(RangeError);
  });
});
