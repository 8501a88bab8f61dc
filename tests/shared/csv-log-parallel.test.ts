import { describe, expect, it } from 'vitest';
import {
  LogParseError,
  parseLogCsv,
  parseLogCsvParallel,
  parseLogCsvRange,
  readCsvHeader,
  suggestMapping,
  type CsvRangeJob,
} from '../../shared/audit/csv-log';
import { csv } from './csv-log-rows';

// The parallel read must give exactly what the one-thread read gives: values, skipped points and their
// lines, and the same error (the first line's) — whatever lies on either side of the split.

/** The bytes in shared memory, as the pipeline reads a file for two threads. */
const sharedBytes = (text: string) => {
  const plain = new TextEncoder().encode(text);
  const b = new Uint8Array(new SharedArrayBuffer(plain.length));
  b.set(plain);
  return b;
};

const mappingOf = (b: Uint8Array) => {
  const h = readCsvHeader(b);
  return suggestMapping(h.columns, h.sample);
};

/** The second thread, run here (what server/logs/parse-helper.ts does in a worker). */
const here = async (job: CsvRangeJob) => parseLogCsvRange(job);
const failing = async () => {
  throw new Error('the worker died');
};

async function both(text: string, second = here) {
  const b = sharedBytes(text);
  const m = mappingOf(b);
  const one = (() => {
    try {
      return parseLogCsv(b, m);
    } catch (err) {
      return err as Error;
    }
  })();
  const two = await parseLogCsvParallel(b, m, second, { minBytes: 0 }).catch((err: Error) => err);
  return { one, two };
}

describe('reading a log with two threads', () => {
  it('gives the same columns as one thread', async () => {
    const { one, two } = await both(csv(5001));
    if (one instanceof Error || two instanceof Error) throw new Error('no error expected');
    expect(two.n).toBe(5001);
    for (const k of ['t', 'lon', 'lat', 'target', 'applied', 'gnssMps'] as const)
      expect(Array.from(two[k]!)).toEqual(Array.from(one[k]!));
    expect(two.skipped).toEqual(one.skipped);
  });

  it('closes the gap left by blank lines and skipped points in the first half, with their line numbers', async () => {
    const text = csv(4000, (i, line) =>
      i === 10 || i === 2500 ? `\n${line}` : i === 20 || i === 3900 ? `${1e9 + i},,42.1,1,1,1\n` : line,
    );
    const { one, two } = await both(text);
    if (one instanceof Error || two instanceof Error) throw new Error('no error expected');
    expect(one.skipped.count).toBe(2);
    expect(two.n).toBe(one.n);
    expect(two.skipped).toEqual(one.skipped);
    expect(Array.from(two.t)).toEqual(Array.from(one.t));
  });

  it('names the same line for a bad value in the second half, and the first line when both halves have one', async () => {
    const late = await both(csv(4000, (i, line) => (i === 3500 ? line.replace('42.', '4x2.') : line)));
    expect(late.one).toBeInstanceOf(LogParseError);
    expect(late.two).toBeInstanceOf(LogParseError);
    expect((late.two as LogParseError).line).toBe((late.one as LogParseError).line);
    expect((late.two as Error).message).toBe((late.one as Error).message);
    // The header is line 1, row i is line i + 2.
    expect((late.two as LogParseError).line).toBe(3502);

    const twice = await both(
      csv(4000, (i, line) => (i === 100 || i === 3500 ? line.replace('42.', '4x2.') : line)),
    );
    expect((twice.two as LogParseError).line).toBe(102);
    expect((twice.two as Error).message).toBe((twice.one as Error).message);
  });

  it('reads the second half itself when the second thread fails, and a file with quotes in one thread', async () => {
    const { one, two } = await both(csv(3000), failing);
    if (one instanceof Error || two instanceof Error) throw new Error('no error expected');
    expect(Array.from(two.lon)).toEqual(Array.from(one.lon));
    let asked = 0;
    const counting = async (job: CsvRangeJob) => {
      asked++;
      return parseLogCsvRange(job);
    };
    const quoted = await both(
      csv(3000, (i, line) =>
        i === 2
          ? line
              .split(',')
              .map((f, k) => (k === 3 ? `"${f}"` : f))
              .join(',')
          : line,
      ),
      counting,
    );
    expect(asked).toBe(0);
    expect(quoted.two).not.toBeInstanceOf(Error);
  });
});
