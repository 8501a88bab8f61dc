import type { MultiPolygon } from 'geojson';
import { syntheticLog } from '../../shared/audit/synthetic-log';
import { logToCsv, readCsvHeader, suggestMapping } from '../../shared/audit/csv-log';
import { cleaningSettingsSchema } from '../../shared/schemas/as-applied.schema';
import { runPipeline } from './pipeline';

/**
 * One run of the whole pipeline over an invented 100 000-point log (a 400 m square field at 10 Hz, two
 * zones), made while the worker waits for its first log: the hot loops are compiled by then, so the first
 * real log is not read by the interpreter (and the CSV is large enough for the second parsing thread). About
 * a second of a core that is otherwise idle; skipped under tests (NODE_ENV=test), which start many workers.
 */
export async function warmUpPipeline() {
  if (process.env.NODE_ENV === 'test') return;
  const square = (w: number, e: number): MultiPolygon => ({
    type: 'MultiPolygon',
    coordinates: [
      [
        [
          [w, 42],
          [e, 42],
          [e, 42.0036],
          [w, 42.0036],
          [w, 42],
        ],
      ],
    ],
  });
  const boundary = square(-93.6, -93.5952);
  const zones = [
    { zoneId: 'west', name: 'West', targetSi: 8, geometry: square(-93.6, -93.5976) },
    { zoneId: 'east', name: 'East', targetSi: 8.6, geometry: square(-93.5976, -93.5952) },
  ];
  const log = syntheticLog({
    boundary,
    zones: zones.map((z) => ({ geometry: z.geometry, targetSi: z.targetSi })),
    defaultTargetSi: 8,
    swathM: 9.144,
    speedMps: 2.2352,
    hz: 10,
    startTime: Date.UTC(2027, 3, 28, 13) / 1000,
    seed: 5,
    faults: { noiseCv: 0.03 },
    maxPoints: 100_000,
  });
  const text = new TextEncoder().encode(
    logToCsv(log, { decimals: { time: 1, position: 7, speed: 2, rate: 0 } }),
  );
  const bytes = new Uint8Array(new SharedArrayBuffer(text.length));
  bytes.set(text);
  const header = readCsvHeader(bytes);
  await runPipeline({
    bytes,
    fileName: 'warm-up.csv',
    format: 'csv',
    mapping: suggestMapping(header.columns, header.sample),
    cleaning: cleaningSettingsSchema.parse({}),
    boundary,
    zones,
    defaultTargetSi: 8,
    bandFraction: 0.15,
    fallbackWidthM: 9.144,
    planter: {
      rowCount: 12,
      rowSpacingM: 0.762,
      rowsPerSection: 1,
      displaySectionLimit: 16,
      holesPerDisc: 27,
      discRpmMax: 60,
    },
    meteredOn: 'gnss',
    unitSize: 80_000,
    pricePerUnit: 300,
    findings: {
      rateUnit: 'seeds/ac',
      unitSystem: 'imperial',
      unitName: 'unit',
      currency: 'USD',
      productKind: 'seed',
    },
  });
}
