import { afterEach, vi } from 'vitest';

// A console.error during a test is a failure (ARCHITECTURE.md, test hygiene).
const spy = vi.spyOn(console, 'error');
afterEach(() => {
  const calls = spy.mock.calls;
  if (calls.length) {
    const first = calls.map((c) => c.map(String).join(' ')).join('\n');
    spy.mockClear();
    throw new Error(`console.error was called during the test:\n${first}`);
  }
});
