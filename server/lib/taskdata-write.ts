import { ZipFile } from 'yazl';
import type { MultiPolygon, Position } from 'geojson';
import { rewindRfc7946 } from '../../shared/geo/rewind';
import type { RateKind } from '../../shared/rates/rate-units';
import {
  DDI_SETPOINT_COUNT_PER_AREA,
  DDI_SETPOINT_MASS_PER_AREA,
  DDI_SETPOINT_VOLUME_PER_AREA,
  ddi11Value,
} from '../../shared/rates/seed-units';

/**
 * An ISO 11783-10 task data writer of our own (FORMATS.md "ISO 11783-10 task data"): TASKDATA/TASKDATA.XML and,
 * for a grid, TASKDATA/GRD00001.BIN, zipped.
 *
 * What was checked and what was not:
 * - Checked against the public ISO 11783-11 data dictionary (and DOMAIN.md §8): DDI 1 setpoint volume per area
 *   application rate in mm³/m², DDI 6 setpoint mass per area in mg/m², DDI 11 setpoint count per area at a
 *   resolution of 0.001 /m² (34 000 seeds/ac → 8402).
 * - From memory, not verified against ISO 11783-10 itself (its XML schema is not public): the element and
 *   attribute letters (CTR A/B; FRM A/B/I customer; CTP A/B; PFD A id, C designator, D area m², E customer,
 *   F farm, G crop type; PDT A/B; TSK A id, B designator, C customer, D farm, E partfield, G status 1 =
 *   planned, H default, I position-lost, J out-of-field zone code; TZN A code 0–254, B designator; PDV A DDI
 *   as 4 hex digits, B value, C product; PLN A 1 = partfield boundary, 2 = treatment zone; LSG A 1 = exterior,
 *   2 = interior; PNT A 2 = "other", C latitude, D longitude; GRD A minimum latitude, B minimum longitude, C/D
 *   cell size north/east in degrees, E columns, F rows, G file name without extension, H file length, I type,
 *   J treatment zone code), the 32-character limit on designators, the 9 decimals of a position, rings
 *   written closed, and the grid file layout: type 2 holds, for every cell from the south-west, row by row
 *   west to east, one little-endian signed 32-bit value for each PDV of the TZN that GRD J names, no header
 *   (type 1 would hold one treatment-zone code byte per cell instead). Rings are wound as RFC 7946 does; we
 *   know of no rule in the standard for it.
 */

/** The DDI (ISO 11783-11) of a setpoint application rate for each kind of product (DOMAIN.md §8). */
export const RATE_DDI: Record<RateKind, number> = {
  count: DDI_SETPOINT_COUNT_PER_AREA,
  mass: DDI_SETPOINT_MASS_PER_AREA,
  volume: DDI_SETPOINT_VOLUME_PER_AREA,
};

const INT32_MAX = 2 ** 31 - 1;

/**
 * An SI rate as the integer its DDI carries: seeds/m² × 1000 (DDI 11), kg/m² × 10⁶ = mg/m² (DDI 6),
 * m³/m² × 10⁹ = mm³/m² (DDI 1). Throws for a value a 32-bit process-data value cannot hold.
 */
export function ddiValue(kind: RateKind, rateSi: number): number {
  const v = kind === 'count' ? ddi11Value(rateSi) : Math.round(rateSi * (kind === 'mass' ? 1e6 : 1e9));
  if (!Number.isFinite(v) || v < 0 || v > INT32_MAX) {
    throw new RangeError(`A rate of ${rateSi} (${kind} per m²) cannot be written as ISO 11783 process data`);
  }
  return v;
}

/** The DDI as ISO 11783-10 writes it: 4 upper-case hex digits (11 → "000B"). */
export const ddiHex = (ddi: number) => ddi.toString(16).toUpperCase().padStart(4, '0');

export type TaskDataZone = {
  /** Treatment-zone code, 0–254, unique in the task. */
  code: number;
  designator: string;
  /** Integer in DDI units (see {@link ddiValue}). */
  value: number;
  /** The zone's polygons (PLN type 2), or null for a zone with no area of its own (default, out of field). */
  geometry: MultiPolygon | null;
};

export type TaskDataGrid = {
  minLat: number;
  minLon: number;
  cellLatDeg: number;
  cellLonDeg: number;
  columns: number;
  rows: number;
  /** One value per cell in DDI units, row-major from the south-west. */
  values: Int32Array;
  /** The TZN whose single PDV says what the values are. */
  templateZoneCode: number;
};

export type TaskDataInput = {
  customer: string;
  farm: string;
  field: { designator: string; boundary: MultiPolygon; areaM2: number };
  crop: string | null;
  product: string;
  task: string;
  ddi: number;
  zones: TaskDataZone[];
  defaultZoneCode: number;
  positionLostZoneCode: number;
  outOfFieldZoneCode: number;
  grid: TaskDataGrid | null;
  softwareVersion?: string;
};

/** The grid's binary file name, without extension in GRD G (from memory: 8 characters, "GRD" + 5 digits). */
export const GRID_FILE = 'GRD00001';

/** Designators longer than this are cut (from memory: ISO 11783-10 designators are at most 32 characters). */
const DESIGNATOR_MAX = 32;

/** Characters XML 1.0 cannot hold: C0 controls but tab, line feed and return; lone surrogates; U+FFFE/U+FFFF. */
const NOT_XML =
  // eslint-disable-next-line no-control-regex -- finding the controls XML 1.0 forbids is the point
  /[\0-\x08\x0B\x0C\x0E-\x1F\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

/**
 * Text for an XML attribute: characters XML 1.0 cannot hold dropped (a U+FFFD in their place would read as an
 * encoding fault), the five special characters and the white-space controls escaped. Non-ASCII stays as it is.
 */
export function xmlAttr(text: string): string {
  return text
    .replace(NOT_XML, '')
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/\t/g, '&#9;')
    .replace(/\n/g, '&#10;')
    .replace(/\r/g, '&#13;');
}

/** A designator: what XML can hold, trimmed, at most {@link DESIGNATOR_MAX} characters (code points). */
const designator = (text: string) =>
  Array.from(text.replace(NOT_XML, '').trim()).slice(0, DESIGNATOR_MAX).join('');

function element(
  name: string,
  attrs: Record<string, string | number | null | undefined>,
  children: string[] = [],
) {
  const a = Object.entries(attrs)
    .filter(([, v]) => v !== null && v !== undefined && v !== '')
    .map(([k, v]) => ` ${k}="${xmlAttr(String(v))}"`)
    .join('');
  return children.length ? `<${name}${a}>${children.join('')}</${name}>` : `<${name}${a}/>`;
}

/** Degrees with 9 decimals (about 0.1 mm). */
const deg = (v: number) => v.toFixed(9);
/** A cell size in degrees, enough digits that a thousand cells add up within a millimetre. */
const cellDeg = (v: number) => v.toFixed(15).replace(/0+$/, '').replace(/\.$/, '');

function closedRing(ring: Position[]): Position[] {
  const f = ring[0];
  const l = ring[ring.length - 1];
  return f[0] === l[0] && f[1] === l[1] ? ring : [...ring, f];
}

/** One PLN per polygon part: LSG 1 the exterior, LSG 2 each hole, points PNT type 2. */
function polygons(geometry: MultiPolygon, type: 1 | 2): string[] {
  return rewindRfc7946(geometry)
    .coordinates.filter((rings) => rings.length > 0 && rings[0].length >= 3)
    .map((rings) =>
      element(
        'PLN',
        { A: type },
        rings.map((ring, i) =>
          element(
            'LSG',
            { A: i === 0 ? 1 : 2 },
            closedRing(ring).map(([lon, lat]) => element('PNT', { A: 2, C: deg(lat), D: deg(lon) })),
          ),
        ),
      ),
    );
}

function checkCodes(input: TaskDataInput) {
  const codes = new Set<number>();
  for (const z of input.zones) {
    if (!Number.isInteger(z.code) || z.code < 0 || z.code > 254) {
      throw new RangeError(
        `Treatment zone "${z.designator}" has code ${z.code}; ISO 11783-10 allows 0 to 254`,
      );
    }
    if (codes.has(z.code)) throw new RangeError(`Two treatment zones share code ${z.code}`);
    if (!Number.isInteger(z.value) || z.value < 0 || z.value > INT32_MAX) {
      throw new RangeError(
        `Treatment zone "${z.designator}" has a value ${z.value} that is not a 32-bit integer`,
      );
    }
    codes.add(z.code);
  }
  const refs: [string, number][] = [
    ['default', input.defaultZoneCode],
    ['position-lost', input.positionLostZoneCode],
    ['out-of-field', input.outOfFieldZoneCode],
  ];
  if (input.grid) refs.push(['grid template', input.grid.templateZoneCode]);
  for (const [what, code] of refs) {
    if (!codes.has(code)) throw new RangeError(`The ${what} treatment zone code ${code} names no zone`);
  }
}

/** TASKDATA.XML as text (UTF-8 when encoded). */
export function taskDataXml(input: TaskDataInput): string {
  checkCodes(input);
  const ids = { ctr: 'CTR1', frm: 'FRM1', ctp: 'CTP1', pfd: 'PFD1', pdt: 'PDT1', tsk: 'TSK1' };
  const tzns = input.zones.map((z) =>
    element('TZN', { A: z.code, B: designator(z.designator) }, [
      element('PDV', { A: ddiHex(input.ddi), B: z.value, C: ids.pdt }),
      ...(z.geometry ? polygons(z.geometry, 2) : []),
    ]),
  );
  const grid = input.grid
    ? [
        element('GRD', {
          A: deg(input.grid.minLat),
          B: deg(input.grid.minLon),
          C: cellDeg(input.grid.cellLatDeg),
          D: cellDeg(input.grid.cellLonDeg),
          E: input.grid.columns,
          F: input.grid.rows,
          G: GRID_FILE,
          H: input.grid.columns * input.grid.rows * 4,
          I: 2,
          J: input.grid.templateZoneCode,
        }),
      ]
    : [];
  const children = [
    element('CTR', { A: ids.ctr, B: designator(input.customer) }),
    element('FRM', { A: ids.frm, B: designator(input.farm), I: ids.ctr }),
    ...(input.crop ? [element('CTP', { A: ids.ctp, B: designator(input.crop) })] : []),
    element('PDT', { A: ids.pdt, B: designator(input.product) }),
    element(
      'PFD',
      {
        A: ids.pfd,
        C: designator(input.field.designator),
        D: Math.round(input.field.areaM2),
        E: ids.ctr,
        F: ids.frm,
        G: input.crop ? ids.ctp : null,
      },
      polygons(input.field.boundary, 1),
    ),
    element(
      'TSK',
      {
        A: ids.tsk,
        B: designator(input.task),
        C: ids.ctr,
        D: ids.frm,
        E: ids.pfd,
        G: 1,
        H: input.defaultZoneCode,
        I: input.positionLostZoneCode,
        J: input.outOfFieldZoneCode,
      },
      [...tzns, ...grid],
    ),
  ];
  const root = element(
    'ISO11783_TaskData',
    {
      VersionMajor: 4,
      VersionMinor: 3,
      ManagementSoftwareManufacturer: 'Sowright',
      ManagementSoftwareVersion: input.softwareVersion,
      DataTransferOrigin: 1,
    },
    children,
  );
  return `<?xml version="1.0" encoding="UTF-8"?>\n${root}\n`;
}

/** The grid's binary file: one little-endian signed 32-bit value per cell, row 0 south, west to east. */
export function gridBinary(grid: TaskDataGrid): Buffer {
  const cells = grid.columns * grid.rows;
  if (grid.values.length !== cells) {
    throw new RangeError(`The grid has ${grid.values.length} values for ${cells} cells`);
  }
  const b = Buffer.alloc(cells * 4);
  for (let i = 0; i < cells; i++) b.writeInt32LE(grid.values[i], i * 4);
  return b;
}

/** TASKDATA/TASKDATA.XML (and TASKDATA/GRD00001.BIN for a grid), zipped. */
export function zipTaskData(input: TaskDataInput, mtime = new Date()): Promise<Buffer> {
  const zip = new ZipFile();
  zip.addBuffer(Buffer.from(taskDataXml(input), 'utf8'), 'TASKDATA/TASKDATA.XML', { mtime });
  if (input.grid) zip.addBuffer(gridBinary(input.grid), `TASKDATA/${GRID_FILE}.BIN`, { mtime });
  zip.end();
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    zip.outputStream.on('data', (c: Buffer) => chunks.push(c));
    zip.outputStream.on('error', reject);
    zip.outputStream.on('end', () => resolve(Buffer.concat(chunks)));
  });
}
