import { describe, expect, it } from 'vitest';
import { hypot } from '../../shared/audit/diag-hypot';
import { seededRandom } from '../../shared/audit/synthetic-log';

describe('hypot', () => {
  it('gives Math.hypot to the last bit, special values included', () => {
    const special = [
      0,
      -0,
      1,
      -1,
      3,
      4,
      Number.NaN,
      Infinity,
      -Infinity,
      5e-324,
      1e-310,
      1e-154,
      1e154,
      Number.MAX_VALUE,
    ];
    for (const x of special)
      for (const y of special) expect(Object.is(hypot(x, y), Math.hypot(x, y))).toBe(true);
  });

  it('gives Math.hypot to the last bit on seeded random steps and on arbitrary bit patterns', () => {
    const random = seededRandom(7);
    const bits = new Float64Array(2);
    const words = new Uint32Array(bits.buffer);
    let differ = 0;
    for (let k = 0; k < 200_000; k++) {
      let x: number;
      let y: number;
      if (k % 2) {
        // Steps of a log in cell units: up to a field's width, down to sub-millimetre.
        const scale = 10 ** Math.floor(random() * 8 - 5);
        [x, y] = [(random() - 0.5) * scale, (random() - 0.5) * 2000];
      } else {
        for (let w = 0; w < 4; w++) words[w] = Math.floor(random() * 2 ** 32);
        [x, y] = [bits[0], bits[1]];
      }
      if (!Object.is(hypot(x, y), Math.hypot(x, y))) differ++;
    }
    expect(differ).toBe(0);
  });
});
