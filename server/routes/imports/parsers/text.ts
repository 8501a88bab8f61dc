import { FileReadError } from '../import-errors';

/** The file's text as UTF-8 (a byte-order mark dropped); refuses bytes that are not text. */
export function decodeText(bytes: Uint8Array, what: string): string {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    // Not UTF-8: read it as Latin-1, which every byte is (older exports).
    text = new TextDecoder('latin1').decode(bytes);
  }
  if (text.includes('\u0000')) throw new FileReadError(`The ${what} holds binary data, not text`);
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** 1-based line number of a character offset. */
export function lineAt(text: string, offset: number): number {
  let line = 1;
  for (let i = 0; i < offset && i < text.length; i++) if (text.charCodeAt(i) === 10) line++;
  return line;
}
