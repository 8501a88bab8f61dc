import { z } from 'zod';

const position = z.array(z.number()).min(2).max(3);
export const polygonGeometrySchema = z.object({
  type: z.literal('Polygon'),
  coordinates: z.array(z.array(position)),
});
export const multiPolygonGeometrySchema = z.object({
  type: z.literal('MultiPolygon'),
  coordinates: z.array(z.array(z.array(position))),
});
export const lineStringGeometrySchema = z.object({
  type: z.literal('LineString'),
  coordinates: z.array(position).min(2, 'A line needs at least two positions'),
});
export const areaGeometrySchema = z.union([polygonGeometrySchema, multiPolygonGeometrySchema]);
export type MultiPolygonGeometry = z.infer<typeof multiPolygonGeometrySchema>;
