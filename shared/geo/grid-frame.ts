import type { MultiPolygon, Polygon } from 'geojson';

/**
 * A regular lon/lat grid: cell (col, row) spans [originLon + col·lonStep, originLon + (col + 1)·lonStep] ×
 * [originLat + row·latStep, originLat + (row + 1)·latStep], degrees; row 0 is the southernmost. Cells are
 * stored row-major from the south-west: index = row · cols + col.
 */
export type GridFrame = {
  originLon: number;
  originLat: number;
  lonStep: number;
  latStep: number;
  cols: number;
  rows: number;
};

/** [lon, lat] of the grid-line crossing (col, row): the south-west corner of cell (col, row). */
export function cellCorner(g: GridFrame, col: number, row: number): [number, number] {
  return [g.originLon + col * g.lonStep, g.originLat + row * g.latStep];
}

/** [lon, lat] of the centre of cell (col, row). */
export function cellCentre(g: GridFrame, col: number, row: number): [number, number] {
  return [g.originLon + (col + 0.5) * g.lonStep, g.originLat + (row + 0.5) * g.latStep];
}

/**
 * 1 for every cell whose centre lies inside the area (even–odd rule, so holes are outside), else 0. A scanline
 * through each row of centres: O(rows × edges + cells). The area is in [lon, lat] degrees like the grid.
 */
export function cellsInside(g: GridFrame, area: Polygon | MultiPolygon): Uint8Array {
  const mask = new Uint8Array(g.cols * g.rows);
  const rings = area.type === 'Polygon' ? area.coordinates : area.coordinates.flat();
  const xs: number[] = [];
  for (let row = 0; row < g.rows; row++) {
    const y = g.originLat + (row + 0.5) * g.latStep;
    xs.length = 0;
    for (const ring of rings) {
      for (let i = 0, n = ring.length, j = n - 1; i < n; j = i++) {
        const [x1, y1] = ring[j];
        const [x2, y2] = ring[i];
        if (y1 <= y !== y2 <= y) xs.push(x1 + ((y - y1) * (x2 - x1)) / (y2 - y1));
      }
    }
    xs.sort((a, b) => a - b);
    for (let k = 0; k + 1 < xs.length; k += 2) {
      // Columns whose centre lies in [xs[k], xs[k + 1]).
      const c0 = Math.max(0, Math.ceil((xs[k] - g.originLon) / g.lonStep - 0.5));
      const c1 = Math.min(g.cols - 1, Math.ceil((xs[k + 1] - g.originLon) / g.lonStep - 0.5) - 1);
      for (let c = c0; c <= c1; c++) mask[row * g.cols + c] = 1;
    }
  }
  return mask;
}

/**
 * 1 for every cell that a ring edge of the area passes through (a grid walk along each edge, Amanatides & Woo
 * 1987), else 0. A cell with its centre inside and not crossed lies wholly inside the area.
 */
export function cellsCrossed(g: GridFrame, area: Polygon | MultiPolygon): Uint8Array {
  const mask = new Uint8Array(g.cols * g.rows);
  const rings = area.type === 'Polygon' ? area.coordinates : area.coordinates.flat();
  const mark = (c: number, r: number) => {
    if (c >= 0 && r >= 0 && c < g.cols && r < g.rows) mask[r * g.cols + c] = 1;
  };
  for (const ring of rings) {
    for (let i = 0; i + 1 < ring.length; i++) {
      const x0 = (ring[i][0] - g.originLon) / g.lonStep;
      const y0 = (ring[i][1] - g.originLat) / g.latStep;
      const x1 = (ring[i + 1][0] - g.originLon) / g.lonStep;
      const y1 = (ring[i + 1][1] - g.originLat) / g.latStep;
      let cx = Math.floor(x0);
      let cy = Math.floor(y0);
      const ex = Math.floor(x1);
      const ey = Math.floor(y1);
      const dx = x1 - x0;
      const dy = y1 - y0;
      const sx = Math.sign(dx);
      const sy = Math.sign(dy);
      let tx = dx ? ((sx > 0 ? cx + 1 : cx) - x0) / dx : Infinity;
      let ty = dy ? ((sy > 0 ? cy + 1 : cy) - y0) / dy : Infinity;
      const tdx = dx ? sx / dx : Infinity;
      const tdy = dy ? sy / dy : Infinity;
      let steps = Math.abs(ex - cx) + Math.abs(ey - cy) + 1;
      mark(cx, cy);
      while (steps-- > 0 && (cx !== ex || cy !== ey)) {
        if (tx < ty) {
          tx += tdx;
          cx += sx;
        } else {
          ty += tdy;
          cy += sy;
        }
        mark(cx, cy);
      }
    }
  }
  return mask;
}
