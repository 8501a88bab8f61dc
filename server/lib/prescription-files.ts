import type { Feature, MultiPolygon, Polygon, Position } from 'geojson';
import { GeoInputError } from '../../shared/geo/geo-input-error';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import { subtractArea, unionAreas } from '../../shared/geo/polygon-clip';
import { OUT_OF_FIELD, gridCellFeatures, rateGrid, type RateGrid } from '../../shared/geo/rate-grid';
import { rewindRfc7946 } from '../../shared/geo/rewind';
import { RATE_UNIT_DEFS, rateFromSi, type RateKind, type RateUnit } from '../../shared/rates/rate-units';
import { DEFAULT_LINE_NAME, UNCOVERED_MIN_M2 } from '../../shared/rates/totals';
import { M2_PER_AC, M2_PER_HA } from '../../shared/units';
import { safeFileName, writePolygonShapefile, zipShapefile, type DbfField } from './shapefile-write';
import { RATE_DDI, ddiValue, zipTaskData, type TaskDataInput, type TaskDataZone } from './taskdata-write';

/**
 * Prescription files (DEVELOPERS.md "Prescriptions"): GeoJSON, a zipped shapefile and ISO 11783-10 task data,
 * by zone polygons or on a grid of square cells. Pure: everything comes in the input.
 */

export type PrescriptionExportZone = { name: string; rateSi: number; areaM2: number; geometry: MultiPolygon };

export type PrescriptionExportInput = {
  growerName: string;
  farmName: string;
  fieldName: string;
  prescriptionName: string;
  versionNo: number;
  productName: string;
  crop: string | null;
  rateKind: RateKind;
  rateUnit: RateUnit;
  boundary: MultiPolygon;
  boundaryAreaM2: number;
  /** Zones clipped to the boundary, not overlapping, with their ellipsoidal area. */
  zones: PrescriptionExportZone[];
  defaultRateSi: number;
  outOfFieldRateSi: number;
  approvedAt: string | null;
};

export type ExportFile = { body: Buffer; contentType: string; fileName: string };

export type ExportLayout = { layout: 'zones' | 'grid'; cellSizeM: number };

/**
 * Cells in a GeoJSON or shapefile grid at most: each cell is a polygon of its own (about 300 bytes of GeoJSON),
 * so more would make files of hundreds of megabytes. The task-data grid takes up to 2 000 000 (rate-grid.ts).
 */
export const MAX_VECTOR_GRID_CELLS = 250_000;

type Row = { zone: string; rateSi: number; areaM2: number; geometry: MultiPolygon };

type Props = {
  zone: string;
  rate: number;
  unit: RateUnit;
  rate_si: number;
  area_ha: number;
  area_ac: number;
};

/** The attribute fields, in order; shapefile names are the same (all ≤ 10 ASCII characters). */
const fieldsFor = (unit: RateUnit): DbfField[] => [
  { key: 'zone', type: 'C' },
  { key: 'rate', type: 'N', width: 16, decimals: RATE_UNIT_DEFS[unit].decimals },
  { key: 'unit', type: 'C' },
  { key: 'rate_si', type: 'N', width: 24, decimals: 12 },
  { key: 'area_ha', type: 'N', width: 18, decimals: 6 },
  { key: 'area_ac', type: 'N', width: 18, decimals: 6 },
];

const roundTo = (v: number, decimals: number) => {
  const f = 10 ** decimals;
  return Math.round(v * f) / f;
};

function propsOf(row: Row, unit: RateUnit): Props {
  return {
    zone: row.zone,
    rate: roundTo(rateFromSi(row.rateSi, unit), RATE_UNIT_DEFS[unit].decimals),
    unit,
    rate_si: roundTo(row.rateSi, 12),
    area_ha: roundTo(row.areaM2 / M2_PER_HA, 6),
    area_ac: roundTo(row.areaM2 / M2_PER_AC, 6),
  };
}

/** The boundary no zone covers, or null when that is only round-off. */
function uncovered(input: PrescriptionExportInput): MultiPolygon | null {
  const zonesArea = input.zones.reduce((s, z) => s + z.areaM2, 0);
  if (input.boundaryAreaM2 - zonesArea < UNCOVERED_MIN_M2) return null;
  const union = unionAreas(input.zones.map((z) => z.geometry));
  const rest = union ? subtractArea(input.boundary, union) : input.boundary;
  return rest && geodesicAreaM2(rest) >= UNCOVERED_MIN_M2 ? rest : null;
}

/**
 * One row per zone, and one more at the default rate for the part of the boundary no zone covers (a rate
 * controller would otherwise apply whatever default it was last given there).
 */
function zoneRows(input: PrescriptionExportInput): Row[] {
  const rows: Row[] = input.zones.map((z) => ({
    zone: z.name,
    rateSi: z.rateSi,
    areaM2: z.areaM2,
    geometry: z.geometry,
  }));
  const rest = uncovered(input);
  if (rest) {
    rows.push({
      zone: DEFAULT_LINE_NAME,
      rateSi: input.defaultRateSi,
      areaM2: geodesicAreaM2(rest),
      geometry: rest,
    });
  }
  return rows;
}

function gridOf(input: PrescriptionExportInput, cellSizeM: number): RateGrid {
  return rateGrid({
    boundary: input.boundary,
    zones: input.zones.map((z) => ({ geometry: z.geometry, rateSi: z.rateSi, name: z.name })),
    defaultRateSi: input.defaultRateSi,
    outOfFieldRateSi: input.outOfFieldRateSi,
    cellSizeM,
  });
}

/**
 * Positions to `decimals` places, consecutive repeats dropped; a hole that rounding shrinks below a triangle is
 * dropped, an outer ring never (a zone stays in the file even if it is smaller than the rounding).
 */
function roundPositions(g: MultiPolygon, decimals: number): MultiPolygon {
  return {
    type: 'MultiPolygon',
    coordinates: g.coordinates.map((rings) =>
      rings
        .map((ring) =>
          ring
            .map((p): Position => [roundTo(p[0], decimals), roundTo(p[1], decimals)])
            .filter((p, i, all) => i === 0 || p[0] !== all[i - 1][0] || p[1] !== all[i - 1][1]),
        )
        .filter((ring, i) => i === 0 || ring.length >= 4),
    ),
  };
}

const asMulti = (p: Polygon): MultiPolygon => ({ type: 'MultiPolygon', coordinates: [p.coordinates] });

/** One row per grid cell inside the field; `decimals` rounds the corners (the area is of the rounded cell). */
function gridRows(input: PrescriptionExportInput, cellSizeM: number, decimals: number | null): Row[] {
  const grid = gridOf(input, cellSizeM);
  const inside = grid.zoneIndex.reduce((n, z) => (z === OUT_OF_FIELD ? n : n + 1), 0);
  if (inside > MAX_VECTOR_GRID_CELLS) {
    throw new GeoInputError(
      `A grid of ${cellSizeM} m cells has ${inside.toLocaleString('en-US')} cells in this field, more than the ` +
        `${MAX_VECTOR_GRID_CELLS.toLocaleString('en-US')} a GeoJSON or shapefile grid may hold: choose larger cells ` +
        'or the task-data format',
    );
  }
  return gridCellFeatures(
    grid,
    input.zones.map((z) => z.name),
    DEFAULT_LINE_NAME,
  ).map((f) => {
    const geometry = decimals === null ? asMulti(f.geometry) : roundPositions(asMulti(f.geometry), decimals);
    return {
      zone: f.properties.zone,
      rateSi: f.properties.rateSi,
      areaM2: geodesicAreaM2(geometry),
      geometry,
    };
  });
}

function baseName(input: PrescriptionExportInput, opts: ExportLayout): string {
  const base = safeFileName([input.growerName, input.fieldName, input.productName, `v${input.versionNo}`]);
  return opts.layout === 'grid' ? `${base}-grid` : base;
}

const fileDate = (input: PrescriptionExportInput) =>
  input.approvedAt ? new Date(input.approvedAt) : new Date();

/**
 * RFC 7946 GeoJSON: exterior rings counter-clockwise, 7 decimals (about 1 cm), no `crs`; one MultiPolygon
 * feature per zone (and one for the area no zone covers), or one per grid cell inside the field, each with
 * { zone, rate (in the prescription's unit), unit, rate_si, area_ha, area_ac }.
 */
export function prescriptionGeoJson(input: PrescriptionExportInput, opts: ExportLayout): ExportFile {
  const rows =
    opts.layout === 'grid'
      ? gridRows(input, opts.cellSizeM, 7)
      : zoneRows(input).map((r) => ({ ...r, geometry: roundPositions(r.geometry, 7) }));
  const collection = {
    type: 'FeatureCollection',
    features: rows.map((r): Feature<MultiPolygon, Props> => ({
      type: 'Feature',
      properties: propsOf(r, input.rateUnit),
      geometry: rewindRfc7946(r.geometry),
    })),
  };
  return {
    body: Buffer.from(JSON.stringify(collection), 'utf8'),
    contentType: 'application/geo+json',
    fileName: `${baseName(input, opts)}.geojson`,
  };
}

/** A zipped polygon shapefile in WGS84 with the same features and attributes as the GeoJSON (full precision). */
export async function prescriptionShapefile(
  input: PrescriptionExportInput,
  opts: ExportLayout,
): Promise<ExportFile> {
  const rows = opts.layout === 'grid' ? gridRows(input, opts.cellSizeM, null) : zoneRows(input);
  const parts = writePolygonShapefile(
    rows.map((r) => ({ geometry: r.geometry, properties: propsOf(r, input.rateUnit) })),
    fieldsFor(input.rateUnit),
    { today: fileDate(input) },
  );
  const base = baseName(input, opts);
  return {
    body: await zipShapefile(base, parts, fileDate(input)),
    contentType: 'application/zip',
    fileName: `${base}.zip`,
  };
}

/**
 * ISO 11783-10 task data (taskdata-write.ts). Zones layout: treatment zone 0 is the default rate (also used
 * when the position is lost), zones 1…n carry their polygons, n + 1 is the out-of-field rate. Grid layout: zone
 * 0 (default) is the grid's template and zone 1 the out-of-field rate; every cell holds its rate in DDI units.
 */
export async function prescriptionTaskData(
  input: PrescriptionExportInput,
  opts: ExportLayout,
): Promise<ExportFile> {
  const kind = input.rateKind;
  const value = (si: number) => ddiValue(kind, si);
  const defaultZone: TaskDataZone = {
    code: 0,
    designator: 'Default rate',
    value: value(input.defaultRateSi),
    geometry: null,
  };
  const outside = (code: number): TaskDataZone => ({
    code,
    designator: 'Out of field',
    value: value(input.outOfFieldRateSi),
    geometry: null,
  });
  const common = {
    customer: input.growerName,
    farm: input.farmName,
    field: { designator: input.fieldName, boundary: input.boundary, areaM2: input.boundaryAreaM2 },
    crop: input.crop,
    product: input.productName,
    task: `${input.prescriptionName} v${input.versionNo}`,
    ddi: RATE_DDI[kind],
    defaultZoneCode: 0,
    positionLostZoneCode: 0,
  };
  let doc: TaskDataInput;
  if (opts.layout === 'grid') {
    const grid = gridOf(input, opts.cellSizeM);
    const values = Int32Array.from(grid.rates, value);
    doc = {
      ...common,
      zones: [defaultZone, outside(1)],
      outOfFieldZoneCode: 1,
      grid: { ...grid, values, templateZoneCode: 0 },
    };
  } else {
    if (input.zones.length > 253) {
      throw new GeoInputError(
        `ISO 11783-10 task data holds at most 253 zones beside the default and out-of-field rates; this ` +
          `prescription has ${input.zones.length}: export it as a grid instead`,
      );
    }
    const zones = input.zones.map((z, i): TaskDataZone => ({
      code: i + 1,
      designator: z.name,
      value: value(z.rateSi),
      geometry: z.geometry,
    }));
    const out = outside(zones.length + 1);
    doc = { ...common, zones: [defaultZone, ...zones, out], outOfFieldZoneCode: out.code, grid: null };
  }
  return {
    body: await zipTaskData(doc, fileDate(input)),
    contentType: 'application/zip',
    fileName: `${baseName(input, opts)}-taskdata.zip`,
  };
}
