import type { Response } from 'express';

/**
 * Answers a file to download: its media type, a safe file name (made by safeFileName, so ASCII without
 * quotes), never cached. CSV gets a byte-order mark so spreadsheets read it as UTF-8.
 */
export function sendFile(
  res: Response,
  file: { body: Buffer | string; contentType: string; fileName: string },
) {
  const isCsv = file.contentType.startsWith('text/csv');
  res.set('Content-Type', file.contentType);
  res.set('Content-Disposition', `attachment; filename="${file.fileName}"`);
  res.set('Cache-Control', 'no-store');
  res.send(isCsv && typeof file.body === 'string' ? `\uFEFF${file.body}\r\n` : file.body);
}
