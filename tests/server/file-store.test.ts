import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, existsSync, readdirSync, writeFileSync } from 'node:fs';
import { rm } from 'node:fs/promises';
import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import os from 'node:os';
import path from 'node:path';
import { FileStore } from '../../server/logs/file-store';

const dir = mkdtempSync(path.join(os.tmpdir(), 'sowright-file-store-'));
afterAll(() => rm(dir, { recursive: true, force: true }));

/** Bytes in uneven chunks, as a socket delivers them. */
const chunked = (bytes: Buffer, sizes: number[]) => {
  const parts: Buffer[] = [];
  let at = 0;
  for (let k = 0; at < bytes.length; k++) {
    const n = sizes[k % sizes.length];
    parts.push(bytes.subarray(at, at + n));
    at += n;
  }
  return Readable.from(parts);
};

describe('streaming an upload to the file store', () => {
  const store = new FileStore(dir);
  const bytes = Buffer.from(
    Array.from({ length: 5000 }, (_, i) => `${i},${(i * 0.37).toFixed(2)}\n`).join(''),
  );
  const sha256 = createHash('sha256').update(bytes).digest('hex');

  it('hashes, counts and keeps the head while writing; adopts the file at its content address', async () => {
    const got = await store.receive(chunked(bytes, [7, 1000, 3, 65536]), 1024);
    expect(got.sha256).toBe(sha256);
    expect(got.sizeBytes).toBe(bytes.length);
    expect(Buffer.from(got.head).equals(bytes.subarray(0, 1024))).toBe(true);
    expect(existsSync(got.tmp)).toBe(true);
    await store.adopt(got);
    expect(existsSync(got.tmp)).toBe(false);
    expect((await store.read(sha256)).equals(bytes)).toBe(true);
  });

  it('drops the second copy of the same bytes, and a refused upload', async () => {
    const again = await store.receive(chunked(bytes, [4096]));
    await store.adopt(again);
    expect(existsSync(again.tmp)).toBe(false);
    const refused = await store.receive(chunked(Buffer.from('time,lat\n'), [3]));
    await store.discard(refused.tmp);
    expect(readdirSync(path.join(dir, 'log-files', 'incoming'))).toEqual([]);
    expect((await store.read(sha256)).equals(bytes)).toBe(true);
  });

  it('never removes a file outside its incoming folder', async () => {
    const outside = path.join(dir, 'keep-me.txt');
    writeFileSync(outside, 'x');
    await store.discard(outside);
    expect(existsSync(outside)).toBe(true);
  });
});

describe('reading a kept log into shared memory', () => {
  it('reads into the buffer of the last log when it is large enough, and never into one still in use', async () => {
    const store = new FileStore(mkdtempSync(path.join(os.tmpdir(), 'sowright-shared-')));
    const big = await store.adopt(await store.receive(Readable.from([Buffer.alloc(300_000, 7)])));
    const small = await store.adopt(await store.receive(Readable.from([Buffer.from('time,lat\n1,2\n')])));
    const first = await store.readShared(big.sha256);
    expect(first.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(first.length).toBe(300_000);
    // Not released yet: another read gets a buffer of its own.
    const other = await store.readShared(small.sha256);
    expect(other.buffer).not.toBe(first.buffer);
    store.releaseShared(first);
    const again = await store.readShared(small.sha256);
    expect(again.buffer).toBe(first.buffer);
    expect(Buffer.from(again).toString()).toBe('time,lat\n1,2\n');
    await rm(store.dir, { recursive: true, force: true });
  });
});
