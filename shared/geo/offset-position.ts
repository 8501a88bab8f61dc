import geodesic from 'geographiclib-geodesic';

// The package is CommonJS: take its named members from the default export.
const { Geodesic } = geodesic;

/**
 * The [lon, lat] reached from `origin` ([lon, lat], degrees) by going `eastM` metres east and then
 * `northM` metres north along geodesics on the WGS84 ellipsoid (GeographicLib, Karney 2013).
 */
export function offsetPosition(origin: [number, number], eastM: number, northM: number): [number, number] {
  const g = Geodesic.WGS84;
  const [lon0, lat0] = origin;
  const east = g.Direct(lat0, lon0, eastM >= 0 ? 90 : 270, Math.abs(eastM));
  const north = g.Direct(east.lat2!, east.lon2!, northM >= 0 ? 0 : 180, Math.abs(northM));
  return [north.lon2!, north.lat2!];
}

/** A closed ring from local east/north offsets in metres, rounded to 7 decimals (about 1 cm). */
export function ringFromOffsets(origin: [number, number], offsets: [number, number][]): number[][] {
  const ring = offsets.map(([e, n]) => offsetPosition(origin, e, n).map((v) => Math.round(v * 1e7) / 1e7));
  ring.push([...ring[0]]);
  return ring;
}
