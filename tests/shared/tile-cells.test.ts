import { describe, expect, it } from 'vitest';
import { CELLS_PER_TILE, CELL_ZOOMS, tileCells, tileXY } from '../../shared/audit/tile-cells';
import { emptyColumns } from '../../shared/audit/log-columns';

describe('tile cells', () => {
  it('puts a point in the slippy-map tile of the usual formula (from memory: x = (lon + 180) / 360 × 2^z)', () => {
    const [x, y] = tileXY(0, 0, 1);
    expect(x).toBeCloseTo(1, 12); // lon 0 is the middle of the world
    expect(y).toBeCloseTo(1, 12); // lat 0 is the middle
    const [x15] = tileXY(-93.6, 42, 15);
    expect(Math.floor(x15)).toBe(Math.floor(((180 - 93.6) / 360) * 32768)); // 7864
    // Northern latitudes lie in smaller y (tiles count from the north).
    expect(tileXY(-93.6, 42.1, 15)[1]).toBeLessThan(tileXY(-93.6, 42, 15)[1]);
  });

  it('averages the kept points of a cell, at every zoom, leaving out removed points and missing values', () => {
    const c = emptyColumns(4, { gnssMps: true });
    // Three points a few centimetres apart (one cell at every zoom up to 18) and one far away.
    const pts = [
      [-93.6, 42.0, 10, 11, 2],
      [-93.6000001, 42.0000001, 10, 13, Number.NaN],
      [-93.6000002, 42.0, 10, 99, 2],
      [-93.5, 42.1, 8, 8, 3],
    ];
    pts.forEach(([lon, lat, target, applied, speed], i) => {
      c.lon[i] = lon;
      c.lat[i] = lat;
      c.target[i] = target;
      c.applied[i] = applied;
      c.gnssMps![i] = speed;
    });
    const keep = Uint8Array.from([1, 1, 0, 1]);
    const cells = tileCells(c, keep, null);
    expect(cells.length).toBe(2 * CELL_ZOOMS.length);
    for (let i = 0; i < cells.length; i++) {
      expect(cells.gx[i]).toBeLessThan(CELLS_PER_TILE);
      expect(cells.gy[i]).toBeLessThan(CELLS_PER_TILE);
      if (cells.n[i] === 2) {
        expect(cells.applied[i]).toBe(12); // (11 + 13) / 2; the removed 99 left out
        expect(cells.speed[i]).toBe(2); // the missing speed left out
        expect(Number.isNaN(cells.appliedTrue[i])).toBe(true);
      } else {
        expect(cells.n[i]).toBe(1);
        expect(cells.applied[i]).toBe(8);
      }
    }
  });
});
