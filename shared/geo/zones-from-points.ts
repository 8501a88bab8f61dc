import type { MultiPolygon, Polygon } from 'geojson';
import { type ClassMethod, type Histogram, classBreaks, classify, histogram } from './class-breaks';
import { geodesicAreaM2 } from './geodesic-area';
import { GeoInputError } from './geo-input-error';
import { type ValuePoint, idwGrid } from './interpolate-idw';
import { dissolveSmallCells, polygoniseClasses } from './polygonise-classes';

export type ZonesFromPointsOptions = {
  /** Number of classes wanted (zones may be fewer when the data has fewer distinct values). */
  classes: number;
  method: ClassMethod;
  /** Interpolation cell side, metres. */
  cellSizeM: number;
  /** IDW distance exponent (default 2). */
  power?: number;
  /** IDW neighbours per cell (default 12). */
  maxNeighbours?: number;
  /** Fragments under this many m² (geodesic) are dissolved into a neighbour; 0 keeps everything. */
  minAreaM2: number;
  /** Histogram bins over the interpolated values (default 30). */
  histogramBins?: number;
};

/** A drafted zone: its class (0 = lowest values), area and the mean interpolated value over it. */
export type DraftZone = { classIndex: number; geometry: MultiPolygon; meanValue: number; areaM2: number };

export type ZonesFromPointsResult = { zones: DraftZone[]; breaks: number[]; histogram: Histogram };

/**
 * The "zones from data" pipeline: interpolate the points to a grid inside the boundary by inverse distance
 * weighting ({@link idwGrid}), class the cell values ({@link classBreaks}: quantile, Jenks or k-means), turn
 * the classes into polygons clipped to the boundary ({@link polygoniseClasses}) after dissolving fragments under
 * `minAreaM2` into their neighbours ({@link dissolveSmallCells}, the grid form of dissolveSmall) and gather each class into one zone (a MultiPolygon). `areaM2` is geodesic
 * (WGS84); `meanValue` is the mean of the interpolated cells of the zone (all cells have the
 * same area in the local projection, so this is the area-weighted mean), in the points' unit. The histogram
 * and breaks describe the cell values. Zones come out by class, lowest first. Inputs are not mutated.
 */
export function zonesFromPoints(
  points: readonly ValuePoint[],
  boundary: Polygon | MultiPolygon,
  options: ZonesFromPointsOptions,
): ZonesFromPointsResult {
  const grid = idwGrid(points, boundary, options);
  const valued: number[] = [];
  for (const v of grid.values) if (Number.isFinite(v)) valued.push(v);
  if (valued.length === 0) {
    throw new GeoInputError(
      `No ${options.cellSizeM} m cell has its centre inside the boundary: choose a smaller cell size`,
    );
  }
  const breaks = classBreaks(valued, options.classes, options.method);
  const classOf = new Int32Array(grid.values.length);
  const classSum = new Float64Array(breaks.length + 1);
  const classCount = new Float64Array(breaks.length + 1);
  grid.values.forEach((v, i) => {
    const k = classify(v, breaks);
    classOf[i] = k;
    if (k >= 0) {
      classSum[k] += v;
      classCount[k] += 1;
    }
  });
  // Fragments are dissolved on the grid (cell weights: the cells whose centre is inside), then traced once.
  const weight = Float64Array.from(grid.values, (v) => (Number.isNaN(v) ? 0 : grid.cellSizeM ** 2));
  const finalClass = dissolveSmallCells(grid, classOf, weight, options.minAreaM2) ?? classOf;
  const parts = polygoniseClasses(grid, finalClass, boundary);

  const zones: DraftZone[] = [];
  for (let k = 0; k <= breaks.length; k++) {
    // Regions of one class meet at most at a corner, so their polygons together are a valid MultiPolygon.
    const polygons = parts.filter((p) => p.classIndex === k).flatMap((p) => p.geometry.coordinates);
    if (!polygons.length) continue;
    const geometry: MultiPolygon = { type: 'MultiPolygon', coordinates: polygons };
    let sum = 0;
    let n = 0;
    grid.values.forEach((v, i) => {
      if (finalClass[i] === k && Number.isFinite(v)) {
        sum += v;
        n++;
      }
    });
    // A zone made only of edge slivers holds no cell centre: fall back to its class's mean.
    const meanValue = n ? sum / n : classSum[k] / classCount[k];
    zones.push({ classIndex: k, geometry, meanValue, areaM2: geodesicAreaM2(geometry) });
  }
  return { zones, breaks, histogram: histogram(valued, options.histogramBins ?? 30) };
}
