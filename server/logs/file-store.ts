import { createHash, randomUUID } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { mkdir, open, readFile, rename, rm, stat } from 'node:fs/promises';
import type { Readable } from 'node:stream';
import path from 'node:path';

/**
 * A whole file read into shared memory: into `reuse` when it is large enough (a view of the file's length),
 * else into a new SharedArrayBuffer.
 */
export async function readIntoShared(file: string, reuse?: SharedArrayBuffer | null): Promise<Uint8Array> {
  const fh = await open(file, 'r');
  try {
    const { size } = await fh.stat();
    const buffer = reuse && reuse.byteLength >= size ? reuse : new SharedArrayBuffer(size);
    const bytes = new Uint8Array(buffer, 0, size);
    for (let at = 0; at < size;) {
      const { bytesRead } = await fh.read(bytes, at, size - at, at);
      if (bytesRead === 0) throw new Error(`${file} ended at ${at} of ${size} bytes`);
      at += bytesRead;
    }
    return bytes;
  } finally {
    await fh.close();
  }
}

/** An upload streamed to a temporary file (`FileStore.receive`), not yet at its content address. */
export type ReceivedFile = { tmp: string; sha256: string; sizeBytes: number; head: Uint8Array };

/**
 * Log files kept as sent, on disk, named by their SHA-256 (so the same bytes are stored once and a name
 * from the upload never becomes a path). Written to a temporary name, flushed to disk, then renamed: a crash
 * leaves either the whole file or none.
 */
export class FileStore {
  constructor(readonly dir: string) {}

  /** Where the kept file of these bytes is (a CSV log is read from it a piece at a time). */
  pathOf(sha256: string) {
    if (!/^[0-9a-f]{64}$/.test(sha256)) throw new Error('not a SHA-256');
    return path.join(this.dir, 'log-files', sha256.slice(0, 2), sha256);
  }

  /** Stores bytes; answers their SHA-256. */
  async put(bytes: Uint8Array): Promise<{ sha256: string; sizeBytes: number }> {
    const sha256 = createHash('sha256').update(bytes).digest('hex');
    const target = this.pathOf(sha256);
    await mkdir(path.dirname(target), { recursive: true });
    const exists = await stat(target).then(
      (s) => s.size === bytes.byteLength,
      () => false,
    );
    if (!exists) {
      const tmp = `${target}.${randomUUID()}.tmp`;
      const fh = await open(tmp, 'w');
      try {
        await fh.writeFile(bytes);
        await fh.sync();
      } finally {
        await fh.close();
      }
      await rename(tmp, target);
    }
    return { sha256, sizeBytes: bytes.byteLength };
  }

  /**
   * Streams an upload to a temporary file while hashing it, so a large log never sits in memory; keeps its
   * first `headBytes` (the header and sample rows) in memory. The file is flushed to disk before it answers.
   */
  async receive(stream: Readable, headBytes = 256 * 1024): Promise<ReceivedFile> {
    const dir = path.join(this.dir, 'log-files', 'incoming');
    await mkdir(dir, { recursive: true });
    const tmp = path.join(dir, `${randomUUID()}.tmp`);
    const hash = createHash('sha256');
    const head = new Uint8Array(headBytes);
    let headLength = 0;
    let sizeBytes = 0;
    const fh = await open(tmp, 'w');
    try {
      for await (const chunk of stream as AsyncIterable<Buffer>) {
        hash.update(chunk);
        if (headLength < headBytes) {
          const take = chunk.subarray(0, headBytes - headLength);
          head.set(take, headLength);
          headLength += take.length;
        }
        sizeBytes += chunk.length;
        await fh.write(chunk);
      }
      await fh.sync();
    } catch (err) {
      await fh.close().catch(() => {});
      await rm(tmp, { force: true });
      throw err;
    }
    await fh.close();
    return { tmp, sha256: hash.digest('hex'), sizeBytes, head: head.subarray(0, headLength) };
  }

  /** Moves a received file to its content address; the same bytes already kept make it go away instead. */
  async adopt(file: ReceivedFile): Promise<{ sha256: string; sizeBytes: number }> {
    const target = this.pathOf(file.sha256);
    await mkdir(path.dirname(target), { recursive: true });
    const exists = await stat(target).then(
      (s) => s.size === file.sizeBytes,
      () => false,
    );
    if (exists) await rm(file.tmp, { force: true });
    else await rename(file.tmp, target);
    return { sha256: file.sha256, sizeBytes: file.sizeBytes };
  }

  /** Drops a received file that was not adopted (a refused upload). */
  async discard(tmp: string) {
    if (path.dirname(tmp) !== path.join(this.dir, 'log-files', 'incoming')) return;
    await rm(tmp, { force: true });
  }

  /** The buffer the last log was read into, kept for the next (`releaseShared`). */
  private spare: SharedArrayBuffer | null = null;

  /**
   * The file's bytes in shared memory, so the threads that read it share them instead of copying; read into
   * the buffer of the last log when it is large enough, since on these machines the first write to fresh
   * memory costs about 3 ms a megabyte. Give the bytes back with `releaseShared` once nothing reads them.
   */
  async readShared(sha256: string): Promise<Uint8Array> {
    const reuse = this.spare;
    this.spare = null;
    return readIntoShared(this.pathOf(sha256), reuse);
  }

  /** Keeps the buffer of bytes nothing reads any more for the next log (the larger of it and the one kept). */
  releaseShared(bytes: Uint8Array) {
    const b = bytes.buffer;
    if (b instanceof SharedArrayBuffer && (!this.spare || b.byteLength > this.spare.byteLength))
      this.spare = b;
  }

  read(sha256: string): Promise<Buffer> {
    return readFile(this.pathOf(sha256));
  }

  stream(sha256: string) {
    return createReadStream(this.pathOf(sha256));
  }

  async remove(sha256: string) {
    await rm(this.pathOf(sha256), { force: true });
  }
}
