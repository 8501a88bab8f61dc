export type PolygonCoords = number[][][];
export type MultiPolygonGeom = { type: 'MultiPolygon'; coordinates: PolygonCoords[] };

/**
 * Promotes a Polygon to a MultiPolygon and drops any third coordinate (altitude), giving [lon, lat]
 * positions only. The input is not mutated.
 */
export function toMultiPolygon(
  geom:
    { type: 'Polygon'; coordinates: number[][][] } | { type: 'MultiPolygon'; coordinates: number[][][][] },
): MultiPolygonGeom {
  const polys = geom.type === 'Polygon' ? [geom.coordinates] : geom.coordinates;
  return {
    type: 'MultiPolygon',
    coordinates: polys.map((rings) => rings.map((ring) => ring.map(([lon, lat]) => [lon, lat]))),
  };
}
