/**
 * Golden fixtures for shared/geo: fixtures/geo/<module>/<case>/in.json is the input, out.json the expected
 * result after rounding every coordinate to 7 decimals (about 1 cm) and every `…M2` area to 0.01 m².
 * Run with `REGEN=1` to rewrite the out.json files on purpose (then read the diff before committing).
 */
import { existsSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect, it } from 'vitest';
import { GeoInputError } from '../../shared/geo/geo-input-error';

const ROOT = fileURLToPath(new URL('../../fixtures/geo', import.meta.url));

/** Rounds to `decimals` places; never returns −0. */
const round = (v: number, decimals: number) => Math.round(v * 10 ** decimals) / 10 ** decimals || 0;

/** Rounds coordinates to 7 decimals and any `…M2` / `…Value` number to 0.01, recursively; typed arrays become arrays. */
export function normaliseGolden(value: unknown, key = ''): unknown {
  if (typeof value === 'number') {
    if (key === 'coordinates') return round(value, 7);
    if (/M2$|Value$/.test(key)) return round(value, 2);
    return Number.isFinite(value) ? value : String(value);
  }
  if (ArrayBuffer.isView(value))
    return normaliseGolden(Array.from(value as unknown as ArrayLike<number>), key);
  if (Array.isArray(value)) return value.map((v) => normaliseGolden(v, key));
  if (value && typeof value === 'object') {
    return Object.fromEntries(
      Object.entries(value).map(([k, v]) => [k, normaliseGolden(v, key === 'coordinates' ? key : k)]),
    );
  }
  return value;
}

/** An error as the golden files record it: its kind, code and place, not its wording. */
function errorShape(e: unknown) {
  if (e instanceof GeoInputError) return { error: { name: e.name, code: e.code, place: e.place } };
  throw e;
}

/** One `it` per case under fixtures/geo/<module>: runs `run(input)` and compares with out.json. */
export function goldenCases(module: string, run: (input: Record<string, unknown>) => unknown) {
  const dir = join(ROOT, module);
  const cases = readdirSync(dir).filter((d) => existsSync(join(dir, d, 'in.json')));
  it('has fixtures', () => expect(cases.length).toBeGreaterThan(0));
  for (const name of cases) {
    it(`matches the golden fixture ${module}/${name}`, () => {
      const input = JSON.parse(readFileSync(join(dir, name, 'in.json'), 'utf8'));
      const frozen = JSON.stringify(input);
      let actual: unknown;
      try {
        actual = normaliseGolden(run(input));
      } catch (e) {
        actual = errorShape(e);
      }
      expect(JSON.stringify(input)).toBe(frozen); // inputs are never mutated
      const outPath = join(dir, name, 'out.json');
      if (process.env.REGEN === '1') writeFileSync(outPath, JSON.stringify(actual, null, 1) + '\n');
      expect(actual).toEqual(JSON.parse(readFileSync(outPath, 'utf8')));
    });
  }
}
