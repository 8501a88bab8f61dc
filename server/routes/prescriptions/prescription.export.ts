import type { z } from 'zod';
import { ConflictError } from '../../errors';
import type { Actor } from '../../types';
import type { prescriptionExportQuerySchema } from '../../../shared/schemas/prescription.schema';
import type { ExportFile, PrescriptionExportInput } from '../../lib/prescription-files';
import { findPrescription, productOf } from './prescription.dto';
import { prescriptionBoundary, prescriptionZones } from './prescription-store';

/** An approved (or replaced) version as GeoJSON, a zipped shapefile or ISO 11783-10 task data. */
export async function exportPrescription(
  actor: Actor,
  id: string,
  q: z.output<typeof prescriptionExportQuerySchema>,
): Promise<ExportFile> {
  const p = await findPrescription(actor, id);
  if (p.status === 'draft') {
    throw new ConflictError(
      `Version ${p.versionNo} is a draft: approve it before exporting, so the planter gets rates someone has checked`,
      'not_approved',
    );
  }
  const product = productOf(p);
  const zones = await prescriptionZones(p.id, { rfc7946: false });
  const boundary = await prescriptionBoundary(p.id, { rfc7946: false });
  const input: PrescriptionExportInput = {
    growerName: p.grower?.name ?? 'grower',
    farmName: p.field?.farm?.name ?? 'farm',
    fieldName: p.field?.name ?? 'field',
    prescriptionName: p.name,
    versionNo: p.versionNo,
    productName: product.name,
    crop: product.crop,
    rateKind: product.rateKind,
    rateUnit: p.rateUnit,
    boundary: boundary.geometry,
    boundaryAreaM2: boundary.areaM2,
    zones: zones.map((z) => ({ name: z.name, rateSi: z.rateSi, areaM2: z.areaM2, geometry: z.geometry })),
    defaultRateSi: p.defaultRateSi,
    outOfFieldRateSi: p.outOfFieldRateSi,
    approvedAt: p.approvedAt ? p.approvedAt.toISOString() : null,
  };
  const opts = { layout: q.layout, cellSizeM: q.cellSizeM };
  // The writers (zip, XML, grid) load on first export, not with every API process start.
  const { prescriptionGeoJson, prescriptionShapefile, prescriptionTaskData } =
    await import('../../lib/prescription-files');
  if (q.format === 'geojson') return prescriptionGeoJson(input, opts);
  if (q.format === 'shapefile') return prescriptionShapefile(input, opts);
  return prescriptionTaskData(input, opts);
}
