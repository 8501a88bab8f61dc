import type { NormalFeature } from '../../../../shared/geo/normalise-features';
import type { CrsCandidate } from '../../../../shared/geo/detect-coordinates';
import type { ImportFormat } from '../../../db/models/import.model';
import type { ImportPurpose } from '../../../../shared/schemas/import.schema';

/** What the worker is asked to read. */
export type ParseJob = {
  bytes: Uint8Array;
  fileName: string;
  purpose: ImportPurpose;
  /** The EPSG code the user chose for coordinates of an unknown system, if any. */
  crsCode: string | null;
  /** [lon, lat] of the field (or the workspace's fields), to suggest coordinate systems; null if none. */
  reference: number[] | null;
};

/** One layer as a reader returns it: GeoJSON (or point columns, for CSV), and what is known of its coordinates. */
export type ReadLayer = {
  name: string;
  /** GeoJSON of the layer (bare geometry, Feature or FeatureCollection); null when `points` carries it. */
  data: unknown;
  points?: PointColumns;
  /** How the coordinates are known: WGS84 as read, reprojected through a .prj already, or an EPSG code to reproject from. */
  crs:
    | { kind: 'wgs84'; source: string }
    | { kind: 'reprojected'; source: string }
    | { kind: 'code'; code: string; source: string };
  /** Said by the file itself (a shapefile's shape type); otherwise worked out from the features. */
  geometryType?: string;
};

export type ReadResult = { format: ImportFormat; layers: ReadLayer[]; warnings: string[] };

/** Point layers travel as columns (typed arrays transfer cheaply between threads). */
export type PointColumns = {
  x: Float64Array;
  y: Float64Array;
  columns: { name: string; values: Float64Array; texts: number }[];
};

export type PreviewFeatureIn = NormalFeature & { layer: string | null };

export type ParseOutcome = {
  format: ImportFormat;
  layers: { name: string; featureCount: number; geometryType: string }[];
  coordinates:
    | { kind: 'geographic'; source: string }
    | { kind: 'projected'; bbox: number[]; candidates: CrsCandidate[] };
  /** True when the coordinates were read with the code the user chose (the file did not say). */
  crsChosen: boolean;
  features: PreviewFeatureIn[];
  points: { lon: Float64Array; lat: Float64Array; columns: { name: string; values: Float64Array }[] } | null;
  pointCount?: number;
  numericProperties?: { name: string; min: number; max: number; count: number }[];
  warnings: string[];
};

export type WorkerReply =
  | { ok: true; outcome: ParseOutcome }
  | { ok: false; code: string; message: string; details?: { path: (string | number)[]; message: string }[] };
