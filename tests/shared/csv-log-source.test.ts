import { describe, expect, it } from 'vitest';
import {
  LogParseError,
  parseLogCsv,
  parseLogCsvSource,
  parseLogCsvSourceRange,
  readCsvHeader,
  suggestMapping,
  type ByteSource,
  type CsvSourceRangeJob,
} from '../../shared/audit/csv-log';
import { csv } from './csv-log-rows';

// A log read from its file a piece at a time, by two threads, must give exactly what reading the whole file
// gives: values, skipped points and their lines, and the same error (the first line's) — wherever the pieces
// and the halves are cut. Pieces here are tiny (a few hundred bytes) so that every test crosses many cuts.

/** Bytes standing in for a file; `reads` counts the reads that went to it. */
function memorySource(bytes: Uint8Array) {
  const src = {
    reads: 0,
    size: bytes.length,
    read(into: Uint8Array, position: number) {
      src.reads++;
      const part = bytes.subarray(position, position + into.length);
      into.set(part);
      return part.length;
    },
  };
  return src satisfies ByteSource;
}

const MAX_LINE = 200; // pieces of 2 × 200 + 2 bytes: a row is about 80
const opts = { maxLineBytes: MAX_LINE, pieceBytes: 0 };

async function both(
  text: string,
  second?: (job: CsvSourceRangeJob) => Promise<{ n: number; skipped: { count: number; lines: number[] } }>,
) {
  const bytes = new TextEncoder().encode(text);
  const h = readCsvHeader(bytes);
  const mapping = suggestMapping(h.columns, h.sample);
  const src = memorySource(bytes);
  const here = async (job: CsvSourceRangeJob) => parseLogCsvSourceRange(job, memorySource(bytes));
  let wholeReads = 0;
  const whole = () => {
    wholeReads++;
    return bytes;
  };
  const one = (() => {
    try {
      return parseLogCsv(bytes, mapping, { maxLineBytes: MAX_LINE });
    } catch (err) {
      return err as Error;
    }
  })();
  const two = await parseLogCsvSource(src, 'log.csv', mapping, second ?? here, whole, opts).catch(
    (err: Error) => err,
  );
  return { one, two, wholeReads, reads: src.reads };
}

describe('reading a log from its file a piece at a time', () => {
  it('gives the same columns as reading the whole file, without reading it whole', async () => {
    const { one, two, wholeReads, reads } = await both(csv(3001));
    if (one instanceof Error || two instanceof Error) throw new Error('no error expected');
    expect(wholeReads).toBe(0);
    expect(reads).toBeGreaterThan(100); // ~240 kB in pieces of 402 bytes: the cuts fall everywhere
    expect(two.n).toBe(3001);
    for (const k of ['t', 'lon', 'lat', 'target', 'applied', 'gnssMps'] as const)
      expect(Array.from(two[k]!)).toEqual(Array.from(one[k]!));
    expect(two.skipped).toEqual(one.skipped);
  });

  it('closes the gap of blank lines and skipped points, with their line numbers; a last line without a break', async () => {
    const text = csv(2000, (i, line) =>
      i === 10 || i === 1500 ? `\n\r\n${line}` : i === 20 || i === 1900 ? `${1e9 + i},,42.1,1,1,1\n` : line,
    ).replace(/\n$/, '');
    const { one, two } = await both(text);
    if (one instanceof Error || two instanceof Error) throw new Error('no error expected');
    expect(one.skipped.count).toBe(2);
    expect(two.n).toBe(one.n);
    expect(two.skipped).toEqual(one.skipped);
    expect(Array.from(two.t)).toEqual(Array.from(one.t));
    expect(Array.from(two.applied)).toEqual(Array.from(one.applied));
  });

  it('names the same line for a bad value in either half, the first when both have one, and a line too long', async () => {
    const late = await both(csv(2000, (i, line) => (i === 1700 ? line.replace('42.', '4x2.') : line)));
    expect(late.two).toBeInstanceOf(LogParseError);
    expect((late.two as LogParseError).line).toBe(1702); // the header is line 1, row i is line i + 2
    expect((late.two as Error).message).toBe((late.one as Error).message);

    const twice = await both(
      csv(2000, (i, line) => (i === 100 || i === 1700 ? line.replace('42.', '4x2.') : line)),
    );
    expect((twice.two as LogParseError).line).toBe(102);
    expect((twice.two as Error).message).toBe((twice.one as Error).message);

    const long = await both(csv(2000, (i, line) => (i === 1200 ? `${'9'.repeat(450)}${line}` : line)));
    expect(long.one).toBeInstanceOf(LogParseError);
    expect((long.two as LogParseError).line).toBe((long.one as LogParseError).line);
    expect((long.two as Error).message).toBe((long.one as Error).message);
  });

  it('reads a file with a quoted field whole, and whole too when the second thread fails', async () => {
    const quoted = await both(
      csv(2000, (i, line) =>
        i === 1500
          ? line
              .split(',')
              .map((f, k) => (k === 3 ? `"${f}"` : f))
              .join(',')
          : line,
      ),
    );
    expect(quoted.wholeReads).toBe(1);
    if (quoted.one instanceof Error || quoted.two instanceof Error) throw new Error('no error expected');
    expect(Array.from(quoted.two.target)).toEqual(Array.from(quoted.one.target));

    const failed = await both(csv(2000), async () => {
      throw new Error('the worker died');
    });
    expect(failed.wholeReads).toBe(1);
    if (failed.one instanceof Error || failed.two instanceof Error) throw new Error('no error expected');
    expect(Array.from(failed.two.lat)).toEqual(Array.from(failed.one.lat));
  });
});
