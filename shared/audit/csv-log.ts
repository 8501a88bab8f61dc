import Papa from 'papaparse';
import {
  LOG_FIELD_LABELS,
  LOG_FIELD_UNITS,
  REQUIRED_LOG_FIELDS,
  type ColumnMapping,
  type LogField,
  type RowValueKind,
} from '../schemas/as-applied.schema';
import { RATE_UNIT_DEFS, type RateUnit } from '../rates/rate-units';
import { M_PER_FT, M_PER_IN, MPS_PER_MPH } from '../units';
import { SPEED_SOURCE_CODE, type LogColumns } from './log-columns';

/**
 * As-applied logs as CSV: the header and a suggested column mapping, the hot-path parse into typed columns
 * (SI), and the writer used by fixtures, the demo and the benchmark.
 *
 * The parse scans the bytes itself: unquoted numbers and ISO times are read without making a string
 * (PERFORMANCE.md asks for our own numeric tokenizer). A line holding a double quote is handed to papaparse,
 * that one line only. Decimal commas are read only in ';'-separated files (where ',' cannot be the
 * separator); thousands separators only inside a quoted value of a ','-separated file ("34,000").
 */

export type CsvDelimiter = ',' | ';' | '\t';

/** A file the parse cannot read, with the 1-based line and the column (null: the whole line). */
export class LogParseError extends Error {
  readonly line: number;
  readonly column: string | null;
  /** What is wrong, without the line. */
  readonly detail: string;
  constructor(line: number, column: string | null, detail: string) {
    super(`line ${groupDigits(line)}: ${detail}`);
    this.name = 'LogParseError';
    this.line = line;
    this.column = column;
    this.detail = detail;
  }
}

/** 1204 → "1 204" (the way the messages print line numbers). */
const groupDigits = (n: number) => String(n).replace(/\B(?=(\d{3})+(?!\d))/g, ' ');

/** A value as it stands in a message: quoted, shortened. */
const shown = (s: string) => `'${s.length > 40 ? `${s.slice(0, 40)}…` : s}'`;

/* ------------------------------------------------------------------ bytes */

const LF = 10;
const CR = 13;
const QUOTE = 34;
const SPACE = 32;
const TAB = 9;
const COMMA = 44;
const SEMI = 59;

const utf8 = new TextDecoder('utf-8');
const utf8Encoder = new TextEncoder();

/** Where the text starts: after a UTF-8 byte order mark; UTF-16 files are refused. */
function textStart(b: Uint8Array): number {
  if (b.length >= 2 && ((b[0] === 0xff && b[1] === 0xfe) || (b[0] === 0xfe && b[1] === 0xff)))
    throw new LogParseError(
      1,
      null,
      'the file is UTF-16 text; save it as UTF-8 (or plain CSV) and try again',
    );
  return b.length >= 3 && b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf ? 3 : 0;
}

/** A record's bytes as text without its line break. */
function recordText(b: Uint8Array, start: number, end: number): string {
  let e = end;
  if (e > start && b[e - 1] === LF) e--;
  if (e > start && b[e - 1] === CR) e--;
  return utf8.decode(b.subarray(start, e));
}

/** True when [start, end) holds nothing but spaces, tabs and line-break bytes. */
function isBlank(b: Uint8Array, start: number, end: number): boolean {
  for (let i = start; i < end; i++) {
    const c = b[i];
    if (c !== SPACE && c !== TAB && c !== CR && c !== LF) return false;
  }
  return true;
}

/**
 * The end (just after its LF, or the file's end) of the record starting at `start`: line breaks inside
 * quotes belong to the record. Refuses a quote never closed and a record longer than `maxBytes`.
 */
function recordEnd(
  b: Uint8Array,
  start: number,
  delim: number,
  maxBytes: number,
  line: number,
  columns: string[] | null,
): { end: number; breaks: number } {
  let inQuote = false;
  let col = 0;
  let openCol = 0;
  let openLine = line;
  let breaks = 0;
  const len = b.length;
  const limit = Math.min(len, start + maxBytes + 2);
  let p = start;
  for (; p < limit; p++) {
    const c = b[p];
    if (c === QUOTE) {
      if (!inQuote) {
        openCol = col;
        openLine = line + breaks;
      }
      inQuote = !inQuote;
    } else if (c === LF) {
      if (!inQuote) return { end: p + 1, breaks };
      breaks++;
    } else if (c === delim && !inQuote) col++;
  }
  const colName = columns ? (columns[openCol] ?? null) : null;
  if (inQuote) {
    const where = columns ? ` in column ${colName ?? openCol + 1}` : '';
    throw new LogParseError(openLine, colName, `a quoted value${where} is never closed`);
  }
  if (p < len || p - start > maxBytes + 1)
    throw new LogParseError(line, null, `the line is longer than ${groupDigits(maxBytes)} bytes`);
  return { end: p, breaks };
}

/** One record's fields through papaparse. */
function splitRecord(
  text: string,
  delimiter: CsvDelimiter,
  line: number,
  columns: string[] | null,
): string[] {
  const r = Papa.parse<string[]>(text, { delimiter, newline: '\n', header: false });
  const err = r.errors.find((e) => e.type === 'Quotes');
  if (err) {
    const detail =
      err.code === 'MissingQuotes'
        ? 'a quoted value is never closed'
        : 'a quoted value is malformed (text after its closing quote)';
    throw new LogParseError(line, null, `${detail}${columns ? '' : ' in the header'}`);
  }
  return r.data[0] ?? [];
}

/* ------------------------------------------------------------------ header */

type HeaderInfo = {
  columns: string[];
  sample: string[][];
  delimiter: CsvDelimiter;
  /** Byte offset of the first record below the header, and its line number. */
  dataStart: number;
  dataLine: number;
};

function detectDelimiter(b: Uint8Array, start: number, end: number): CsvDelimiter {
  let commas = 0;
  let semis = 0;
  let tabs = 0;
  let inQuote = false;
  for (let i = start; i < end; i++) {
    const c = b[i];
    if (c === QUOTE) inQuote = !inQuote;
    else if (!inQuote) {
      if (c === COMMA) commas++;
      else if (c === SEMI) semis++;
      else if (c === TAB) tabs++;
    }
  }
  if (semis > commas && semis >= tabs) return ';';
  if (tabs > commas && tabs > semis) return '\t';
  return ',';
}

function headerOf(bytes: Uint8Array, maxSampleRows: number, maxLineBytes: number): HeaderInfo {
  let p = textStart(bytes);
  let line = 1;
  // Blank lines above the header are passed over.
  for (;;) {
    if (p >= bytes.length) throw new LogParseError(1, null, 'the file is empty');
    const nl = bytes.indexOf(LF, p);
    const e = nl < 0 ? bytes.length : nl + 1;
    if (!isBlank(bytes, p, e)) break;
    p = e;
    line++;
  }
  const headerLine = line;
  const firstLf = bytes.indexOf(LF, p);
  const delimiter = detectDelimiter(bytes, p, firstLf < 0 ? bytes.length : firstLf);
  const d = delimiter.charCodeAt(0);
  const h = recordEnd(bytes, p, d, maxLineBytes, line, null);
  const raw = splitRecord(recordText(bytes, p, h.end), delimiter, line, null);
  const columns = raw.map((name, i) => name.trim() || `column ${i + 1}`);
  const seen = new Map<string, number>();
  columns.forEach((name, i) => {
    const k = name.toLowerCase();
    const first = seen.get(k);
    if (first !== undefined)
      throw new LogParseError(
        headerLine,
        name,
        `the column name "${name}" appears twice: column ${first + 1} "${columns[first]}" and column ${i + 1} "${name}"`,
      );
    seen.set(k, i);
  });
  p = h.end;
  line += h.breaks + 1;
  const dataStart = p;
  const dataLine = line;
  const sample: string[][] = [];
  while (sample.length < maxSampleRows && p < bytes.length) {
    const r = recordEnd(bytes, p, d, maxLineBytes, line, columns);
    if (!isBlank(bytes, p, r.end)) {
      const text = recordText(bytes, p, r.end);
      sample.push(text.includes('"') ? splitRecord(text, delimiter, line, columns) : text.split(delimiter));
    }
    p = r.end;
    line += r.breaks + 1;
  }
  return { columns, sample, delimiter, dataStart, dataLine };
}

/**
 * The column names (trimmed; an empty one becomes "column N"), the first `maxSampleRows` rows below the
 * header as text, and the separator (',' ';' or tab, whichever the header line holds most of). A UTF-8 byte
 * order mark is skipped. Refuses duplicate column names (case-insensitive), naming both columns.
 */
export function readCsvHeader(
  bytes: Uint8Array,
  maxSampleRows = 5,
): { columns: string[]; sample: string[][]; delimiter: CsvDelimiter } {
  const { columns, sample, delimiter } = headerOf(bytes, maxSampleRows, DEFAULT_MAX_LINE_BYTES);
  return { columns, sample, delimiter };
}

/* ------------------------------------------------------------------ suggestions */

type FieldSpec = { column: string; unit: string | null };

/** Lower case, separators as spaces, and the text in brackets kept apart (it usually names the unit). */
function nameParts(column: string): { words: string; unitText: string; all: string } {
  const lower = column.toLowerCase();
  const brackets = [...lower.matchAll(/[([{]([^)\]}]*)[)\]}]/g)].map((m) => m[1].trim());
  const outside = lower.replace(/[([{][^)\]}]*[)\]}]/g, ' ');
  const clean = (s: string) =>
    s
      .replace(/[_\-.:#]+/g, ' ')
      .replace(/\s+/g, ' ')
      .trim();
  const unitWords = brackets.filter((t) => unitLike(t));
  const otherWords = brackets.filter((t) => !unitLike(t));
  let words = clean([outside, ...otherWords].join(' '));
  // Units written as trailing words: "speed_mph", "target_seeds_ac", "time_ms".
  for (let m = TRAILING_UNIT.exec(words); m; m = TRAILING_UNIT.exec(words)) {
    unitWords.unshift(m[2]);
    words = m[1];
  }
  return { words, unitText: clean(unitWords.join(' ')), all: clean(lower) };
}

const TRAILING_UNIT =
  /^(.*\S) (mph|kmh|kph|mps|ms|sec|ft|in|m|deg|degrees|seeds|sds|ksds|kseeds|ac|ha|per|utc|k|pct|%|[a-z]*\/[a-z]*)$/;

const SPEED_UNIT_RE = {
  mph: /\bmph\b|miles? per hour/,
  kmh: /\bkm ?\/ ?h\b|\bkmh\b|\bkph\b|\bkm per h/,
  mps: /\bm ?\/ ?s\b|\bmps\b|metres? per second|meters? per second/,
};
const WIDTH_UNIT_RE = {
  ft: /\bft\b|\bfeet\b|\bfoot\b/,
  in: /\bin\b|\binch(es)?\b/,
  m: /\bm\b|\bmetres?\b|\bmeters?\b/,
};

function unitLike(t: string): boolean {
  return (
    /\b(seeds?|sds|kseeds?|ksds|k|ac|acre|ha|hectare|lbs?|kg|gal|l|deg|degrees?|ms|s|sec|secs|utc|iso|epoch|count|of total|%|fraction|pa|kpa|inh2o|inhg|lbf|kgf|n|mm|cm)\b/.test(
      t,
    ) ||
    /\//.test(t) ||
    Object.values(SPEED_UNIT_RE).some((re) => re.test(t)) ||
    Object.values(WIDTH_UNIT_RE).some((re) => re.test(t))
  );
}

const numbersOf = (sample: string[][], i: number) =>
  sample.map((row) => Number((row[i] ?? '').trim().replace(',', '.'))).filter((v) => Number.isFinite(v));
const median = (v: number[]) => {
  if (!v.length) return Number.NaN;
  const s = [...v].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
};
const ISO_RE = /^\d{4}-\d{2}-\d{2}([T ]\d{2}:\d{2}(:\d{2}([.,]\d+)?)?(Z|[+-]\d{2}(:?\d{2})?)?)?$/i;

function rateUnitOf(text: string, values: number[]): RateUnit {
  const t = ` ${text} `;
  if (/\bkg\b/.test(t)) return 'kg/ha';
  if (/\blbs?\b/.test(t)) return 'lb/ac';
  if (/\bgal\b/.test(t)) return 'gal/ac';
  if (/\bl ?\/ ?ha\b|\blitres?\b|\bliters?\b/.test(t)) return 'L/ha';
  if (/\bk ?(seeds?|sds)\b|\bkseeds?\b|\bksds\b|\bthousands?\b|\bk ?\/ ?ac\b|\b1000\b/.test(t))
    return 'kseeds/ac';
  if (/\bha\b|\/ ?ha\b|hectare/.test(t)) return 'seeds/ha';
  if (/\bac\b|\/ ?ac\b|acre/.test(t)) return 'seeds/ac';
  const m = median(values);
  return m > 0 && m < 200 ? 'kseeds/ac' : 'seeds/ac';
}

function speedUnitOf(text: string, values: number[]): 'mph' | 'km/h' | 'm/s' {
  if (SPEED_UNIT_RE.mph.test(text)) return 'mph';
  if (SPEED_UNIT_RE.kmh.test(text)) return 'km/h';
  if (SPEED_UNIT_RE.mps.test(text)) return 'm/s';
  // A guess from planting speeds (about 4–7 mph, 6–11 km/h, 2–3 m/s); the person confirms it.
  const m = median(values);
  if (m >= 8) return 'km/h';
  if (m >= 3.6) return 'mph';
  return 'm/s';
}

function widthUnitOf(text: string, values: number[]): 'ft' | 'in' | 'm' {
  if (WIDTH_UNIT_RE.ft.test(text)) return 'ft';
  if (WIDTH_UNIT_RE.in.test(text)) return 'in';
  if (WIDTH_UNIT_RE.m.test(text)) return 'm';
  return median(values) >= 200 ? 'in' : 'm';
}

const ROW_KINDS: [RegExp, RowValueKind][] = [
  [/^(population|pop|seeds?|rate)$/, 'population'],
  [/^(singulation|sing)$/, 'singulation'],
  [/^(load|downforce|down force|margin|ground contact)$/, 'load'],
  [/^(vacuum|vac)$/, 'vacuum'],
  [/^(spacing|seed spacing)$/, 'spacing'],
];

function rowOf(words: string): { row: number; kind: RowValueKind } | null {
  const m = /^(?:row|r) ?(\d{1,2}) (.+)$/.exec(words) ?? /^(.+) (?:row|r) ?(\d{1,2})$/.exec(words);
  if (!m) return null;
  const [num, what] = /^\d/.test(m[1]) ? [m[1], m[2]] : [m[2], m[1]];
  const row = Number(num);
  if (row < 1 || row > 96) return null;
  const kind = ROW_KINDS.find(([re]) => re.test(what))?.[1];
  return kind ? { row, kind } : null;
}

/** Which field a column's words name, in order of precedence (null: none). */
function fieldOf(words: string): LogField | null {
  const w = ` ${words} `;
  if (
    /^(time|timestamp|time stamp|datetime|date ?time|date\/time|utc|utc time|time utc|gps time|gnss time|log time)$/.test(
      words,
    )
  )
    return 'time';
  if (/^(lon|long|lng|longitude|x|gps lon|gnss lon)$/.test(words)) return 'lon';
  if (/^(lat|latitude|y|gps lat|gnss lat)$/.test(words)) return 'lat';
  if (/ speed (source|src|sensor|input)|^(speed source|ground speed source|speed src)$/.test(w))
    return 'speedSource';
  if (/speed/.test(w) && /\b(wheel|radar)\b/.test(w)) return 'wheelSpeed';
  if (/speed/.test(w) && /\b(gnss|gps|satellite)\b/.test(w)) return 'gnssSpeed';
  if (/^(speed|ground speed|vehicle speed|travel speed)$/.test(words)) return 'speed';
  if (/^(heading|course|track|bearing|direction|heading deg)$/.test(words)) return 'heading';
  if (/\b(target|prescribed|prescription|rx)\b/.test(w)) return 'target';
  if (/\b(applied|actual|population|pop)\b/.test(w) || /^as applied/.test(words)) return 'applied';
  if (/\b(width|swath)\b/.test(w)) return 'width';
  if (
    /^(sections?( on| active)?|rows? on|active (sections|rows)|sections? planting|rows? planting)$/.test(
      words,
    )
  )
    return 'sectionsOn';
  if (/^(work|work state|work status|work switch|working|planting|implement down|master switch)$/.test(words))
    return 'workOn';
  return null;
}

/**
 * A mapping guessed from the column names and units in them (brackets or words: "Speed (mph)",
 * "applied_seeds_ha") and, where the name says nothing, from the sample values: times as ISO text or epoch
 * seconds / milliseconds by size; rates in seeds/ac, or thousands of seeds/ac below 200; speeds by
 * size. Only a suggestion: the person checks it in the mapping step.
 */
export function suggestMapping(columns: string[], sample: string[][]): ColumnMapping {
  const fields: Partial<Record<LogField, FieldSpec>> = {};
  const rows: ColumnMapping['rows'] = [];
  columns.forEach((column, i) => {
    const { words, unitText, all } = nameParts(column);
    const row = rowOf(words);
    if (row) {
      if (!rows.some((r) => r.row === row.row && r.kind === row.kind)) rows.push({ column, ...row });
      return;
    }
    const field = fieldOf(words);
    if (!field || fields[field]) return;
    const unitSource = unitText || all;
    const values = numbersOf(sample, i);
    let unit: string | null = null;
    switch (field) {
      case 'time': {
        const first = sample.map((r) => (r[i] ?? '').trim()).find((s) => s !== '') ?? '';
        if (ISO_RE.test(first)) unit = 'iso';
        else if (/\bms\b|millis/.test(unitSource)) unit = 'epoch-ms';
        else if (/\b(s|sec|secs|seconds)\b/.test(unitSource)) unit = 'epoch-s';
        else unit = Math.abs(median(values)) >= 1e11 ? 'epoch-ms' : 'epoch-s';
        break;
      }
      case 'target':
      case 'applied':
        unit = rateUnitOf(unitSource, values);
        break;
      case 'speed':
      case 'wheelSpeed':
      case 'gnssSpeed':
        unit = speedUnitOf(unitSource, values);
        break;
      case 'width':
        unit = widthUnitOf(unitSource, values);
        break;
      case 'heading':
        unit = 'deg';
        break;
      case 'sectionsOn':
        unit =
          /of total|fraction|%/.test(unitSource) ||
          (values.length > 0 && values.every((v) => v >= 0 && v <= 1) && values.some((v) => v % 1 !== 0))
            ? 'of-total'
            : 'count';
        break;
      default:
        unit = null;
    }
    fields[field] = { column, unit };
  });
  return { fields, rows };
}

/* ------------------------------------------------------------------ field readers over bytes */

/** 10^0 … 10^22: exactly representable, so one multiply or divide gives a correctly rounded result. */
const POW10 = Array.from({ length: 23 }, (_, i) => Number(`1e${i}`));

/** The value the last reader produced (a second return value without an object per call). */
let value = 0;

/** A number read with Number() from its text (more than 15 digits, or a large exponent). */
function slowNumber(b: Uint8Array, start: number, end: number, decimalComma: boolean): number {
  let s = '';
  for (let i = start; i < end; i++) {
    const c = b[i];
    s += c === COMMA && decimalComma ? '.' : String.fromCharCode(c);
  }
  return Number(s);
}

const isEnd = (c: number, delim: number) => c === delim || c === LF || c === CR || c === -1;

/**
 * Reads the number starting at p (spaces around it allowed) into `value`; an empty field gives NaN.
 * Returns the position of the byte that ends the field (separator, CR, LF or the end), or −1 when the field
 * is not a plain number.
 */
function readNumber(b: Uint8Array, p: number, end: number, delim: number, decimalComma: boolean): number {
  let c = p < end ? b[p] : -1;
  while (c === SPACE || (c === TAB && delim !== TAB)) c = ++p < end ? b[p] : -1;
  if (isEnd(c, delim)) {
    value = Number.NaN;
    return p;
  }
  const start = p;
  let neg = false;
  if (c === 45 || c === 43) {
    neg = c === 45;
    c = ++p < end ? b[p] : -1;
  }
  // Digits build an integer mantissa; exact while it stays within 2^53 (checked once, at the end).
  let mant = 0;
  const intStart = p;
  while (c >= 48 && c <= 57) {
    mant = mant * 10 + (c - 48);
    c = ++p < end ? b[p] : -1;
  }
  let digits = p - intStart;
  let exp = 0;
  if (c === 46 || (c === COMMA && decimalComma)) {
    const fracStart = ++p;
    c = p < end ? b[p] : -1;
    while (c >= 48 && c <= 57) {
      mant = mant * 10 + (c - 48);
      c = ++p < end ? b[p] : -1;
    }
    digits += p - fracStart;
    exp = fracStart - p;
  }
  if (digits === 0) return -1;
  if (c === 101 || c === 69) {
    c = ++p < end ? b[p] : -1;
    let eneg = false;
    if (c === 45 || c === 43) {
      eneg = c === 45;
      c = ++p < end ? b[p] : -1;
    }
    let e = 0;
    let ed = 0;
    while (c >= 48 && c <= 57) {
      if (e < 100_000) e = e * 10 + (c - 48);
      ed++;
      c = ++p < end ? b[p] : -1;
    }
    if (ed === 0) return -1;
    exp += eneg ? -e : e;
  }
  const stop = p;
  while (c === SPACE || (c === TAB && delim !== TAB)) c = ++p < end ? b[p] : -1;
  if (!isEnd(c, delim)) return -1;
  if (mant > Number.MAX_SAFE_INTEGER || exp > 22 || exp < -22) {
    value = slowNumber(b, start, stop, decimalComma);
    return p;
  }
  const v = exp >= 0 ? mant * POW10[exp] : mant / POW10[-exp];
  value = neg ? -v : v;
  return p;
}

/** Two digits at p as a number, or −1. */
function two(b: Uint8Array, p: number, end: number): number {
  if (p + 1 >= end) return -1;
  const a = b[p] - 48;
  const c = b[p + 1] - 48;
  return a >= 0 && a <= 9 && c >= 0 && c <= 9 ? a * 10 + c : -1;
}

/** Days from 1970-01-01 to a civil date (proleptic Gregorian; H. Hinnant's days_from_civil). */
function daysFromCivil(y: number, m: number, d: number): number {
  const yy = m <= 2 ? y - 1 : y;
  const era = Math.floor(yy / 400);
  const yoe = yy - era * 400;
  const doy = Math.floor((153 * (m + (m > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146_097 + doe - 719_468;
}

const DAYS_IN_MONTH = [31, 29, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/**
 * Reads YYYY-MM-DD[T| ]HH:MM[:SS[.sss]][Z|±HH[:MM]] (or a date alone) at p into `value` as seconds since the
 * Unix epoch; no offset means UTC. Returns the position ending the field, or −1.
 */
function readIsoTime(b: Uint8Array, p: number, end: number, delim: number): number {
  let c = p < end ? b[p] : -1;
  while (c === SPACE || (c === TAB && delim !== TAB)) c = ++p < end ? b[p] : -1;
  if (isEnd(c, delim)) {
    value = Number.NaN;
    return p;
  }
  const y1 = two(b, p, end);
  const y2 = two(b, p + 2, end);
  if (y1 < 0 || y2 < 0 || b[p + 4] !== 45 || b[p + 7] !== 45) return -1;
  const year = y1 * 100 + y2;
  const month = two(b, p + 5, end);
  const day = two(b, p + 8, end);
  if (month < 1 || month > 12 || day < 1 || day > DAYS_IN_MONTH[month - 1]) return -1;
  if (month === 2 && day === 29 && !(year % 4 === 0 && (year % 100 !== 0 || year % 400 === 0))) return -1;
  p += 10;
  let secs = 0;
  let frac = 0;
  let scale = 1;
  c = p < end ? b[p] : -1;
  if (c === 84 || c === 116 || (c === SPACE && two(b, p + 1, end) >= 0 && b[p + 3] === 58)) {
    const hh = two(b, p + 1, end);
    const mm = b[p + 3] === 58 ? two(b, p + 4, end) : -1;
    if (hh < 0 || hh > 23 || mm < 0 || mm > 59) return -1;
    secs = hh * 3600 + mm * 60;
    p += 6;
    if (p < end && b[p] === 58) {
      const ss = two(b, p + 1, end);
      if (ss < 0 || ss > 60) return -1;
      secs += ss;
      p += 3;
      if (
        p < end &&
        (b[p] === 46 || (b[p] === COMMA && delim !== COMMA)) &&
        p + 1 < end &&
        b[p + 1] >= 48 &&
        b[p + 1] <= 57
      ) {
        p++;
        while (p < end && b[p] >= 48 && b[p] <= 57) {
          if (scale < 1e15) {
            frac = frac * 10 + (b[p] - 48);
            scale *= 10;
          }
          p++;
        }
      }
    }
    c = p < end ? b[p] : -1;
    if (c === 90 || c === 122) p++;
    else if (c === 43 || c === 45) {
      const oh = two(b, p + 1, end);
      if (oh < 0 || oh > 18) return -1;
      let om = 0;
      p += 3;
      if (p < end && b[p] === 58) p++;
      if (two(b, p, end) >= 0) {
        om = two(b, p, end);
        p += 2;
      }
      secs -= (c === 45 ? -1 : 1) * (oh * 3600 + om * 60);
    }
  }
  c = p < end ? b[p] : -1;
  while (c === SPACE || (c === TAB && delim !== TAB)) c = ++p < end ? b[p] : -1;
  if (!isEnd(c, delim)) return -1;
  // Whole seconds are exact; the fraction joins them in one rounding where the sum fits in 2^53.
  const whole = daysFromCivil(year, month, day) * 86_400 + secs;
  const scaled = whole * scale + frac;
  value = scale === 1 ? whole : Math.abs(scaled) < 2 ** 53 ? scaled / scale : whole + frac / scale;
  return p;
}

/** The end of the field at p (separator, CR, LF or the end), or −1 when a quote comes first. */
function fieldEnd(b: Uint8Array, p: number, end: number, delim: number): number {
  for (; p < end; p++) {
    const c = b[p];
    if (c === delim || c === LF || c === CR) return p;
    if (c === QUOTE) return -1;
  }
  return p;
}

/** True when the bytes [s, e) start with `word` (lower case ASCII), ignoring case. */
function startsWithWord(b: Uint8Array, s: number, e: number, word: string): boolean {
  if (e - s < word.length) return false;
  for (let i = 0; i < word.length; i++) if ((b[s + i] | 0x20) !== word.charCodeAt(i)) return false;
  return true;
}

/** [s, e) without spaces and tabs around it. */
function trimmed(b: Uint8Array, s: number, e: number): [number, number] {
  while (s < e && (b[s] === SPACE || b[s] === TAB)) s++;
  while (e > s && (b[e - 1] === SPACE || b[e - 1] === TAB)) e--;
  return [s, e];
}

const SOURCE_WORDS: [string, number][] = [
  ['wheel', SPEED_SOURCE_CODE.wheel],
  ['radar', SPEED_SOURCE_CODE.radar],
  ['gnss', SPEED_SOURCE_CODE.gnss],
  ['gps', SPEED_SOURCE_CODE.gnss],
  ['satellite', SPEED_SOURCE_CODE.gnss],
  ['unknown', SPEED_SOURCE_CODE.unknown],
  ['none', SPEED_SOURCE_CODE.unknown],
];

/** Reads a speed source word (wheel, radar, gnss, gps; empty or unknown → 0) into `value`. */
function readSource(b: Uint8Array, p: number, end: number, delim: number): number {
  const e = fieldEnd(b, p, end, delim);
  if (e < 0) return -1;
  const [s, t] = trimmed(b, p, e);
  if (s === t) {
    value = SPEED_SOURCE_CODE.unknown;
    return e;
  }
  for (const [word, code] of SOURCE_WORDS) {
    if (startsWithWord(b, s, t, word)) {
      value = code;
      return e;
    }
  }
  return -1;
}

const WORK_WORDS: [string, number][] = [
  ['on', 1],
  ['true', 1],
  ['yes', 1],
  ['y', 1],
  ['down', 1],
  ['planting', 1],
  ['off', 0],
  ['false', 0],
  ['no', 0],
  ['n', 0],
  ['up', 0],
];

/** Reads a work state (a number, non-zero meaning on; on/off, true/false, yes/no; empty → 0) into `value`. */
function readWork(b: Uint8Array, p: number, end: number, delim: number, decimalComma: boolean): number {
  const q = readNumber(b, p, end, delim, decimalComma);
  if (q >= 0) {
    value = value !== 0 && !Number.isNaN(value) ? 1 : 0;
    return q;
  }
  const e = fieldEnd(b, p, end, delim);
  if (e < 0) return -1;
  const [s, t] = trimmed(b, p, e);
  for (const [word, on] of WORK_WORDS) {
    if (t - s === word.length && startsWithWord(b, s, t, word)) {
      value = on;
      return e;
    }
  }
  return -1;
}

/* ------------------------------------------------------------------ parse */

/** Longer lines are refused (FORMATS.md: a line-length cap). */
export const DEFAULT_MAX_LINE_BYTES = 64 * 1024;

const NO_NUMBERS = new Float64Array(0);
const NO_CODES = new Uint8Array(0);

const K_SKIP = 0;
const K_NUMBER = 1;
const K_ISO = 2;
const K_SOURCE = 3;
const K_WORK = 4;

type Plan = {
  kind: Uint8Array;
  /** value × mul ÷ div converts to SI (one of them 1: the same operation as shared/units.ts). */
  mul: Float64Array;
  div: Float64Array;
  /** Where each column's values go: numbers and times in `num`, codes (speed source, work) in `code`. */
  num: Float64Array[];
  code: Uint8Array[];
  what: string[];
};

/** SI factor of a unit as [multiply, divide], the same arithmetic as shared/units.ts and rate-units.ts. */
function siFactor(field: LogField, unit: string | null): [number, number] {
  switch (unit) {
    case 'epoch-ms':
      return [1, 1000];
    case 'mph':
      return [MPS_PER_MPH, 1]; // mphToMps
    case 'km/h':
      return [1, 3.6]; // kmhToMps
    case 'ft':
      return [M_PER_FT, 1];
    case 'in':
      return [M_PER_IN, 1]; // inToM
    default:
      if (field === 'target' || field === 'applied') return [RATE_UNIT_DEFS[unit as RateUnit].si, 1]; // rateToSi
      return [1, 1];
  }
}

const OUT_KEY: Record<LogField, keyof LogColumns> = {
  time: 't',
  lon: 'lon',
  lat: 'lat',
  heading: 'heading',
  target: 'target',
  applied: 'applied',
  speed: 'speedMps',
  wheelSpeed: 'wheelMps',
  gnssSpeed: 'gnssMps',
  speedSource: 'speedSource',
  width: 'widthM',
  sectionsOn: 'sectionsOn',
  workOn: 'workOn',
};

/** Checks the mapping against the file's columns; throws a plain message for the mapping step. */
function checkMapping(mapping: ColumnMapping, columns: string[]) {
  for (const f of REQUIRED_LOG_FIELDS)
    if (!mapping.fields[f]) throw new Error(`Choose the column for ${LOG_FIELD_LABELS[f].toLowerCase()}`);
  const used = new Map<string, string>();
  const claim = (column: string, what: string) => {
    if (!columns.includes(column))
      throw new Error(`The column "${column}" chosen for ${what} is not in the file`);
    const before = used.get(column);
    if (before) throw new Error(`The column "${column}" is chosen for both ${before} and ${what}`);
    used.set(column, what);
  };
  for (const [f, spec] of Object.entries(mapping.fields) as [LogField, FieldSpec][]) {
    const what = LOG_FIELD_LABELS[f].toLowerCase();
    const units = LOG_FIELD_UNITS[f];
    if (units && (!spec.unit || !units.includes(spec.unit)))
      throw new Error(`Choose the unit of ${what}: ${units.join(', ')}`);
    claim(spec.column, what);
  }
  for (const r of mapping.rows ?? []) claim(r.column, `row ${r.row} ${r.kind}`);
}

function makePlan(mapping: ColumnMapping, columns: string[], out: LogColumns): Plan {
  const n = columns.length;
  const plan: Plan = {
    kind: new Uint8Array(n),
    mul: new Float64Array(n).fill(1),
    div: new Float64Array(n).fill(1),
    num: new Array(n).fill(NO_NUMBERS),
    code: new Array(n).fill(NO_CODES),
    what: columns,
  };
  for (const [f, spec] of Object.entries(mapping.fields) as [LogField, FieldSpec][]) {
    const i = columns.indexOf(spec.column);
    plan.kind[i] =
      f === 'time' && spec.unit === 'iso'
        ? K_ISO
        : f === 'speedSource'
          ? K_SOURCE
          : f === 'workOn'
            ? K_WORK
            : K_NUMBER;
    [plan.mul[i], plan.div[i]] = siFactor(f, spec.unit);
    const target = out[OUT_KEY[f]];
    if (target instanceof Uint8Array) plan.code[i] = target;
    else plan.num[i] = target as Float64Array;
  }
  (mapping.rows ?? []).forEach((r, k) => {
    const i = columns.indexOf(r.column);
    plan.kind[i] = K_NUMBER;
    plan.num[i] = out.rows[k].values;
  });
  return plan;
}

function allocate(mapping: ColumnMapping, cap: number, shared = false): LogColumns {
  // Shared memory when two threads fill the columns (parseLogCsvParallel).
  const f = () => (shared ? new Float64Array(new SharedArrayBuffer(cap * 8)) : new Float64Array(cap));
  const bytes = () => (shared ? new Uint8Array(new SharedArrayBuffer(cap)) : new Uint8Array(cap));
  const has = (k: LogField) => Boolean(mapping.fields[k]);
  return {
    n: 0,
    t: f(),
    lon: f(),
    lat: f(),
    heading: has('heading') ? f() : null,
    target: f(),
    applied: f(),
    speedMps: has('speed') ? f() : null,
    wheelMps: has('wheelSpeed') ? f() : null,
    gnssMps: has('gnssSpeed') ? f() : null,
    speedSource: has('speedSource') ? bytes() : null,
    widthM: has('width') ? f() : null,
    sectionsOn: has('sectionsOn') ? f() : null,
    workOn: has('workOn') ? bytes() : null,
    rows: (mapping.rows ?? []).map((r) => ({ row: r.row, kind: r.kind, values: f() })),
  };
}

const ARRAY_KEYS = [
  't',
  'lon',
  'lat',
  'heading',
  'target',
  'applied',
  'speedMps',
  'wheelMps',
  'gnssMps',
  'speedSource',
  'widthM',
  'sectionsOn',
  'workOn',
] as const;

/** The log with every array (per-row ones too) passed through `f`, holding n points. */
function mapArrays(
  c: LogColumns,
  n: number,
  f: <T extends Float64Array | Uint8Array>(a: T) => T,
): LogColumns {
  const out: LogColumns = { ...c, n, rows: c.rows.map((r) => ({ ...r, values: f(r.values) })) };
  const slots = out as Record<(typeof ARRAY_KEYS)[number], Float64Array | Uint8Array | null>;
  for (const k of ARRAY_KEYS) slots[k] = c[k] ? f(c[k]) : null;
  return out;
}

/** The same columns in arrays of `cap` points, values copied. */
const grown = (c: LogColumns, cap: number) =>
  mapArrays(c, c.n, (a) => {
    const b = new (a.constructor as { new (n: number): typeof a })(cap);
    b.set(a);
    return b;
  });

/** Every column cut to n points (copies, so no oversized buffer stays alive). */
const shrink = (c: LogColumns, n: number) =>
  mapArrays(c, n, (a) => (a.length === n ? a : (a.slice(0, n) as typeof a)));

/** Reads field `col` of point `n` from [p, end) (a number before its unit's factor); returns the end of the field or −1. */
function readField(
  b: Uint8Array,
  p: number,
  end: number,
  delim: number,
  decimalComma: boolean,
  plan: Plan,
  col: number,
  n: number,
): number {
  const k = plan.kind[col];
  let q: number;
  if (k === K_NUMBER) {
    // The number as written: parseLogCsv applies the unit's factor per column once the lines are read.
    q = readNumber(b, p, end, delim, decimalComma);
    if (q >= 0) plan.num[col][n] = value;
    return q;
  }
  if (k === K_SKIP) return fieldEnd(b, p, end, delim);
  if (k === K_ISO) {
    q = readIsoTime(b, p, end, delim);
    if (q >= 0) plan.num[col][n] = value;
    return q;
  }
  q = k === K_SOURCE ? readSource(b, p, end, delim) : readWork(b, p, end, delim, decimalComma);
  if (q >= 0) plan.code[col][n] = value;
  return q;
}

/** The message for a field whose text does not read as its column's kind. */
function fieldError(text: string, plan: Plan, col: number, line: number) {
  const name = plan.what[col];
  const k = plan.kind[col];
  const expected =
    k === K_ISO
      ? 'is not a date and time like 2026-05-01T14:03:07Z'
      : k === K_SOURCE
        ? 'is not a speed source (wheel, radar, gnss or gps)'
        : k === K_WORK
          ? 'is not a work state (1/0, on/off, true/false)'
          : 'is not a number';
  return new LogParseError(line, name, `${shown(text.trim())} in column ${name} ${expected}`);
}

function tooFewFields(plan: Plan, fields: number, line: number) {
  const name = plan.what[fields];
  return new LogParseError(
    line,
    name,
    `the line has ${fields} field${fields === 1 ? '' : 's'} but the header has ${plan.what.length} (no value for column ${name})`,
  );
}

/** A field of a quoted line: its text (from papaparse) read by the same byte readers. */
function readTextField(
  text: string,
  delimiter: CsvDelimiter,
  plan: Plan,
  col: number,
  n: number,
  line: number,
) {
  const d = delimiter.charCodeAt(0);
  // "34,000" in a quoted value of a ','-separated file: the commas group thousands.
  const t =
    delimiter === ',' && /^\s*[+-]?\d{1,3}(,\d{3})+(\.\d*)?\s*$/.test(text) ? text.replace(/,/g, '') : text;
  const bytes = utf8Encoder.encode(t);
  const q = readField(bytes, 0, bytes.length, d, delimiter === ';', plan, col, n);
  if (q !== bytes.length) throw fieldError(text, plan, col, line);
}

/**
 * LF bytes from `start` to the end, or a few more: four bytes at a time (a byte is flagged when it is LF, or,
 * rarely, when it is 0x0B just above an LF), for a capacity that is never too small.
 */
function countLineBreaks(b: Uint8Array, start: number, end: number): number {
  let count = 0;
  let i = start;
  while (i < end && (b.byteOffset + i) % 4 !== 0) if (b[i++] === LF) count++;
  const words = new Uint32Array(b.buffer, b.byteOffset + i, Math.max(0, end - i) >> 2);
  for (let k = 0; k < words.length; k++) {
    const x = words[k] ^ 0x0a0a0a0a;
    const t = (x - 0x01010101) & ~x & 0x80808080;
    if (t !== 0)
      count += (t & 0x80 ? 1 : 0) + (t & 0x8000 ? 1 : 0) + (t & 0x800000 ? 1 : 0) + (t & 0x80000000 ? 1 : 0);
  }
  for (i += words.length * 4; i < end; i++) if (b[i] === LF) count++;
  return count;
}

/** What the hot loop reads with (one object, so the loop's arguments stay few). */
class FastRow {
  /** The index of the last column. */
  readonly last: number;
  constructor(
    public plan: Plan,
    readonly delim: number,
    readonly decimalComma: boolean,
    readonly len: number,
  ) {
    this.last = plan.kind.length - 1;
  }
}

/**
 * The hot loop: the line at p into point n, or −1 when it is not a plain line. Only for a line that ends
 * with an LF, so no byte is compared with the end of the file (every scan stops at that LF at the latest).
 * A number is read as readNumber does, the digits into an integer mantissa and one division by a power of
 * ten, stored before its unit's factor; what readNumber would do otherwise (an exponent, more than 15
 * digits, no digits at all) makes the line −1, and so do a quote, a field that does not read and a line
 * with too few fields: the field-by-field path then reads the line again, with the same result or message.
 */
function fastLine(b: Uint8Array, p: number, n: number, f: FastRow): number {
  const { kind, num } = f.plan;
  const delim = f.delim;
  const decimalComma = f.decimalComma;
  const spaceTab = delim !== TAB;
  const last = f.last;
  for (let col = 0; ; col++) {
    const k = kind[col];
    let c = b[p];
    if (k === K_NUMBER) {
      // A digit or '-' first is the usual field; spaces, '+' and empty fields are looked at only otherwise.
      let neg = false;
      let empty = false;
      if (c === 45) {
        neg = true;
        c = b[++p];
      } else if (!(c >= 48 && c <= 57)) {
        while (c === SPACE || (c === TAB && spaceTab)) c = b[++p];
        if (c === delim || c === LF || c === CR) empty = true;
        else if (c === 45 || c === 43) {
          neg = c === 45;
          c = b[++p];
        }
      }
      if (empty) {
        num[col][n] = Number.NaN;
      } else {
        let mant = 0;
        const intStart = p;
        while (c >= 48 && c <= 57) {
          mant = mant * 10 + (c - 48);
          c = b[++p];
        }
        let digits = p - intStart;
        let exp = 0;
        if (c === 46 || (c === COMMA && decimalComma)) {
          const fracStart = ++p;
          c = b[p];
          while (c >= 48 && c <= 57) {
            mant = mant * 10 + (c - 48);
            c = b[++p];
          }
          digits += p - fracStart;
          exp = fracStart - p;
        }
        if (digits === 0 || mant > Number.MAX_SAFE_INTEGER || exp < -22) return -1;
        if (c !== delim) {
          if (c === 101 || c === 69) return -1;
          while (c === SPACE || (c === TAB && spaceTab)) c = b[++p];
          if (c !== delim && c !== LF && c !== CR) return -1;
        }
        const v = exp === 0 ? mant : mant / POW10[-exp];
        num[col][n] = neg ? -v : v;
      }
    } else if (k === K_SKIP) {
      while (c !== delim && c !== LF && c !== CR) {
        if (c === QUOTE) return -1;
        c = b[++p];
      }
    } else {
      p = readField(b, p, f.len, delim, decimalComma, f.plan, col, n);
      if (p < 0) return -1;
      c = b[p];
    }
    if (col === last) {
      // Extra fields (a trailing separator, say) are passed over, as in parseLogCsv.
      while (c !== LF && c !== QUOTE && c !== CR) c = b[++p];
      if (c === CR) c = b[++p];
      return c === LF ? p + 1 : -1;
    }
    if (c !== delim) return -1;
    p++;
  }
}

/**
 * Parses a CSV log with a column mapping into typed columns in SI (rates via rateToSi, speeds m/s, widths
 * m, time seconds since the epoch). Blank lines are skipped, and so are points whose time, longitude or
 * latitude is empty (`skipped` counts them, with the first few line numbers); other empty values become NaN
 * (0 for speed source and work state). Columns not mapped are not read. Throws LogParseError naming the
 * line and column: a value that does not read, a line with fewer fields than the header, a line longer
 * than `maxLineBytes`, a quoted value never closed. `onProgress(fraction of bytes)` every 65 536 lines.
 */
export function parseLogCsv(
  bytes: Uint8Array,
  mapping: ColumnMapping,
  opts: { onProgress?(fraction: number): void; maxLineBytes?: number } = {},
): LogColumns & { skipped: { count: number; lines: number[] } } {
  const maxLineBytes = opts.maxLineBytes ?? DEFAULT_MAX_LINE_BYTES;
  const header = headerOf(bytes, 0, maxLineBytes);
  checkMapping(mapping, header.columns);
  const len = bytes.length;
  // Sized by the lines below the header (a point takes at least one), so the columns are usually returned
  // without a copy; grown by half should it ever run out.
  const cap =
    countLineBreaks(bytes, header.dataStart, len) + (len > header.dataStart && bytes[len - 1] !== LF ? 1 : 0);
  const r = parseBody(bytes, mapping, header, allocate(mapping, cap), cap, {
    start: header.dataStart,
    end: len,
    firstLine: header.dataLine,
    n0: 0,
    maxLineBytes,
    onProgress: opts.onProgress,
  });
  applyUnitFactors(mapping, header.columns, r.out, r.n);
  opts.onProgress?.(1);
  return { ...shrink(r.out, r.n), skipped: r.skipped };
}

/** The lines of [start, end) below the header, for a second thread (`parseLogCsvParallel`). */
export type CsvRangeJob = {
  /** The whole file (shared memory, so nothing is copied to the thread). */
  bytes: Uint8Array;
  mapping: ColumnMapping;
  start: number;
  end: number;
  /** The row of the columns the range's first point goes to. */
  n0: number;
  maxLineBytes: number;
  /** The columns of the whole file, in shared memory: the range writes its rows from n0 on. */
  columns: LogColumns;
  cap: number;
};

/**
 * What a range read: the row after its last point and its skipped points; line numbers in it (`skipped`,
 * a LogParseError's) count from 0 at the range's first line, for the caller to add the lines before it.
 */
export type CsvRangeResult = { n: number; skipped: { count: number; lines: number[] } };

/** Reads one range of a file's lines into shared columns (the second thread's half of parseLogCsvParallel). */
export function parseLogCsvRange(job: CsvRangeJob): CsvRangeResult {
  const header = headerOf(job.bytes, 0, job.maxLineBytes);
  const r = parseBody(job.bytes, job.mapping, header, job.columns, job.cap, {
    start: job.start,
    end: job.end,
    firstLine: 0,
    n0: job.n0,
    maxLineBytes: job.maxLineBytes,
    fixedCapacity: true,
  });
  return { n: r.n, skipped: r.skipped };
}

/** A file smaller than this is read by one thread: a second would cost more than it saves. */
export const PARALLEL_MIN_BYTES = 4 * 1024 * 1024;

/**
 * parseLogCsv with the lines split between this thread and `second` (a worker running parseLogCsvRange):
 * the same columns, skipped points and errors (the first line's error wins), in about half the time. Both
 * halves write into one set of columns in shared memory, the second from an upper bound of the first's
 * points on; a gap (blank or skipped lines in the first half) is closed after. A file with a quote in its
 * body (a quoted field may hold a line break), a small file, or bytes not in shared memory and a failing
 * second thread are read by this thread alone.
 */
export async function parseLogCsvParallel(
  bytes: Uint8Array,
  mapping: ColumnMapping,
  second: (job: CsvRangeJob) => Promise<CsvRangeResult>,
  opts: { onProgress?(fraction: number): void; maxLineBytes?: number; minBytes?: number } = {},
): Promise<LogColumns & { skipped: { count: number; lines: number[] } }> {
  const maxLineBytes = opts.maxLineBytes ?? DEFAULT_MAX_LINE_BYTES;
  const minBytes = opts.minBytes ?? PARALLEL_MIN_BYTES;
  const len = bytes.length;
  const shared = typeof SharedArrayBuffer !== 'undefined' && bytes.buffer instanceof SharedArrayBuffer;
  const header = headerOf(bytes, 0, maxLineBytes);
  if (!shared || len - header.dataStart < minBytes || bytes.indexOf(QUOTE, header.dataStart) >= 0)
    return parseLogCsv(bytes, mapping, opts);
  checkMapping(mapping, header.columns);
  const mid = bytes.indexOf(LF, header.dataStart + ((len - header.dataStart) >> 1)) + 1;
  if (mid <= 0 || mid >= len) return parseLogCsv(bytes, mapping, opts);
  const firstCap = countLineBreaks(bytes, header.dataStart, mid);
  const cap = firstCap + countLineBreaks(bytes, mid, len) + (bytes[len - 1] !== LF ? 1 : 0);
  const out = allocate(mapping, cap, true);
  const job: CsvRangeJob = {
    bytes,
    mapping,
    start: mid,
    end: len,
    n0: firstCap,
    maxLineBytes,
    columns: out,
    cap,
  };
  const pending = settledOf(second(job));
  let first: ReturnType<typeof parseBody>;
  try {
    first = parseBody(bytes, mapping, header, out, cap, {
      start: header.dataStart,
      end: mid,
      firstLine: header.dataLine,
      n0: 0,
      maxLineBytes,
      fixedCapacity: true,
      onProgress: opts.onProgress ? (f) => opts.onProgress!(f / 2) : undefined,
    });
  } catch (err) {
    await pending; // the second thread is done with the columns before they are dropped
    throw err;
  }
  const linesBefore = first.line; // the line number of the second half's first line
  const done = await pending;
  let secondPart: CsvRangeResult;
  if (done.ok) secondPart = done.r;
  else if (done.err instanceof LogParseError)
    throw new LogParseError(done.err.line + linesBefore, done.err.column, done.err.detail);
  else {
    // The second thread failed (not the file): this thread reads the second half too.
    const r = parseBody(bytes, mapping, header, out, cap, {
      start: mid,
      end: len,
      firstLine: 0,
      n0: firstCap,
      maxLineBytes,
      fixedCapacity: true,
    });
    secondPart = { n: r.n, skipped: r.skipped };
  }
  opts.onProgress?.(1);
  return joinHalves(mapping, header.columns, out, firstCap, first, secondPart, linesBefore);
}

/**
 * Where a large log's bytes come from when it is not held whole in memory: a file, read a piece at a time
 * (server/logs/file-source.ts). `read` fills `into` from `position` on and answers how many bytes it read.
 */
export type ByteSource = { size: number; read(into: Uint8Array, position: number): number };

/** A log read from a ByteSource is read in pieces of this size (a piece ends at its last line break). */
export const SOURCE_PIECE_BYTES = 8 * 1024 * 1024;

/** The lines of a source's range [start, end), for a second thread (`parseLogCsvSource`). */
export type CsvSourceRangeJob = Omit<CsvRangeJob, 'bytes'> & {
  /** Where the second thread opens the source (a file path). */
  file: string;
  /** The header's line number and byte offset, and its columns and separator (read once by the first thread). */
  header: { columns: string[]; delimiter: CsvDelimiter; dataStart: number; dataLine: number };
  pieceBytes: number;
};

/** A piece holding a double quote: a quoted field may hold a line break, so the file is read whole. */
class QuoteInPiece extends Error {}

function readFully(src: ByteSource, into: Uint8Array, position: number) {
  let got = 0;
  while (got < into.length) {
    const k = src.read(into.subarray(got), position + got);
    if (k <= 0) throw new Error(`the file ended at byte ${position + got} of ${src.size}`);
    got += k;
  }
}

/** Line breaks in the source's [start, end), a piece at a time (as countLineBreaks: never too few). */
function countSourceLineBreaks(src: ByteSource, start: number, end: number, buf: Uint8Array) {
  let count = 0;
  for (let pos = start; pos < end;) {
    const want = Math.min(buf.length, end - pos);
    readFully(src, buf.subarray(0, want), pos);
    count += countLineBreaks(buf, 0, want);
    pos += want;
  }
  return count;
}

/**
 * parseBody over the source's [start, end) a piece at a time into `columns` (sized for every line): each
 * piece is cut after its last line break, so every line is read whole, with the same values, skipped points
 * and messages (line numbers carried from piece to piece) as from the whole file in memory.
 */
function parseSourceBody(
  src: ByteSource,
  mapping: ColumnMapping,
  header: HeaderInfo,
  columns: LogColumns,
  cap: number,
  range: BodyRange,
  buf: Uint8Array,
) {
  let n = range.n0;
  let line = range.firstLine;
  const skipped = { count: 0, lines: [] as number[] };
  for (let pos = range.start; pos < range.end;) {
    const want = Math.min(buf.length, range.end - pos);
    readFully(src, buf.subarray(0, want), pos);
    let cut = want;
    if (pos + want < range.end) {
      cut = buf.lastIndexOf(LF, want - 1) + 1;
      if (cut === 0)
        throw new LogParseError(
          line,
          null,
          `the line is longer than ${groupDigits(range.maxLineBytes)} bytes`,
        );
    }
    const piece = buf.subarray(0, cut);
    if (piece.includes(QUOTE)) throw new QuoteInPiece();
    const r = parseBody(piece, mapping, header, columns, cap, {
      start: 0,
      end: cut,
      firstLine: line,
      n0: n,
      maxLineBytes: range.maxLineBytes,
      fixedCapacity: true,
    });
    n = r.n;
    line = r.line;
    skipped.count += r.skipped.count;
    for (const l of r.skipped.lines) if (skipped.lines.length < 5) skipped.lines.push(l);
    pos += cut;
    range.onProgress?.((pos - range.start) / Math.max(1, range.end - range.start));
  }
  return { n, line, skipped };
}

/** Reads one range of a source's lines into shared columns (the second thread's half of parseLogCsvSource). */
export function parseLogCsvSourceRange(job: CsvSourceRangeJob, src: ByteSource): CsvRangeResult {
  const header: HeaderInfo = { ...job.header, sample: [] };
  const buf = new Uint8Array(job.pieceBytes);
  const r = parseSourceBody(
    src,
    job.mapping,
    header,
    job.columns,
    job.cap,
    {
      start: job.start,
      end: job.end,
      firstLine: 0,
      n0: job.n0,
      maxLineBytes: job.maxLineBytes,
      fixedCapacity: true,
    },
    buf,
  );
  return { n: r.n, skipped: r.skipped };
}

/**
 * parseLogCsvParallel for a log that is never held whole in memory: read from `src` a piece at a time
 * (SOURCE_PIECE_BYTES), the first half of the lines by this thread and the second by `second` (which opens
 * the same file), into one set of shared columns; only the columns and two pieces are in memory, not the
 * file. Same columns, skipped points and errors as parseLogCsv of the whole file (tested both ways). The
 * lines are counted first (a pass over the file) to size the columns. A file with a double quote below its
 * header (a quoted field may hold a line break), or a failing second thread, is read whole by `whole`.
 */
export async function parseLogCsvSource(
  src: ByteSource,
  file: string,
  mapping: ColumnMapping,
  second: (job: CsvSourceRangeJob) => Promise<CsvRangeResult>,
  whole: () => Uint8Array,
  opts: { onProgress?(fraction: number): void; maxLineBytes?: number; pieceBytes?: number } = {},
): Promise<LogColumns & { skipped: { count: number; lines: number[] } }> {
  const maxLineBytes = opts.maxLineBytes ?? DEFAULT_MAX_LINE_BYTES;
  const pieceBytes = Math.max(opts.pieceBytes ?? SOURCE_PIECE_BYTES, 2 * maxLineBytes + 2);
  const size = src.size;
  const readWhole = () => parseLogCsv(whole(), mapping, opts);
  // One piece buffer for the header, the middle and the counting (the header keeps no reference to it).
  const buf = new Uint8Array(pieceBytes);
  const head = buf.subarray(0, Math.min(size, pieceBytes));
  readFully(src, head, 0);
  const header = headerOf(head, 0, maxLineBytes);
  // A header that does not end inside the first piece, or a file of one piece: read whole.
  if (header.dataStart >= head.length || size <= pieceBytes) return readWhole();
  checkMapping(mapping, header.columns);
  // The line break nearest the middle of the lines below the header splits them between the two threads.
  const half = header.dataStart + ((size - header.dataStart) >> 1);
  const window = buf.subarray(0, Math.min(buf.length, size - half));
  readFully(src, window, half);
  const lf = window.indexOf(LF);
  if (lf < 0 || half + lf + 1 >= size) return readWhole();
  const mid = half + lf + 1;
  const firstCap = countSourceLineBreaks(src, header.dataStart, mid, buf);
  const last = new Uint8Array(1);
  readFully(src, last, size - 1);
  const cap = firstCap + countSourceLineBreaks(src, mid, size, buf) + (last[0] !== LF ? 1 : 0);
  const out = allocate(mapping, cap, true);
  const job: CsvSourceRangeJob = {
    file,
    header: {
      columns: header.columns,
      delimiter: header.delimiter,
      dataStart: header.dataStart,
      dataLine: header.dataLine,
    },
    pieceBytes,
    mapping,
    start: mid,
    end: size,
    n0: firstCap,
    maxLineBytes,
    columns: out,
    cap,
  };
  const pending = settledOf(second(job));
  let first: ReturnType<typeof parseSourceBody>;
  try {
    first = parseSourceBody(
      src,
      mapping,
      header,
      out,
      cap,
      {
        start: header.dataStart,
        end: mid,
        firstLine: header.dataLine,
        n0: 0,
        maxLineBytes,
        fixedCapacity: true,
        onProgress: opts.onProgress ? (f) => opts.onProgress!(f / 2) : undefined,
      },
      buf,
    );
  } catch (err) {
    await pending; // the second thread is done with the columns before they are dropped
    if (err instanceof QuoteInPiece) return readWhole();
    throw err; // an error in the first half comes before anything in the second
  }
  const linesBefore = first.line;
  const done = await pending;
  let secondPart: CsvRangeResult;
  if (done.ok) secondPart = done.r;
  else if (done.err instanceof LogParseError)
    throw new LogParseError(done.err.line + linesBefore, done.err.column, done.err.detail);
  else return readWhole(); // a quote in the second half, or the second thread failed
  opts.onProgress?.(1);
  return joinHalves(mapping, header.columns, out, firstCap, first, secondPart, linesBefore);
}

/** A promise's outcome, never rejected: the first thread waits for the second whatever happens. */
const settledOf = <T>(p: Promise<T>) =>
  p.then(
    (r) => ({ ok: true as const, r }),
    (err: unknown) => ({ ok: false as const, err }),
  );

/**
 * The two halves' rows as one log: the second half was written from an upper bound of the first half's
 * points on (`firstCap`), so a gap (blank or skipped lines in the first half) is closed; then the units'
 * factors, and the skipped points with the second half's line numbers made absolute.
 */
function joinHalves(
  mapping: ColumnMapping,
  columns: string[],
  out: LogColumns,
  firstCap: number,
  first: { n: number; skipped: { count: number; lines: number[] } },
  secondPart: CsvRangeResult,
  linesBefore: number,
) {
  let n = secondPart.n;
  if (first.n < firstCap) {
    const gap = firstCap - first.n;
    mapArrays(out, n, (a) => {
      a.copyWithin(first.n, firstCap, n);
      return a;
    });
    n -= gap;
  }
  applyUnitFactors(mapping, columns, out, n);
  const skipped = {
    count: first.skipped.count + secondPart.skipped.count,
    lines: [...first.skipped.lines, ...secondPart.skipped.lines.map((l) => l + linesBefore)].slice(0, 5),
  };
  return { ...shrink(out, n), skipped };
}

/** The units' factors, one column at a time (value × mul ÷ div: the same arithmetic as shared/units.ts). */
function applyUnitFactors(mapping: ColumnMapping, columns: string[], out: LogColumns, n: number) {
  const plan = makePlan(mapping, columns, out);
  for (let k = 0; k < columns.length; k++) {
    const mul = plan.mul[k];
    const div = plan.div[k];
    if (plan.kind[k] !== K_NUMBER || (mul === 1 && div === 1)) continue;
    const a = plan.num[k];
    for (let i = 0; i < n; i++) a[i] = (a[i] * mul) / div;
  }
}

type BodyRange = {
  start: number;
  end: number;
  firstLine: number;
  n0: number;
  maxLineBytes: number;
  /** The columns were sized for every line of the range: never grown (they may be shared). */
  fixedCapacity?: boolean;
  onProgress?(fraction: number): void;
};

/**
 * The lines of [start, end) (end just after an LF, or the end of the file) into `columns` from row n0 on,
 * before the units' factors. Answers the columns (new ones if they had to grow), the row after the last
 * point, the line number after the range and the skipped points.
 */
function parseBody(
  b: Uint8Array,
  mapping: ColumnMapping,
  header: HeaderInfo,
  columns0: LogColumns,
  cap0: number,
  range: BodyRange,
) {
  const { columns, delimiter } = header;
  const maxLineBytes = range.maxLineBytes;
  const len = b.length;
  const end = range.end;
  const delim = delimiter.charCodeAt(0);
  const decimalComma = delimiter === ';';
  let cap = cap0;
  let out = columns0;
  let plan = makePlan(mapping, columns, out);
  let tCol = out.t;
  let lonCol = out.lon;
  let latCol = out.lat;
  const grow = () => {
    if (range.fixedCapacity) throw new Error('the columns were sized too small for the lines');
    cap = Math.ceil(cap * 1.5) + 64;
    out = grown(out, cap);
    plan = makePlan(mapping, columns, out);
    tCol = out.t;
    lonCol = out.lon;
    latCol = out.lat;
  };
  const last = columns.length - 1;
  const skipped = { count: 0, lines: [] as number[] };

  const tooLong = (line: number) =>
    new LogParseError(line, null, `the line is longer than ${groupDigits(maxLineBytes)} bytes`);

  // Lines ending before the last LF are tried by the hot loop first (fastLine); anything it does not read
  // goes through the field-by-field path below, which gives the same values and the messages.
  const safeEnd = b.lastIndexOf(LF) + 1;
  const fast = new FastRow(plan, delim, decimalComma, len);

  let n = range.n0;
  let line = range.firstLine;
  let p = range.start;
  while (p < end) {
    const lineStart = p;
    if ((line & 0xffff) === 0) range.onProgress?.(p / len);
    if (n === cap) {
      grow();
      fast.plan = plan;
    }
    let c = b[p];
    if (c === LF || (c === CR && (p + 1 === len || b[p + 1] === LF))) {
      p += c === CR ? 2 : 1; // a blank line
      line++;
      continue;
    }
    if (p < safeEnd) {
      const q = fastLine(b, p, n, fast);
      if (q >= 0) {
        if (q - lineStart > maxLineBytes + 1) throw tooLong(line);
        p = q;
        if (Number.isNaN(tCol[n]) || Number.isNaN(lonCol[n]) || Number.isNaN(latCol[n])) {
          skipped.count++;
          if (skipped.lines.length < 5) skipped.lines.push(line);
        } else n++;
        line++;
        continue;
      }
    }
    // The fast path: field by field over the bytes. `fail` says why it stopped: 1 a field did not read,
    // 2 the line ended early, 3 something odd after the last column.
    let col = 0;
    let fail = 0;
    for (;;) {
      const q = readField(b, p, len, delim, decimalComma, plan, col, n);
      if (q < 0) {
        fail = 1;
        break;
      }
      p = q;
      c = p < len ? b[p] : -1;
      if (col === last) {
        // Extra fields (a trailing separator, say) are passed over.
        while (c !== LF && c !== -1 && c !== QUOTE && c !== CR) c = ++p < len ? b[p] : -1;
        if (c === CR) c = ++p < len ? b[p] : -1;
        if (c !== LF && c !== -1) fail = 3;
        break;
      }
      if (c !== delim) {
        fail = c === LF || c === -1 || (c === CR && (p + 1 === len || b[p + 1] === LF)) ? 2 : 3;
        break;
      }
      p++;
      col++;
    }
    if (fail === 0) {
      if (p < len) p++; // past the LF
      if (p - lineStart > maxLineBytes + 1) throw tooLong(line);
    } else {
      // The whole line: blank, or holding a quote (papaparse reads it), or wrong.
      const nl = b.indexOf(LF, lineStart);
      const lineEnd = nl < 0 ? len : nl;
      if (lineEnd - lineStart > maxLineBytes + 1) throw tooLong(line);
      if (isBlank(b, lineStart, lineEnd)) {
        p = lineEnd + 1;
        line++;
        continue;
      }
      if (b.subarray(lineStart, lineEnd).includes(QUOTE)) {
        const r = recordEnd(b, lineStart, delim, maxLineBytes, line, columns);
        const fields = splitRecord(recordText(b, lineStart, r.end), delimiter, line, columns);
        if (fields.length < columns.length) throw tooFewFields(plan, fields.length, line);
        for (let k = 0; k < columns.length; k++)
          if (plan.kind[k] !== K_SKIP) readTextField(fields[k], delimiter, plan, k, n, line);
        p = r.end;
        line += r.breaks;
      } else if (fail === 2) throw tooFewFields(plan, col + 1, line);
      else if (fail === 1) {
        let e = p;
        while (e < lineEnd && b[e] !== delim && b[e] !== CR) e++;
        throw fieldError(utf8.decode(b.subarray(p, e)), plan, col, line);
      } else throw new LogParseError(line, null, 'a carriage return stands in the middle of the line');
    }
    if (Number.isNaN(tCol[n]) || Number.isNaN(lonCol[n]) || Number.isNaN(latCol[n])) {
      skipped.count++;
      if (skipped.lines.length < 5) skipped.lines.push(line);
    } else n++;
    line++;
  }
  return { out, n, line, skipped };
}

/* ------------------------------------------------------------------ writer */

export type LogCsvUnits = {
  time?: 'iso' | 'epoch-s' | 'epoch-ms';
  rate?: RateUnit;
  speed?: 'mph' | 'km/h' | 'm/s';
  width?: 'ft' | 'in' | 'm';
  delimiter?: CsvDelimiter;
  /** Fixed decimals per kind of column (in the written unit); default: the shortest text that reads back exactly. */
  decimals?: Partial<Record<'time' | 'position' | 'heading' | 'rate' | 'speed' | 'width' | 'rows', number>>;
};

const SOURCE_NAMES = ['unknown', 'wheel', 'radar', 'gnss'];

/**
 * The log as CSV text with its units in the header ("target (seeds/ac)", "wheel speed (mph)"), one line a
 * point, NaN as an empty field; suggestMapping recognises every header it writes. Default units: epoch
 * seconds, seeds/ac, m/s, m.
 */
export function logToCsv(c: LogColumns, units: LogCsvUnits = {}): string {
  const time = units.time ?? 'epoch-s';
  const rate = units.rate ?? 'seeds/ac';
  const speed = units.speed ?? 'm/s';
  const width = units.width ?? 'm';
  const sep = units.delimiter ?? ',';
  const dec = units.decimals ?? {};
  const num = (d: number | undefined) => (v: number) =>
    Number.isFinite(v) ? (d === undefined ? String(v) : v.toFixed(d)) : '';
  const rateSi = RATE_UNIT_DEFS[rate].si;
  const speedOut = (v: number) => (speed === 'mph' ? v / MPS_PER_MPH : speed === 'km/h' ? v * 3.6 : v);
  const widthOut = (v: number) => (width === 'ft' ? v / M_PER_FT : width === 'in' ? v / M_PER_IN : v);
  const timeNum = num(dec.time);
  const timeOut =
    time === 'iso'
      ? (v: number) => (Number.isFinite(v) ? new Date(v * 1000).toISOString() : '')
      : time === 'epoch-ms'
        ? (v: number) => timeNum(v * 1000)
        : timeNum;
  const cols: { name: string; get: (i: number) => string }[] = [];
  const add = <T extends Float64Array | Uint8Array>(name: string, a: T | null, f: (v: number) => string) => {
    if (a) cols.push({ name, get: (i) => f(a[i]) });
  };
  const pos = num(dec.position);
  const rateText = num(dec.rate);
  const speedText = num(dec.speed);
  add(`time (${time})`, c.t, timeOut);
  add('lon', c.lon, pos);
  add('lat', c.lat, pos);
  add('heading (deg)', c.heading, num(dec.heading));
  add(`target (${rate})`, c.target, (v) => rateText(v / rateSi));
  add(`applied (${rate})`, c.applied, (v) => rateText(v / rateSi));
  add(`speed (${speed})`, c.speedMps, (v) => speedText(speedOut(v)));
  add(`wheel speed (${speed})`, c.wheelMps, (v) => speedText(speedOut(v)));
  add(`gnss speed (${speed})`, c.gnssMps, (v) => speedText(speedOut(v)));
  add('speed source', c.speedSource, (v) => SOURCE_NAMES[v] ?? 'unknown');
  add(`width (${width})`, c.widthM, (v) => num(dec.width)(widthOut(v)));
  add('sections on', c.sectionsOn, num(undefined));
  add('work', c.workOn, (v) => String(v));
  for (const r of c.rows) add(`row ${r.row} ${r.kind}`, r.values, num(dec.rows));
  const lines: string[] = [cols.map((k) => k.name).join(sep)];
  for (let i = 0; i < c.n; i++) {
    let s = cols[0].get(i);
    for (let k = 1; k < cols.length; k++) s += sep + cols[k].get(i);
    lines.push(s);
  }
  return `${lines.join('\n')}\n`;
}
