import { createHash, randomUUID } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { mkdir, open, readFile, rename, rm, stat } from 'node:fs/promises';
import path from 'node:path';

/**
 * Log files kept as sent, on disk, named by their SHA-256 (so the same bytes are stored once and a name
 * from the upload never becomes a path). Written to a temporary name, flushed to disk, then renamed: a crash
 * leaves either the whole file or none.
 */
export class FileStore {
  constructor(readonly dir: string) {}

  private pathOf(sha256: string) {
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
