import type { Coverage } from '@shared/schemas/as-applied.schema';

export type CoverageRaster = Coverage['raster'];

/** Counts of the raster (coverage.ts): 0 skipped, 1 once, 2 and more twice or more, 255 outside the field. */
export const OUTSIDE = 255;

/** The raster's bytes from base64. */
export function decodeCounts(base64: string): Uint8Array {
  const text = atob(base64);
  const out = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) out[i] = text.charCodeAt(i);
  return out;
}

const rgb = (hex: string) => [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16));

/**
 * The raster as RGBA pixels, north up (the raster's row 0 is the south edge, an image's row 0 its top):
 * skipped and doubled cells in their colours, once-planted and outside cells transparent.
 */
export function coveragePixels(
  r: CoverageRaster,
  colours: { skipped: string; double: string },
  alpha = 230,
): Uint8ClampedArray<ArrayBuffer> {
  const counts = decodeCounts(r.countsBase64);
  if (counts.length !== r.columns * r.rows)
    throw new Error(
      `The coverage raster holds ${counts.length} cells where ${r.columns} × ${r.rows} were expected`,
    );
  const skipped = rgb(colours.skipped);
  const double = rgb(colours.double);
  const px = new Uint8ClampedArray(new ArrayBuffer(counts.length * 4));
  for (let row = 0; row < r.rows; row++) {
    const top = r.rows - 1 - row;
    for (let col = 0; col < r.columns; col++) {
      const c = counts[row * r.columns + col];
      const colour = c === 0 ? skipped : c >= 2 && c !== OUTSIDE ? double : null;
      if (!colour) continue;
      const o = (top * r.columns + col) * 4;
      px[o] = colour[0];
      px[o + 1] = colour[1];
      px[o + 2] = colour[2];
      px[o + 3] = alpha;
    }
  }
  return px;
}

/** The raster painted on a canvas, as a PNG data URL for the map's image source. */
export function coverageDataUrl(r: CoverageRaster, colours: { skipped: string; double: string }): string {
  const canvas = document.createElement('canvas');
  canvas.width = r.columns;
  canvas.height = r.rows;
  const ctx = canvas.getContext('2d');
  if (!ctx) throw new Error('This browser cannot paint the coverage raster (no 2D canvas)');
  ctx.putImageData(new ImageData(coveragePixels(r, colours), r.columns, r.rows), 0, 0);
  return canvas.toDataURL('image/png');
}

/** The image's corners for MapLibre: top left, top right, bottom right, bottom left, as [lon, lat]. */
export function rasterCorners(
  r: CoverageRaster,
): [[number, number], [number, number], [number, number], [number, number]] {
  const east = r.minLon + r.cellLonDeg * r.columns;
  const north = r.minLat + r.cellLatDeg * r.rows;
  return [
    [r.minLon, north],
    [east, north],
    [east, r.minLat],
    [r.minLon, r.minLat],
  ];
}
