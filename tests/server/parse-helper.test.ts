import { afterAll, describe, expect, it } from 'vitest';
import {
  LogParseError,
  PARALLEL_MIN_BYTES,
  parseLogCsv,
  parseLogCsvParallel,
  parseLogCsvSource,
  readCsvHeader,
  suggestMapping,
} from '../../shared/audit/csv-log';
import { parseRangeInHelper, stopParseHelper } from '../../server/logs/parse-helper';
import { openFileSource } from '../../server/logs/file-source';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';

afterAll(() => stopParseHelper());

/** A CSV log just over the size read by two threads, in shared memory; row `bad` holds a value that does not read. */
function bigLog(bad = -1) {
  const lines = ['time (s),lon,lat,target (seeds/ac),applied (seeds/ac)'];
  for (let i = 0; lines.length * 60 < PARALLEL_MIN_BYTES * 1.2; i++)
    lines.push(
      `${1_800_000_000 + i / 10},${(-93.6 + (i % 5000) * 1e-6).toFixed(9)},${(42 + Math.floor(i / 5000) * 8e-5).toFixed(9)},${i === bad ? '3x' : 32000 + (i % 9) * 125},${31900 + (i % 13) * 20}`,
    );
  const plain = new TextEncoder().encode(`${lines.join('\n')}\n`);
  const bytes = new Uint8Array(new SharedArrayBuffer(plain.length));
  bytes.set(plain);
  const h = readCsvHeader(bytes);
  return { bytes, mapping: suggestMapping(h.columns, h.sample), rows: lines.length - 1 };
}

describe('the second parsing thread', () => {
  it('reads the second half of a log file a piece at a time in a worker: the same columns as one thread', async () => {
    const { bytes, mapping, rows } = bigLog();
    const dir = mkdtempSync(path.join(tmpdir(), 'sowright-pieces-'));
    const file = path.join(dir, 'log.csv');
    writeFileSync(file, bytes);
    const src = openFileSource(file);
    let asked = 0;
    let whole = 0;
    try {
      const two = await parseLogCsvSource(
        src,
        file,
        mapping,
        (job) => {
          asked++;
          return parseRangeInHelper(job);
        },
        () => {
          whole++;
          return bytes;
        },
        { pieceBytes: 256 * 1024 }, // about 20 pieces in each half
      );
      const one = parseLogCsv(bytes, mapping);
      expect([asked, whole]).toEqual([1, 0]);
      expect(two.n).toBe(rows);
      for (const k of ['t', 'lon', 'lat', 'target', 'applied'] as const)
        expect(Buffer.from(two[k].buffer, two[k].byteOffset, rows * 8)).toEqual(
          Buffer.from(one[k].buffer, one[k].byteOffset, rows * 8),
        );
    } finally {
      src.close();
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('reads the second half of a large log in a worker: the same columns as one thread', async () => {
    const { bytes, mapping, rows } = bigLog();
    expect(bytes.length).toBeGreaterThan(PARALLEL_MIN_BYTES);
    let asked = 0;
    const two = await parseLogCsvParallel(bytes, mapping, (job) => {
      asked++;
      return parseRangeInHelper(job);
    });
    const one = parseLogCsv(bytes, mapping);
    expect(asked).toBe(1);
    expect(two.n).toBe(rows);
    expect(
      Buffer.from(two.applied.buffer, two.applied.byteOffset, rows * 8).equals(
        Buffer.from(one.applied.buffer, one.applied.byteOffset, rows * 8),
      ),
    ).toBe(true);
    expect(Array.from(two.lat.subarray(rows - 3))).toEqual(Array.from(one.lat.subarray(rows - 3)));
  });

  it('names the line of a bad value the worker found, as one thread does', async () => {
    const { bytes, mapping, rows } = bigLog(0);
    const late = bigLog(rows - 10);
    const err = await parseLogCsvParallel(late.bytes, late.mapping, parseRangeInHelper).catch(
      (e: Error) => e,
    );
    expect(err).toBeInstanceOf(LogParseError);
    expect((err as LogParseError).line).toBe(rows - 10 + 2); // the header is line 1
    expect(() => parseLogCsv(late.bytes, late.mapping)).toThrow((err as Error).message);
    // The first half's error wins: line 2 (row 0) in a file whose second half is fine.
    const early = await parseLogCsvParallel(bytes, mapping, parseRangeInHelper).catch((e: Error) => e);
    expect((early as LogParseError).line).toBe(2);
  });
});

describe('the pipeline worker warm-up', () => {
  it('runs the whole pipeline on its invented log (outside tests), and nothing under NODE_ENV=test', async () => {
    const { warmUpPipeline } = await import('../../server/logs/pipeline-warm-up');
    const was = process.env.NODE_ENV;
    try {
      process.env.NODE_ENV = 'test';
      const t0 = Date.now();
      await warmUpPipeline();
      expect(Date.now() - t0).toBeLessThan(50); // skipped
      process.env.NODE_ENV = 'production';
      await expect(warmUpPipeline()).resolves.toBeUndefined();
    } finally {
      process.env.NODE_ENV = was;
    }
  });
});
