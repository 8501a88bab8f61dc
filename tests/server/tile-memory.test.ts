import { describe, expect, it } from 'vitest';
import { TileMemory } from '../../server/routes/logs/log-tiles';

describe('the tiles kept in memory', () => {
  it('keeps the most recently used within its budget and drops the least recently used first', () => {
    const m = new TileMemory(10);
    const tile = (n: number, fill: number) => Buffer.alloc(n, fill);
    m.set('a', tile(4, 1));
    m.set('b', tile(4, 2));
    expect(m.get('a')?.[0]).toBe(1); // a is now the most recently used
    m.set('c', tile(4, 3)); // 12 bytes > 10: b goes, not a
    expect(m.get('b')).toBeUndefined();
    expect(m.get('a')?.[0]).toBe(1);
    expect(m.get('c')?.[0]).toBe(3);
    // The same key again replaces the tile without counting it twice: a (4) + c (4) fit, nothing goes.
    m.set('c', tile(4, 5));
    expect(m.get('a')?.[0]).toBe(1);
    expect(m.get('c')?.[0]).toBe(5);
    // A tile larger than the whole budget is not kept, and keeps the others.
    m.set('huge', tile(11, 9));
    expect(m.get('huge')).toBeUndefined();
    expect(m.get('a')?.[0]).toBe(1);
  });
});
