import { describe, expect, it } from 'vitest';
import { collectGarbage } from '../../server/logs/collect-garbage';

describe('collectGarbage', () => {
  it('collects what nothing refers to any more, shared memory included', async () => {
    const collected: string[] = [];
    const registry = new FinalizationRegistry<string>((label) => collected.push(label));
    let kept: Float64Array | null = new Float64Array(new SharedArrayBuffer(8 * 1024));
    registry.register(kept, 'columns');
    // Dropped in a function of its own, so no stack slot of this one still holds it.
    (() => {
      const dropped = new Float64Array(new SharedArrayBuffer(8 * 1024));
      registry.register(dropped, 'dropped');
    })();
    for (let i = 0; i < 20 && !collected.includes('dropped'); i++) {
      collectGarbage();
      await new Promise((r) => setTimeout(r, 10)); // finalizers run after the collection, on a later task
    }
    expect(collected).toContain('dropped');
    expect(collected).not.toContain('columns');
    expect(kept.length).toBe(1024);
    kept = null;
  });
});
