import { closeSync, fstatSync, openSync, readSync } from 'node:fs';
import type { ByteSource } from '../../shared/audit/csv-log';

/** A file read a piece at a time (shared/audit/csv-log.ts parseLogCsvSource); `close` when done. */
export function openFileSource(file: string): ByteSource & { close(): void } {
  const fd = openSync(file, 'r');
  return {
    size: fstatSync(fd).size,
    read: (into, position) => readSync(fd, into, 0, into.length, position),
    close: () => closeSync(fd),
  };
}
