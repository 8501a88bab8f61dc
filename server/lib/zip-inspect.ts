import yauzl, { type Entry, type ZipFile } from 'yauzl';
import type { Readable } from 'node:stream';

/** A zip Sowright will not open; the message says why, in words for the person who sent it. */
export class ZipRefusedError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ZipRefusedError';
  }
}

export type ZipLimits = {
  /** Entries in the central directory, folders and skipped entries included. */
  maxEntries: number;
  /** Inflated bytes of one entry we read, declared and counted. */
  maxEntryBytes: number;
  /** Inflated bytes of every entry we read together, declared and counted. */
  maxTotalBytes: number;
  /** Inflated ÷ compressed size of one entry, checked on entries above `ratioFloorBytes`. */
  maxRatio: number;
  ratioFloorBytes: number;
};

/**
 * RELIABILITY.md "Uploads": text-heavy .dbf files reach 45:1 and a zero-filled bomb 1000:1 (measured), so
 * 100:1 lets the first through and stops the second. Entries under 1 MB are exempt from the ratio (they
 * cannot be a bomb by size; the totals still bind). A shapefile's parts stay well inside these sizes.
 */
export const DEFAULT_ZIP_LIMITS: ZipLimits = {
  maxEntries: 20,
  maxEntryBytes: 100 * 1024 * 1024,
  maxTotalBytes: 150 * 1024 * 1024,
  maxRatio: 100,
  ratioFloorBytes: 1024 * 1024,
};

const NESTED_ARCHIVE = /\.(zip|kmz|jar|gz|tgz|tar|bz2|xz|7z|rar|zst)$/i;
const S_IFMT = 0o170000;
const S_IFLNK = 0o120000;

/** Why a name in a zip is refused, or null when it is fine. Names are never used as paths here either. */
export function refuseName(name: string): string | null {
  if (name.length === 0) return 'an entry has no name';
  // eslint-disable-next-line no-control-regex
  if (/[\u0000-\u001f\u007f]/.test(name))
    return `the entry name "${printable(name)}" holds control characters`;
  if (name.includes('\\')) return `the entry name "${printable(name)}" holds a backslash`;
  if (name.startsWith('/') || /^[a-zA-Z]:/.test(name))
    return `the entry "${printable(name)}" has an absolute path`;
  if (name.split('/').includes('..'))
    return `the entry "${printable(name)}" points outside the archive ("..")`;
  if (NESTED_ARCHIVE.test(name)) return `the entry "${printable(name)}" is an archive inside the archive`;
  return null;
}

// eslint-disable-next-line no-control-regex
const printable = (s: string) => s.replace(/[\u0000-\u001f\u007f]/g, '?').slice(0, 80);

const open = (buf: Buffer) =>
  new Promise<ZipFile>((resolve, reject) =>
    yauzl.fromBuffer(
      buf,
      { lazyEntries: true, decodeStrings: false, validateEntrySizes: true, autoClose: true },
      (err, zip) =>
        err || !zip ? reject(new ZipRefusedError('The file is not a readable zip archive')) : resolve(zip),
    ),
  );

function nameOf(entry: Entry): string {
  const raw = entry.fileName as unknown as Buffer;
  return raw.toString((entry.generalPurposeBitFlag & 0x800) !== 0 ? 'utf8' : 'latin1');
}

/**
 * Opens a zip held in memory and inflates only the entries `wanted` picks, after checking the whole
 * directory first: entry count, names (no absolute paths, "..", backslashes, control characters, duplicates,
 * nested archives), symbolic links, encryption, declared sizes and compression ratio. While inflating, bytes
 * are counted on the stream (headers lie) and the stream is cut at the limit. Files are returned by their
 * names in the archive; the caller must never use those names as paths.
 *
 * Throws {@link ZipRefusedError} with a message naming the entry at fault.
 */
export async function readZip(
  buf: Buffer,
  wanted: (name: string) => boolean,
  limits: ZipLimits = DEFAULT_ZIP_LIMITS,
): Promise<{ names: string[]; files: Map<string, Buffer> }> {
  const zip = await open(buf);
  try {
    if (zip.entryCount > limits.maxEntries) {
      throw new ZipRefusedError(
        `The zip holds ${zip.entryCount} entries; at most ${limits.maxEntries} are accepted`,
      );
    }
    const entries = await listEntries(zip);
    const seen = new Set<string>();
    let declaredTotal = 0;
    const chosen: { name: string; entry: Entry }[] = [];
    for (const entry of entries) {
      const name = nameOf(entry);
      const refused = refuseName(name);
      if (refused) throw new ZipRefusedError(`The zip was refused: ${refused}`);
      const key = name.toLowerCase();
      if (seen.has(key))
        throw new ZipRefusedError(`The zip was refused: the name "${printable(name)}" appears twice`);
      seen.add(key);
      if (((entry.externalFileAttributes >>> 16) & S_IFMT) === S_IFLNK) {
        throw new ZipRefusedError(`The zip was refused: "${printable(name)}" is a symbolic link`);
      }
      if (name.endsWith('/') || !wanted(name)) continue;
      if (entry.isEncrypted())
        throw new ZipRefusedError(`"${printable(name)}" is encrypted; send it without a password`);
      checkSize(name, entry.uncompressedSize, entry.compressedSize, limits);
      declaredTotal += entry.uncompressedSize;
      if (declaredTotal > limits.maxTotalBytes) throw new ZipRefusedError(tooLargeTotal(limits));
      chosen.push({ name, entry });
    }
    const files = new Map<string, Buffer>();
    let total = 0;
    for (const { name, entry } of chosen) {
      const data = await inflate(zip, entry, name, limits, limits.maxTotalBytes - total);
      total += data.length;
      if (data.length >= 4 && data.readUInt32LE(0) === 0x04034b50) {
        throw new ZipRefusedError(`The zip was refused: "${printable(name)}" is itself a zip archive`);
      }
      files.set(name, data);
    }
    return { names: entries.map(nameOf), files };
  } finally {
    zip.close();
  }
}

function checkSize(name: string, size: number, compressed: number, limits: ZipLimits) {
  if (size > limits.maxEntryBytes) {
    throw new ZipRefusedError(
      `"${printable(name)}" would inflate to ${mb(size)}; at most ${mb(limits.maxEntryBytes)} per file is accepted`,
    );
  }
  if (size > limits.ratioFloorBytes && size / Math.max(compressed, 1) > limits.maxRatio) {
    throw new ZipRefusedError(
      `"${printable(name)}" is compressed ${Math.round(size / Math.max(compressed, 1))} to 1, more than the ${limits.maxRatio} to 1 a real file reaches: refused as a zip bomb`,
    );
  }
}

const mb = (n: number) => `${(n / 1024 / 1024).toFixed(1)} MB`;
const tooLargeTotal = (limits: ZipLimits) =>
  `The zip's files would inflate to more than ${mb(limits.maxTotalBytes)} together`;

function listEntries(zip: ZipFile): Promise<Entry[]> {
  return new Promise((resolve, reject) => {
    const out: Entry[] = [];
    zip.on('entry', (e: Entry) => {
      out.push(e);
      zip.readEntry();
    });
    zip.on('end', () => resolve(out));
    zip.on('error', () =>
      reject(new ZipRefusedError('The zip archive is damaged: its directory cannot be read')),
    );
    zip.readEntry();
  });
}

function inflate(
  zip: ZipFile,
  entry: Entry,
  name: string,
  limits: ZipLimits,
  budget: number,
): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    zip.openReadStream(entry, (err, stream?: Readable) => {
      if (err || !stream)
        return reject(
          new ZipRefusedError(
            `"${printable(name)}" cannot be read from the zip (damaged or an unusual compression)`,
          ),
        );
      const chunks: Buffer[] = [];
      let count = 0;
      const fail = (message: string) => {
        stream.destroy();
        reject(new ZipRefusedError(message));
      };
      stream.on('data', (chunk: Buffer) => {
        count += chunk.length;
        // Counted on the stream: a header that understates the size is caught here, before memory fills.
        if (count > entry.uncompressedSize || count > limits.maxEntryBytes) {
          return fail(`"${printable(name)}" inflates to more than its header declares: refused`);
        }
        if (count > budget) return fail(tooLargeTotal(limits));
        if (count > limits.ratioFloorBytes && count / Math.max(entry.compressedSize, 1) > limits.maxRatio) {
          return fail(
            `"${printable(name)}" is compressed more than ${limits.maxRatio} to 1: refused as a zip bomb`,
          );
        }
        chunks.push(chunk);
      });
      stream.on('error', () => fail(`"${printable(name)}" is damaged in the zip and cannot be read`));
      stream.on('end', () => resolve(Buffer.concat(chunks)));
    });
  });
}
