import { GeoInputError } from '../../../../shared/geo/geo-input-error';
import { PointTable } from './point-table';

const isObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === 'object' && v !== null && !Array.isArray(v);

/**
 * The points of a GeoJSON object (Point and MultiPoint geometries, also inside GeometryCollections), each with
 * its feature's properties. Other geometry is counted in `dropped`. Coordinates that are not numbers throw
 * {@link GeoInputError} naming feature and coordinate.
 */
export function extractPoints(data: unknown, table: PointTable): { dropped: number } {
  const features: { geometry: unknown; properties: unknown }[] = !isObject(data)
    ? []
    : data.type === 'FeatureCollection' && Array.isArray(data.features)
      ? (data.features as unknown[]).map((f) =>
          isObject(f)
            ? { geometry: f.geometry, properties: f.properties }
            : { geometry: null, properties: null },
        )
      : data.type === 'Feature'
        ? [{ geometry: data.geometry, properties: data.properties }]
        : [{ geometry: data, properties: {} }];
  if (isObject(data) && features.length === 0 && data.type !== 'FeatureCollection') {
    throw new GeoInputError('The file is not GeoJSON');
  }
  let dropped = 0;
  features.forEach((f, feature) => {
    const props = isObject(f.properties) ? f.properties : {};
    const visit = (g: unknown, depth: number) => {
      if (!isObject(g)) return void dropped++;
      if (g.type === 'Point') return add(g.coordinates, 0);
      if (g.type === 'MultiPoint' && Array.isArray(g.coordinates))
        return g.coordinates.forEach((p, i) => add(p, i));
      if (g.type === 'GeometryCollection' && Array.isArray(g.geometries) && depth < 8)
        return g.geometries.forEach((c) => visit(c, depth + 1));
      dropped++;
    };
    const add = (p: unknown, coordinate: number) => {
      const [x, y] = Array.isArray(p) ? (p as unknown[]) : [];
      if (typeof x !== 'number' || typeof y !== 'number' || !Number.isFinite(x) || !Number.isFinite(y)) {
        throw new GeoInputError('A point needs a numeric longitude and latitude', { feature, coordinate });
      }
      table.add(x, y, props);
    };
    visit(f.geometry, 0);
  });
  return { dropped };
}
