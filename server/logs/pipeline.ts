import type { MultiPolygon } from 'geojson';
import type {
  AuditResult,
  CleaningReport,
  CleaningSettings,
  ColumnMapping,
} from '../../shared/schemas/as-applied.schema';
import type { RateUnit } from '../../shared/rates/rate-units';
import type { UnitSystem } from '../../shared/units';
import { parseLogCsv, parseLogCsvParallel, parseLogCsvSource } from '../../shared/audit/csv-log';
import { readFileSync } from 'node:fs';
import { openFileSource } from './file-source';
import { parseRangeInHelper } from './parse-helper';
import { cleanLog } from '../../shared/audit/clean-log';
import { zoneIndexOf } from '../../shared/audit/zone-join';
import { auditLog } from '../../shared/audit/audit-log';
import { findingsOf } from '../../shared/audit/findings';
import { SPEED_SOURCE_CODE, type LogColumns } from '../../shared/audit/log-columns';
import { pointsFileToCsv } from './points-to-csv';
import { logbookTotals, type LogbookTotals } from '../../shared/audit/logbook';
import { tileCells, type TileCells } from '../../shared/audit/tile-cells';
import { replayAlarms } from '../../shared/audit/alarm-replay';
import { controllerLag } from '../../shared/audit/controller-lag';
import { discLimitShortfall } from '../../shared/audit/disc-limit';
import { rowDiagnostics } from '../../shared/audit/row-diagnostics';
import { coverageOf } from '../../shared/audit/coverage';
import type { Diagnostics } from '../../shared/schemas/as-applied.schema';
import { diagnosticFindings } from '../../shared/audit/diagnostic-findings';

/** No map cells: what the audit alone (`diagnose: false`) answers. */
const emptyTileCells = (): TileCells => ({
  z: new Int16Array(0),
  tx: new Int32Array(0),
  ty: new Int32Array(0),
  gx: new Int16Array(0),
  gy: new Int16Array(0),
  n: new Int32Array(0),
  target: new Float64Array(0),
  applied: new Float64Array(0),
  appliedTrue: new Float64Array(0),
  speed: new Float64Array(0),
  length: 0,
});

export type PipelineStage = 'reading' | 'cleaning' | 'auditing';

export type PipelineInput = {
  bytes: Uint8Array;
  /**
   * A CSV log's file, read a piece at a time by two threads instead of from `bytes` (then ignored): only the
   * columns are in memory, never the whole file (PERFORMANCE.md target 2 at 5 M points).
   */
  file?: string;
  fileName: string;
  format: 'csv' | 'geojson' | 'shapefile';
  mapping: ColumnMapping;
  cleaning: CleaningSettings;
  boundary: MultiPolygon;
  zones: { zoneId: string; name: string; targetSi: number; geometry: MultiPolygon }[];
  defaultTargetSi: number;
  bandFraction: number;
  fallbackWidthM: number;
  meteredOn: 'wheel' | 'radar' | 'gnss';
  unitSize: number;
  pricePerUnit: number | null;
  /** The planter the log was planted with (DOMAIN.md §4): for the disc limit and the section advice. */
  planter: {
    rowCount: number;
    rowSpacingM: number;
    rowsPerSection: number;
    displaySectionLimit: number;
    holesPerDisc: number | null;
    discRpmMax: number;
  };
  /**
   * Run the diagnostics (alarm replay, lag, disc limit, rows, coverage) and make the map cells (default); false
   * stops at the audit itself, which is what the benchmark times as the audit (target 1).
   */
  diagnose?: boolean;
  findings: {
    rateUnit: RateUnit;
    unitSystem: UnitSystem;
    unitName: string;
    currency: string;
    productKind: 'seed' | 'other';
  };
};

/** What storing a log's points needs: known once the audit has run, before the diagnostics. */
export type PipelinePoints = {
  pointsRead: number;
  columns: LogColumns;
  zone: Int16Array;
  removedBy: Uint8Array;
  trueApplied: Float64Array | null;
  area: Float64Array;
  /** The kept points averaged per map cell at zooms 12–18 (the vector tiles read these). */
  cells: TileCells;
};

/** The part of the points that is stored (server/logs/import-log.ts pointColumns), small enough to copy. */
export type StoredPoints = Omit<PipelinePoints, 'columns'> & {
  columns: Pick<
    LogColumns,
    'n' | 't' | 'lon' | 'lat' | 'target' | 'applied' | 'wheelMps' | 'gnssMps' | 'widthM'
  >;
};

export const storedPointsOf = (p: PipelinePoints): StoredPoints => {
  const { n, t, lon, lat, target, applied, wheelMps, gnssMps, widthM } = p.columns;
  return { ...p, columns: { n, t, lon, lat, target, applied, wheelMps, gnssMps, widthM } };
};

export type PipelineOutput = PipelinePoints & {
  report: CleaningReport;
  result: AuditResult;
  meteredOn: 'wheel' | 'radar' | 'gnss';
  /** What the log adds to the planter's lifetime counters. */
  logbook: LogbookTotals;
};

/** The speed the controller metered on: the log's own speed-source column when it has one, else the setting. */
function meteredOnOf(c: LogColumns, keep: Uint8Array, fallback: PipelineInput['meteredOn']) {
  if (!c.speedSource) return fallback;
  const counts = [0, 0, 0, 0];
  for (let i = 0; i < c.n; i++) if (keep[i]) counts[c.speedSource[i]]++;
  const best = [1, 2, 3].reduce((a, b) => (counts[b] > counts[a] ? b : a), 1);
  if (counts[best] === 0) return fallback;
  return (Object.keys(SPEED_SOURCE_CODE) as (keyof typeof SPEED_SOURCE_CODE)[]).find(
    (k) => SPEED_SOURCE_CODE[k] === best,
  ) as PipelineInput['meteredOn'];
}

/** A CSV file read a piece at a time by two threads (the second: server/logs/parse-helper.ts). */
async function readCsvFile(file: string, mapping: PipelineInput['mapping'], onProgress: (f: number) => void) {
  const src = openFileSource(file);
  try {
    return await parseLogCsvSource(
      src,
      file,
      mapping,
      parseRangeInHelper,
      () => new Uint8Array(readFileSync(file)),
      { onProgress },
    );
  } finally {
    src.close();
  }
}

/** A log in memory: a large CSV in shared memory is read by two threads, anything else by one. */
async function readBytes(input: PipelineInput, onProgress: (f: number) => void) {
  const csv = input.format === 'csv' ? input.bytes : await pointsFileToCsv(input.bytes, input.fileName);
  return csv.buffer instanceof SharedArrayBuffer
    ? await parseLogCsvParallel(csv, input.mapping, parseRangeInHelper, { onProgress })
    : parseLogCsv(csv, input.mapping, { onProgress });
}

/**
 * File bytes → the audit: parse (our own tokenizer), clean in FORMATS.md's order, join points to zones,
 * aggregate by area. Pure apart from reading zipped shapefiles; runs inside a worker thread.
 */
export async function runPipeline(
  input: PipelineInput,
  progress: (stage: PipelineStage, fraction: number) => void = () => {},
  /** Told the points as soon as they are known, so the caller can store them while the diagnostics run. */
  onPoints?: (points: PipelinePoints) => void,
): Promise<PipelineOutput> {
  progress('reading', 0);
  const onProgress = (f: number) => progress('reading', f);
  const parsed =
    input.format === 'csv' && input.file
      ? await readCsvFile(input.file, input.mapping, onProgress)
      : await readBytes(input, onProgress);
  progress('cleaning', 0);
  const zonesGeo = input.zones.map((z) => z.geometry);
  const rawZone = zoneIndexOf(parsed.lon, parsed.lat, zonesGeo, input.boundary);
  const cleaned = cleanLog(parsed, input.cleaning, rawZone);
  const zone =
    cleaned.zone ?? zoneIndexOf(cleaned.columns.lon, cleaned.columns.lat, zonesGeo, input.boundary);
  progress('auditing', 0);
  const meteredOn = meteredOnOf(cleaned.columns, cleaned.keep, input.meteredOn);
  const audited = auditLog({
    columns: cleaned.columns,
    keep: cleaned.keep,
    zone,
    zones: input.zones.map(({ zoneId, name, targetSi }) => ({ zoneId, name, targetSi })),
    defaultTargetSi: input.defaultTargetSi,
    bandFraction: input.bandFraction,
    fallbackWidthM: input.fallbackWidthM,
    meteredOn,
    unitSize: input.unitSize,
    pricePerUnit: input.pricePerUnit,
  });
  const { trueApplied, area, ...result } = audited;
  const points: PipelinePoints = {
    pointsRead: parsed.n,
    columns: cleaned.columns,
    zone,
    removedBy: cleaned.removedBy,
    trueApplied,
    area,
    // The map's cells are for storing and serving tiles, not part of the audit: skipped with the diagnostics.
    cells:
      input.diagnose === false ? emptyTileCells() : tileCells(cleaned.columns, cleaned.keep, trueApplied),
  };
  onPoints?.(points);
  const diagnostics =
    input.diagnose === false
      ? undefined
      : diagnose(input, cleaned.columns, cleaned.keep, cleaned.removedBy, zone, area, input.zones);
  const severity = { problem: 0, notice: 1, info: 2 } as const;
  const findings = [
    ...findingsOf(result, input.findings),
    ...(diagnostics ? diagnosticFindings(diagnostics, input.findings) : []),
  ].sort((a, b) => severity[a.severity] - severity[b.severity]);
  progress('auditing', 1);
  return {
    ...points,
    report: cleaned.report,
    result: { ...result, findings, diagnostics },
    meteredOn,
    logbook: logbookTotals(cleaned.columns, cleaned.removedBy, area, trueApplied, input.fallbackWidthM),
  };
}

/** removedBy codes of points the planter did not plant (clean-log.ts: step index + 1). */
const NOT_PLANTING = new Set([1, 2]);

/**
 * The deeper diagnostics (DOMAIN.md §4–§7). Alarms and coverage use the points the audit kept; the lag
 * needs the seconds right after each target change that cleaning drops, so it sees every planting point.
 */
function diagnose(
  input: PipelineInput,
  c: LogColumns,
  keep: Uint8Array,
  removedBy: Uint8Array,
  zone: Int16Array,
  area: Float64Array,
  zones: PipelineInput['zones'],
): Diagnostics {
  const planting = new Uint8Array(c.n);
  for (let i = 0; i < c.n; i++) planting[i] = NOT_PLANTING.has(removedBy[i]) || zone[i] === -2 ? 0 : 1;
  const s = input.cleaning;
  const alarms = [s.alarmDelayS, s.compareAlarmDelayS].map((delayS) =>
    replayAlarms(c, keep, zone, area, { bandFraction: input.bandFraction, delayS, passGapS: s.passGapS }),
  );
  const p = input.planter;
  return {
    alarms,
    lag: controllerLag(c, planting, area),
    discLimit: discLimitShortfall(
      c,
      keep,
      zone,
      area,
      zones.map(({ zoneId, name, targetSi }) => ({ zoneId, name, targetSi })),
      { rowSpacingM: p.rowSpacingM, holesPerDisc: p.holesPerDisc, discRpmMax: p.discRpmMax },
      input.bandFraction,
    ),
    rows: rowDiagnostics(c, keep),
    coverage: coverageOf(c, planting, input.boundary, {
      cellSizeM: s.coverageCellM,
      swathFallbackM: input.fallbackWidthM,
      rowSpacingM: p.rowSpacingM,
      rowCount: p.rowCount,
      rowsPerSection: p.rowsPerSection,
      displaySectionLimit: p.displaySectionLimit,
      targetSi: c.target,
    }),
  };
}
