import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  LogParseError,
  logToCsv,
  parseLogCsv,
  readCsvHeader,
  suggestMapping,
  type LogCsvUnits,
} from '../../shared/audit/csv-log';
import { SPEED_SOURCE_CODE, type LogColumns } from '../../shared/audit/log-columns';
import { RATE_UNITS, rateToSi } from '../../shared/rates/rate-units';
import { mphToMps } from '../../shared/units';
import {
  ROW_VALUE_KINDS,
  columnMappingSchema,
  type ColumnMapping,
} from '../../shared/schemas/as-applied.schema';

const fixture = (name: string) =>
  new Uint8Array(readFileSync(new URL(`../../fixtures/logs/${name}`, import.meta.url)));
const bytes = (text: string) => new TextEncoder().encode(text);
const suggested = (b: Uint8Array) => {
  const h = readCsvHeader(b);
  return suggestMapping(h.columns, h.sample);
};
/** The error a call throws (fails the test when it throws none or another kind). */
function parseErrorOf(f: () => unknown): LogParseError {
  try {
    f();
  } catch (err) {
    expect(err).toBeInstanceOf(LogParseError);
    return err as LogParseError;
  }
  throw new Error('expected a LogParseError');
}

/** A mapping of the five required fields by column name. */
const basic = (unit: string = 'seeds/ac', time = 'epoch-s'): ColumnMapping => ({
  fields: {
    time: { column: 'time', unit: time },
    lon: { column: 'lon', unit: null },
    lat: { column: 'lat', unit: null },
    target: { column: 'target_rate', unit },
    applied: { column: 'applied_rate', unit },
  },
  rows: [],
});

// Check values. NIST SP 811 B.8 (exact): 1 ac = 4046.8564224 m², 1 mph = 0.44704 m/s, 1 ft = 0.3048 m.
const M2_PER_AC = 4046.8564224; // NIST SP 811 B.8
const SEEDS_M2_34K_AC = 8.40158; // 34 000 / 4046.8564224 = 8.401583 (DOMAIN.md §1, derived), to 5 decimals
const ISO_1300Z = Date.UTC(2027, 3, 28, 13, 0, 0) / 1000; // 2027-04-28T13:00:00Z by the JavaScript Date

describe('readCsvHeader', () => {
  it('reads the columns, a sample and the separator of an ordinary log', () => {
    const h = readCsvHeader(fixture('normal.csv'));
    expect(h.delimiter).toBe(',');
    expect(h.columns).toHaveLength(13);
    expect(h.columns[0]).toBe('Timestamp');
    expect(h.columns[12]).toBe('Row 7 Population');
    expect(h.sample).toHaveLength(5); // the blank line is not a sample row
    expect(h.sample[3][0]).toBe('2027-04-28T13:00:03Z');
    expect(readCsvHeader(fixture('normal.csv'), 2).sample).toHaveLength(2);
  });

  it('detects ; and tab, strips a UTF-8 byte order mark and unquotes names', () => {
    expect(readCsvHeader(fixture('semicolon-decimal-comma.csv')).delimiter).toBe(';');
    const tab = readCsvHeader(bytes('time\tlon\tlat\n1\t2\t3\n'));
    expect(tab).toEqual({ columns: ['time', 'lon', 'lat'], sample: [['1', '2', '3']], delimiter: '\t' });
    const bom = new Uint8Array([0xef, 0xbb, 0xbf, ...bytes('Time,Lon\n1,2\n')]);
    expect(readCsvHeader(bom).columns).toEqual(['Time', 'Lon']);
    const quoted = readCsvHeader(fixture('quoted.csv'));
    expect(quoted.columns[0]).toBe('Date/Time');
    expect(quoted.sample[2][5]).toBe('first line\r\nsecond line');
  });

  it('names both columns of a duplicate header and line 1', () => {
    const err = parseErrorOf(() => readCsvHeader(fixture('duplicate-headers.csv')));
    expect(err.line).toBe(1);
    expect(err.message).toMatch(/^line 1: /);
    expect(err.message).toContain('column 5 "Applied (seeds/ac)"');
    expect(err.message).toContain('column 7 "applied (seeds/ac)"');
  });

  it('refuses an empty file and UTF-16 text', () => {
    expect(parseErrorOf(() => readCsvHeader(new Uint8Array(0))).message).toContain('empty');
    expect(parseErrorOf(() => readCsvHeader(new Uint8Array([0xff, 0xfe, 0x74, 0]))).message).toContain(
      'UTF-16',
    );
  });
});

describe('suggestMapping', () => {
  it('maps every column of the ordinary fixture with its unit', () => {
    const m = suggested(fixture('normal.csv'));
    expect(m.fields).toEqual({
      time: { column: 'Timestamp', unit: 'iso' },
      lon: { column: 'Longitude', unit: null },
      lat: { column: 'Latitude', unit: null },
      heading: { column: 'Heading (deg)', unit: 'deg' },
      wheelSpeed: { column: 'Ground Speed (wheel) [mph]', unit: 'mph' },
      gnssSpeed: { column: 'GPS Speed (mph)', unit: 'mph' },
      speedSource: { column: 'Speed Source', unit: null },
      target: { column: 'Target Rate (seeds/ac)', unit: 'seeds/ac' },
      applied: { column: 'Applied Rate (seeds/ac)', unit: 'seeds/ac' },
      width: { column: 'Swath Width (ft)', unit: 'ft' },
      sectionsOn: { column: 'Sections On', unit: 'count' },
      workOn: { column: 'Work State', unit: null },
    });
    expect(m.rows).toEqual([{ column: 'Row 7 Population', row: 7, kind: 'population' }]);
    expect(columnMappingSchema.safeParse(m).success).toBe(true);
  });

  // The header sets below are invented examples of common naming styles, not copied from any product.
  it('reads units written as trailing words and guesses the rest from the values', () => {
    const columns = [
      'datetime',
      'lng',
      'lat',
      'rx_rate_seeds_ha',
      'as-applied_seeds_ha',
      'speed_kmh',
      'swath_m',
      'time_ms',
    ];
    const m = suggestMapping(columns, [
      ['1808917200000', '-93.6', '42', '84000', '83900', '8.0', '18.3', '5'],
    ]);
    expect(m.fields.time).toEqual({ column: 'datetime', unit: 'epoch-ms' }); // 1.8e12: milliseconds by size
    expect(m.fields.lon?.column).toBe('lng');
    expect(m.fields.target).toEqual({ column: 'rx_rate_seeds_ha', unit: 'seeds/ha' });
    expect(m.fields.applied).toEqual({ column: 'as-applied_seeds_ha', unit: 'seeds/ha' });
    expect(m.fields.speed).toEqual({ column: 'speed_kmh', unit: 'km/h' });
    expect(m.fields.width).toEqual({ column: 'swath_m', unit: 'm' });
  });

  it('tells epoch seconds from milliseconds and thousands of seeds from seeds by size', () => {
    const columns = ['time', 'x', 'y', 'target', 'actual', 'population'];
    const secs = suggestMapping(columns, [['1808917200', '-93.6', '42', '34', '33.9', '33.8']]);
    expect(secs.fields.time?.unit).toBe('epoch-s');
    expect(secs.fields.lon?.column).toBe('x');
    expect(secs.fields.lat?.column).toBe('y');
    expect(secs.fields.target?.unit).toBe('kseeds/ac'); // below 200: thousands
    expect(secs.fields.applied).toEqual({ column: 'actual', unit: 'kseeds/ac' }); // the first applied-like column
    const ms = suggestMapping(columns, [['1808917200000', '-93.6', '42', '34000', '33900', '']]);
    expect(ms.fields.time?.unit).toBe('epoch-ms');
    expect(ms.fields.target?.unit).toBe('seeds/ac');
  });

  it('tells the speeds apart and finds per-row columns', () => {
    const columns = [
      'Time',
      'Longitude',
      'Latitude',
      'Course',
      'Radar Speed (mph)',
      'GNSS Speed [m/s]',
      'Speed Src',
      'Target Population',
      'Population',
      'Rows On',
      'Planting',
      'row_7_singulation',
      'r7 load',
      'Row 12 Population',
      'Row 3 Vacuum (inH2O)',
    ];
    const m = suggestMapping(columns, [
      [
        '2027-04-28 08:00:00-05:00',
        '-93.6',
        '42',
        '90',
        '5',
        '2.2',
        'radar',
        '34000',
        '33800',
        '24',
        'on',
        '99',
        '80',
        '33000',
        '15',
      ],
    ]);
    expect(m.fields.time?.unit).toBe('iso');
    expect(m.fields.heading?.column).toBe('Course');
    expect(m.fields.wheelSpeed).toEqual({ column: 'Radar Speed (mph)', unit: 'mph' });
    expect(m.fields.gnssSpeed).toEqual({ column: 'GNSS Speed [m/s]', unit: 'm/s' });
    expect(m.fields.speedSource?.column).toBe('Speed Src');
    expect(m.fields.target?.column).toBe('Target Population');
    expect(m.fields.applied?.column).toBe('Population');
    expect(m.fields.sectionsOn).toEqual({ column: 'Rows On', unit: 'count' });
    expect(m.fields.workOn?.column).toBe('Planting');
    expect(m.rows).toEqual([
      { column: 'row_7_singulation', row: 7, kind: 'singulation' },
      { column: 'r7 load', row: 7, kind: 'load' },
      { column: 'Row 12 Population', row: 12, kind: 'population' },
      { column: 'Row 3 Vacuum (inH2O)', row: 3, kind: 'vacuum' },
    ]);
  });

  it('guesses a speed unit from planting speeds when the name gives none', () => {
    const m = (v: string) => suggestMapping(['speed'], [[v]]).fields.speed?.unit;
    expect(m('5.5')).toBe('mph'); // about 4–7 mph is usual planting speed (common practice)
    expect(m('9.0')).toBe('km/h');
    expect(m('2.4')).toBe('m/s');
  });

  it('leaves out what it does not recognise', () => {
    const m = suggestMapping(['Operator', 'Notes', 'Hybrid'], [['A', 'b', 'c']]);
    expect(m).toEqual({ fields: {}, rows: [] });
  });
});

describe('parseLogCsv: fixtures and SI', () => {
  it('converts the ordinary fixture to SI', () => {
    const b = fixture('normal.csv');
    const c = parseLogCsv(b, suggested(b));
    expect(c.n).toBe(6);
    expect(c.t[0]).toBe(ISO_1300Z);
    expect([...c.t].map((t) => t - ISO_1300Z)).toEqual([0, 1, 2, 3, 4, 5]);
    expect(c.lon[0]).toBe(-93.6001);
    expect(c.lat[5]).toBe(42.0002002);
    expect(c.heading![1]).toBe(90.1);
    expect(c.target[0]).toBeCloseTo(SEEDS_M2_34K_AC, 5);
    expect(c.target[0] * M2_PER_AC).toBeCloseTo(34_000, 9);
    expect(c.applied[0] * M2_PER_AC).toBeCloseTo(33_850, 9);
    expect(c.wheelMps![0]).toBe(2.2352); // 5 mph = 2.2352 m/s exactly (NIST SP 811 B.8)
    expect(c.gnssMps![0]).toBeCloseTo(4.95 * 0.44704, 12); // NIST SP 811 B.8
    expect(c.widthM![0]).toBeCloseTo(18.288, 12); // 60 ft = 18.288 m (NIST SP 811 B.8, exact)
    expect([...c.speedSource!]).toEqual(Array(6).fill(SPEED_SOURCE_CODE.wheel));
    expect([...c.sectionsOn!]).toEqual([24, 24, 24, 24, 24, 12]);
    expect([...c.workOn!]).toEqual([1, 1, 1, 1, 1, 0]);
    expect(c.rows).toHaveLength(1);
    expect(c.rows[0].row).toBe(7);
    expect(c.rows[0].values[1]).toBe(33_400); // per-row values are kept as logged
    expect(c.skipped.count).toBe(0);
    expect(c.speedMps).toBeNull();
  });

  it('reads quoted fields through papaparse: separators and line breaks in quotes, "34,000", CRLF, offsets', () => {
    const b = fixture('quoted.csv');
    const c = parseLogCsv(b, suggested(b));
    expect(c.n).toBe(4);
    // 08:00-05:00 is 13:00Z.
    expect([...c.t].map((t) => t - ISO_1300Z)).toEqual([0, 1, 2, 3]);
    expect(c.lon[2]).toBe(-93.600046);
    expect(c.target[2] * M2_PER_AC).toBeCloseTo(34_000, 9); // "34,000": the comma groups thousands
    expect(c.applied[2] * M2_PER_AC).toBeCloseTo(33_990, 9);
    expect(c.applied[1] * M2_PER_AC).toBeCloseTo(34_100, 9);
    expect(c.wheelMps![0]).toBeCloseTo(8 / 3.6, 14); // km/h ÷ 3.6 (SI definition)
  });

  it('reads ; files with decimal commas', () => {
    const b = fixture('semicolon-decimal-comma.csv');
    const c = parseLogCsv(b, suggested(b));
    expect(c.n).toBe(3);
    expect([...c.t]).toEqual([1_808_053_200, 1_808_053_201, 1_808_053_202.5]); // epoch milliseconds ÷ 1000
    expect(c.lon[0]).toBe(-93.6001);
    expect(c.target[0]).toBeCloseTo(8.4, 12); // 84 000 seeds/ha ÷ 10 000 m²/ha (SI)
    expect(c.applied[0]).toBeCloseTo(8.35005, 12); // 83 500,5 seeds/ha
    expect(c.speedMps![1]).toBeCloseTo(8.1 / 3.6, 14);
    expect(c.widthM![0]).toBe(18.288);
  });

  it('reads thousands of seeds per acre, pounds and litres', () => {
    const text = 'time,lon,lat,target_rate,applied_rate\n1,2,3,34,33.5\n';
    expect(parseLogCsv(bytes(text), basic('kseeds/ac')).target[0]).toBeCloseTo(SEEDS_M2_34K_AC, 5);
    // 60 lb/ac × 0.45359237 kg/lb ÷ 4046.8564224 m²/ac (NIST SP 811 B.8)
    expect(parseLogCsv(bytes(text.replace('34,', '60,')), basic('lb/ac')).target[0]).toBeCloseTo(
      (60 * 0.45359237) / M2_PER_AC,
      15,
    );
    // 34 L/ha = 34 × 10⁻³ m³ / 10⁴ m² (SI)
    expect(parseLogCsv(bytes(text), basic('L/ha')).target[0]).toBeCloseTo(34e-7, 18);
  });

  it('reads ISO times in the forms logs write', () => {
    const at = (s: string) =>
      parseLogCsv(bytes(`time,lon,lat,target_rate,applied_rate\n${s},1,2,3,4\n`), basic('seeds/ac', 'iso'))
        .t[0];
    expect(at('2027-04-28T13:00:00Z')).toBe(ISO_1300Z);
    expect(at('2027-04-28T13:00:00.250Z')).toBe(ISO_1300Z + 0.25);
    expect(at('2027-04-28 15:00:00+02:00')).toBe(ISO_1300Z);
    expect(at('2027-04-28T07:30:00-05:30')).toBe(ISO_1300Z);
    expect(at('2027-04-28T13:00:00')).toBe(ISO_1300Z); // no offset: UTC
    expect(at('2027-04-28T13:00Z')).toBe(ISO_1300Z);
    expect(at('2024-02-29T00:00:00Z')).toBe(Date.UTC(2024, 1, 29) / 1000);
    expect(at('1969-12-31T23:59:59Z')).toBe(-1);
    fc.assert(
      fc.property(
        fc.date({ min: new Date('1900-01-01'), max: new Date('2199-12-31'), noInvalidDate: true }),
        (d) => {
          expect(at(d.toISOString())).toBe(d.getTime() / 1000);
        },
      ),
    );
  });

  it('refuses impossible dates', () => {
    const err = (s: string) =>
      parseErrorOf(() =>
        parseLogCsv(bytes(`time,lon,lat,target_rate,applied_rate\n${s},1,2,3,4\n`), basic('seeds/ac', 'iso')),
      );
    expect(err('2023-02-29T00:00:00Z').message).toBe(
      "line 2: '2023-02-29T00:00:00Z' in column time is not a date and time like 2026-05-01T14:03:07Z",
    );
    expect(err('2027-13-01T00:00:00Z').column).toBe('time');
    expect(err('2027-04-28T25:00:00Z').line).toBe(2);
    expect(err('1808917200').line).toBe(2);
  });

  it('reads every number format exactly as JavaScript does', () => {
    const lon = (s: string) =>
      parseLogCsv(bytes(`time,lon,lat,target_rate,applied_rate\n1,${s},2,3,4\n`), basic()).lon[0];
    for (const s of [
      '+1.5e3',
      '.5',
      '-0.25',
      '1E-3',
      '  12.5 ',
      '007',
      '1.',
      '-93.60012345678901234',
      '1e300',
      '123456789012345678',
    ])
      expect(lon(s)).toBe(Number(s));
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (d) => {
        expect(lon(String(d))).toBe(d === 0 ? 0 : d); // -0 prints as "0"
      }),
      { numRuns: 300 },
    );
    fc.assert(
      fc.property(
        fc.double({ min: -180, max: 180, noNaN: true }),
        fc.integer({ min: 0, max: 12 }),
        (d, k) => {
          expect(lon(d.toFixed(k))).toBe(Number(d.toFixed(k)));
        },
      ),
      { numRuns: 300 },
    );
  });

  it('reads speed sources and work states in words', () => {
    const text =
      'time,lon,lat,target_rate,applied_rate,src,work\n1,2,3,4,5,Wheel,on\n2,2,3,4,5,radar speed,OFF\n3,2,3,4,5,GPS,true\n4,2,3,4,5,GNSS,0\n5,2,3,4,5,,2\n6,2,3,4,5,unknown,no\n';
    const m = basic();
    m.fields.speedSource = { column: 'src', unit: null };
    m.fields.workOn = { column: 'work', unit: null };
    const c = parseLogCsv(bytes(text), m);
    const { wheel, radar, gnss, unknown } = SPEED_SOURCE_CODE;
    expect([...c.speedSource!]).toEqual([wheel, radar, gnss, gnss, unknown, unknown]);
    expect([...c.workOn!]).toEqual([1, 0, 1, 0, 1, 0]);
    const bad = parseErrorOf(() => parseLogCsv(bytes(text.replace('GPS', 'laser')), m));
    expect(bad.message).toBe(
      "line 4: 'laser' in column src is not a speed source (wheel, radar, gnss or gps)",
    );
    const badWork = parseErrorOf(() => parseLogCsv(bytes(text.replace('OFF', 'maybe')), m));
    expect(badWork.message).toBe(
      "line 3: 'maybe' in column work is not a work state (1/0, on/off, true/false)",
    );
  });

  it('skips blank lines, keeps line numbers, passes over extra fields and unmapped columns', () => {
    const text =
      'time,lon,lat,target_rate,applied_rate,note\r\n\r\n1,2,3,4,5,x,\r\n   \r\n\n2,2,3,4,5,"a, b"\r\n3,2,3,4,x5,y\r\n';
    const err = parseErrorOf(() => parseLogCsv(bytes(text), basic()));
    expect(err.line).toBe(7);
    expect(err.column).toBe('applied_rate');
    const c = parseLogCsv(bytes(text.replace('x5', '5')), basic());
    expect(c.n).toBe(3);
    expect([...c.t]).toEqual([1, 2, 3]);
  });

  it('skips points without time or position and counts them; other empty values are NaN', () => {
    const text = 'time,lon,lat,target_rate,applied_rate\n1,2,3,4,5\n2,,3,4,5\n,2,3,4,5\n4,2,3,,\n';
    const c = parseLogCsv(bytes(text), basic());
    expect(c.n).toBe(2);
    expect(c.skipped).toEqual({ count: 2, lines: [3, 4] });
    expect(c.target[1]).toBeNaN();
    expect(c.applied[1]).toBeNaN();
  });

  it('returns exact-length columns', () => {
    const c = parseLogCsv(
      bytes('time,lon,lat,target_rate,applied_rate\n1,2,3,4,5\n\n\n\n2,2,3,4,5'),
      basic(),
    );
    expect(c.n).toBe(2);
    for (const a of [c.t, c.lon, c.lat, c.target, c.applied]) expect(a.length).toBe(2);
  });

  it('reads a line the same on the fast path and through papaparse, in any unit (quotes send a line to papaparse)', () => {
    const m = basic('seeds/ha', 'epoch-ms');
    m.fields.speed = { column: 'speed', unit: 'mph' };
    const head = 'time,lon,lat,target_rate,applied_rate,speed,note\n';
    const rows = [
      '1760000000123,-93.600123456,42.000987654,80000,79876.5,5.25,x',
      '1760000000223, -93.6 ,42,,-0,0.1,y',
      '1760000000323,-93.600123456,42.000987654,1.5e4,007,4.,z',
    ];
    const plain = parseLogCsv(bytes(head + rows.join('\n') + '\n'), m);
    const quoted = parseLogCsv(bytes(head + rows.map((r) => r.replace(/,(\w)$/, ',"$1"')).join('\n')), m);
    expect(quoted).toEqual(plain);
    expect(plain.n).toBe(3);
    // shared/units.ts and rate-units.ts: ms ÷ 1000, mph × 0.44704, seeds/ha ÷ 10 000.
    expect(plain.t[0]).toBe(1760000000123 / 1000);
    expect(plain.speedMps![0]).toBe(mphToMps(5.25));
    expect(plain.target[0]).toBe(rateToSi(80000, 'seeds/ha'));
    expect(plain.applied[0]).toBe(rateToSi(79876.5, 'seeds/ha'));
    expect(Object.is(plain.applied[1], -0)).toBe(true);
    expect(plain.target[1]).toBeNaN();
    expect(plain.target[2]).toBe(rateToSi(15000, 'seeds/ha'));
  });

  it('reads a file wherever it starts in its buffer (the line count reads four bytes at a time)', () => {
    const text = bytes(
      'time,lon,lat,target_rate,applied_rate\n1,2,3,4,5\n2,2,3,4,5\n\n3,2,3,4,5\n4,2,3,4,5\n5,2,3,4,5\n6,2,3,4,5',
    );
    const expected = parseLogCsv(text, basic());
    expect(expected.n).toBe(6);
    for (let offset = 1; offset < 8; offset++) {
      const buffer = new Uint8Array(text.length + 8);
      buffer.set(text, offset);
      const c = parseLogCsv(buffer.subarray(offset, offset + text.length), basic());
      expect(c).toEqual(expected);
      expect(c.t.length).toBe(6);
    }
  });

  it('reports progress as a growing fraction ending at 1', () => {
    const rows = Array.from({ length: 140_000 }, (_, i) => `${i},1,2,3,4`).join('\n');
    const seen: number[] = [];
    const c = parseLogCsv(bytes(`time,lon,lat,target_rate,applied_rate\n${rows}\n`), basic(), {
      onProgress: (f) => seen.push(f),
    });
    expect(c.n).toBe(140_000);
    expect(seen.length).toBeGreaterThanOrEqual(3); // lines 65 536 and 131 072, then the end
    expect(seen.at(-1)).toBe(1);
    for (let i = 1; i < seen.length; i++) expect(seen[i]).toBeGreaterThan(seen[i - 1]);
  });
});

describe('parseLogCsv: bad input names the line and the column', () => {
  it('a value that is not a number (bad-value.csv, line 5)', () => {
    const b = fixture('bad-value.csv');
    const err = parseErrorOf(() => parseLogCsv(b, suggested(b)));
    expect(err.line).toBe(5);
    expect(err.column).toBe('applied_rate');
    expect(err.message).toBe("line 5: 'abc' in column applied_rate is not a number");
  });

  it('prints large line numbers in groups of three', () => {
    const rows = Array.from({ length: 1300 }, (_, i) => `${i},1,2,3,${i === 1202 ? 'abc' : 4}`);
    const err = parseErrorOf(() =>
      parseLogCsv(bytes(`time,lon,lat,target_rate,applied_rate\n${rows.join('\n')}`), basic()),
    );
    expect(err.line).toBe(1204); // the header is line 1, row i is line i + 2
    expect(err.message).toBe("line 1 204: 'abc' in column applied_rate is not a number");
  });

  it('refuses text that only starts like a number', () => {
    for (const bad of ['1.2.3', '1e', '--1', '12abc', 'NaN', '1,5', '0x10', 'Infinity']) {
      const text = `time,lon,lat,target_rate,applied_rate\n1,2,3,4,"${bad}"\n`;
      const err = parseErrorOf(() => parseLogCsv(bytes(text), basic()));
      expect(err.line).toBe(2);
      expect(err.column).toBe('applied_rate');
      expect(err.message).toContain(`'${bad}' in column applied_rate is not a number`);
    }
  });

  it('a line with too few fields (short-line.csv, line 4)', () => {
    const b = fixture('short-line.csv');
    const err = parseErrorOf(() => parseLogCsv(b, suggested(b)));
    expect(err.line).toBe(4);
    expect(err.column).toBe('applied_rate');
    expect(err.message).toBe(
      'line 4: the line has 4 fields but the header has 6 (no value for column applied_rate)',
    );
  });

  it('a quoted value never closed (unterminated-quote.csv, line 4, column note)', () => {
    const b = fixture('unterminated-quote.csv');
    const err = parseErrorOf(() => parseLogCsv(b, suggested(b)));
    expect(err.line).toBe(4);
    expect(err.column).toBe('note');
    expect(err.message).toBe('line 4: a quoted value in column note is never closed');
  });

  it('counts the line breaks inside quotes', () => {
    const text = 'time,lon,lat,target_rate,applied_rate,note\n1,2,3,4,5,"one\ntwo\nthree"\n2,2,3,4,bad,\n';
    expect(parseErrorOf(() => parseLogCsv(bytes(text), basic())).line).toBe(5);
  });

  it('a line longer than the cap', () => {
    const long = 'x'.repeat(300);
    const text = `time,lon,lat,target_rate,applied_rate,note\n1,2,3,4,5,a\n2,2,3,4,5,${long}\n`;
    const err = parseErrorOf(() => parseLogCsv(bytes(text), basic(), { maxLineBytes: 200 }));
    expect(err.line).toBe(3);
    expect(err.message).toBe('line 3: the line is longer than 200 bytes');
    expect(parseLogCsv(bytes(text), basic()).n).toBe(2); // the default cap is 64 KiB
    const quoted = `time,lon,lat,target_rate,applied_rate,note\n1,2,3,4,5,"${long}"\n`;
    expect(parseErrorOf(() => parseLogCsv(bytes(quoted), basic(), { maxLineBytes: 200 })).line).toBe(2);
  });

  it('a mapping that does not fit the file', () => {
    const text = bytes('time,lon,lat,target_rate,applied_rate\n1,2,3,4,5\n');
    const m = basic();
    m.fields.applied = { column: 'Applied', unit: 'seeds/ac' };
    expect(() => parseLogCsv(text, m)).toThrow(
      'The column "Applied" chosen for applied rate is not in the file',
    );
    const noTime = basic();
    delete noTime.fields.time;
    expect(() => parseLogCsv(text, noTime)).toThrow('Choose the column for time');
    const noUnit = basic();
    noUnit.fields.target = { column: 'target_rate', unit: null };
    expect(() => parseLogCsv(text, noUnit)).toThrow('Choose the unit of target rate');
  });
});

/* ------------------------------------------------------------------ writer round trip */

const near = (a: number, b: number) =>
  (Number.isNaN(a) && Number.isNaN(b)) || Math.abs(a - b) <= 1e-12 * Math.max(1, Math.abs(a), Math.abs(b));

const value = fc.oneof(
  { weight: 9, arbitrary: fc.double({ min: -1e6, max: 1e6, noNaN: true }) },
  { weight: 1, arbitrary: fc.constant(Number.NaN) },
);
const f64 = (n: number, v: fc.Arbitrary<number> = value) =>
  fc.array(v, { minLength: n, maxLength: n }).map((a) => Float64Array.from(a));
const u8 = (n: number, max: number) =>
  fc.array(fc.integer({ min: 0, max }), { minLength: n, maxLength: n }).map((a) => Uint8Array.from(a));
const maybe = <T>(a: fc.Arbitrary<T>) => fc.option(a, { nil: null });

const logArb: fc.Arbitrary<LogColumns> = fc.integer({ min: 1, max: 12 }).chain((n) =>
  fc.record({
    n: fc.constant(n),
    t: f64(n, fc.double({ min: 0, max: 4e9, noNaN: true })),
    lon: f64(n, fc.double({ min: -180, max: 180, noNaN: true })),
    lat: f64(n, fc.double({ min: -90, max: 90, noNaN: true })),
    heading: maybe(f64(n)),
    target: f64(n),
    applied: f64(n),
    speedMps: maybe(f64(n)),
    wheelMps: maybe(f64(n)),
    gnssMps: maybe(f64(n)),
    speedSource: maybe(u8(n, 3)),
    widthM: maybe(f64(n)),
    sectionsOn: maybe(f64(n)),
    workOn: maybe(u8(n, 1)),
    rows: fc
      .uniqueArray(
        fc.record({ row: fc.integer({ min: 1, max: 96 }), kind: fc.constantFrom(...ROW_VALUE_KINDS) }),
        {
          maxLength: 3,
          selector: (r) => `${r.row} ${r.kind}`,
        },
      )
      .chain((rows) => fc.tuple(...rows.map((r) => f64(n).map((values) => ({ ...r, values }))))),
  }),
);

const unitsArb: fc.Arbitrary<LogCsvUnits> = fc.record({
  time: fc.constantFrom('epoch-s' as const, 'epoch-ms' as const),
  rate: fc.constantFrom(...RATE_UNITS),
  speed: fc.constantFrom('mph' as const, 'km/h' as const, 'm/s' as const),
  width: fc.constantFrom('ft' as const, 'in' as const, 'm' as const),
  delimiter: fc.constantFrom(',' as const, ';' as const, '\t' as const),
});

function expectSameLog(a: LogColumns, b: LogColumns) {
  expect(b.n).toBe(a.n);
  // Every array of the log: the Float64 ones within printing precision, the Uint8 codes exactly.
  const keys = (Object.keys(a) as (keyof LogColumns)[]).filter((k) => k !== 'rows' && k !== 'n');
  for (const k of keys) {
    const x = a[k] as Float64Array | Uint8Array | null;
    const y = b[k] as Float64Array | Uint8Array | null;
    expect(y === null, k).toBe(x === null);
    if (x instanceof Uint8Array) expect(y).toEqual(x);
    else if (x && y)
      for (let i = 0; i < a.n; i++) expect(near(x[i], y[i]), `${k}[${i}]: ${x[i]} vs ${y[i]}`).toBe(true);
  }
  expect(b.rows.map((r) => [r.row, r.kind])).toEqual(a.rows.map((r) => [r.row, r.kind]));
  a.rows.forEach((r, k) => {
    for (let i = 0; i < a.n; i++) expect(near(r.values[i], b.rows[k].values[i])).toBe(true);
  });
}

describe('logToCsv', () => {
  it('round-trips through parseLogCsv with the suggested mapping, in any units and separator', () => {
    fc.assert(
      fc.property(logArb, unitsArb, (log, units) => {
        const b = bytes(logToCsv(log, units));
        expectSameLog(log, parseLogCsv(b, suggested(b)));
      }),
      { numRuns: 200 },
    );
  });

  it('writes ISO times to the millisecond and fixed decimals when asked', () => {
    const log: LogColumns = {
      n: 1,
      t: Float64Array.of(ISO_1300Z + 0.25),
      lon: Float64Array.of(-93.600012345),
      lat: Float64Array.of(42.000012345),
      heading: null,
      target: Float64Array.of(34_000 / M2_PER_AC),
      applied: Float64Array.of(Number.NaN),
      speedMps: Float64Array.of(2.2352),
      wheelMps: null,
      gnssMps: null,
      speedSource: null,
      widthM: null,
      sectionsOn: null,
      workOn: null,
      rows: [],
    };
    const text = logToCsv(log, { time: 'iso', speed: 'mph', decimals: { position: 7, rate: 0, speed: 2 } });
    expect(text).toBe(
      'time (iso),lon,lat,target (seeds/ac),applied (seeds/ac),speed (mph)\n2027-04-28T13:00:00.250Z,-93.6000123,42.0000123,34000,,5.00\n',
    );
    const back = parseLogCsv(bytes(text), suggested(bytes(text)));
    expect(back.t[0]).toBe(ISO_1300Z + 0.25);
    expect(back.applied[0]).toBeNaN();
  });
});
