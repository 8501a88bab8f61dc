import type { Transaction } from 'sequelize';
import { CropSeason, Farm, Field, Grower, Planter, Prescription, Product, User } from '../../db/associations';
import { ZoneMap } from '../../db/models/zone-map.model';
import type { StoredAcceptance } from '../../db/models/prescription.model';
import { assertFound, iso, scopedWhere } from '../../lib/scope';
import type { Actor } from '../../types';
import { productToDto } from '../products/product.service';
import { planterToDto } from '../planters/planter.service';
import { CROP_LABELS, type Crop } from '../../../shared/schemas/crops';
import type { Planter as PlanterDto } from '../../../shared/schemas/planter.schema';
import type { Product as ProductDto } from '../../../shared/schemas/product.schema';
import type {
  PlanterCheck,
  Prescription as PrescriptionDto,
} from '../../../shared/schemas/prescription.schema';
import { checkPlanter } from '../../../shared/rates/planter-check';
import { prescriptionTotals } from '../../../shared/rates/totals';
import type { UnitSystem } from '../../../shared/units';
import { prescriptionBoundary, prescriptionZones, type PrescriptionZoneRow } from './prescription-store';

export const prescriptionInclude = [
  {
    model: Field,
    as: 'field',
    attributes: ['id', 'name', 'farmId'],
    include: [{ model: Farm, as: 'farm', attributes: ['id', 'name'] }],
  },
  { model: CropSeason, as: 'season', attributes: ['id', 'year', 'crop'] },
  { model: Grower, as: 'grower', attributes: ['id', 'name'] },
  { model: Product, as: 'product' },
  { model: Planter, as: 'planter', include: [{ model: Grower, as: 'grower', attributes: ['name'] }] },
  { model: ZoneMap, as: 'zoneMap', attributes: ['id', 'name', 'versionNo'] },
];

/** A prescription in the actor's scope (404 otherwise) with everything its page shows. */
export async function findPrescription(actor: Actor, id: string, t?: Transaction) {
  const p = await Prescription.findOne({
    where: scopedWhere(actor, { id }),
    include: prescriptionInclude,
    transaction: t,
  });
  return assertFound(p, 'Prescription');
}

export const seasonLabelOf = (s: CropSeason | undefined) =>
  s ? `${s.year} ${CROP_LABELS[s.crop] ?? s.crop}` : '';

/** A draft reads the live product and planter; an approved or replaced version, those it was approved with. */
export function productOf(p: Prescription): ProductDto {
  if (p.status !== 'draft' && p.productSnapshot) return p.productSnapshot;
  return productToDto(p.product!);
}
export function planterOf(p: Prescription): PlanterDto | null {
  if (p.status !== 'draft') return p.planterSnapshot ?? null;
  return p.planter ? planterToDto(p.planter) : null;
}

export const DEFAULT_ZONE_ID = 'default';
export const DEFAULT_ZONE_LABEL = 'Default rate (no zone, position lost)';

/** The planter check (DOMAIN.md §4) for a seed product with a planter; null otherwise. */
export function checkOf(
  p: Prescription,
  zones: Pick<PrescriptionZoneRow, 'id' | 'name' | 'rateSi'>[],
  unitSystem: UnitSystem,
): PlanterCheck | null {
  const product = productOf(p);
  const planter = planterOf(p);
  if (product.kind !== 'seed' || !planter) return null;
  return checkPlanter({
    planter,
    crop: (p.season?.crop ?? product.crop) as Crop,
    zones: [
      ...zones.map((z) => ({ zoneId: z.id, name: z.name, rateSi: z.rateSi })),
      { zoneId: DEFAULT_ZONE_ID, name: DEFAULT_ZONE_LABEL, rateSi: p.defaultRateSi },
    ],
    unitSystem,
    rateUnit: p.rateUnit,
  });
}

/** Zone ids flagged by a check, with their rates. */
export function flaggedOf(check: PlanterCheck | null) {
  if (!check) return [];
  return check.zones
    .filter((z) => z.status === 'flagged')
    .map((z) => ({ zoneId: z.zoneId, rateSi: z.rateSi }));
}

/**
 * An acceptance still holds when the same planter is chosen and every zone flagged now was flagged, at the
 * same rate, when it was given. A blocking problem that is not a zone (no disc setting, too many sections)
 * is covered by an acceptance given while it was there.
 */
export function acceptanceHolds(
  acc: StoredAcceptance | null,
  check: PlanterCheck | null,
  planterId: string | null,
) {
  if (!acc || !check) return false;
  if (acc.planterId !== planterId) return false;
  return flaggedOf(check).every((f) => acc.zoneIds.includes(f.zoneId) && acc.rates[f.zoneId] === f.rateSi);
}

export async function unitSystemOf(actor: Actor): Promise<UnitSystem> {
  const u = await User.findByPk(actor.userId, { attributes: ['unitSystem'] });
  return u?.unitSystem ?? 'imperial';
}

export function totalsOf(p: Prescription, zones: PrescriptionZoneRow[]) {
  const product = productOf(p);
  return prescriptionTotals({
    zones: zones.map((z) => ({ zoneId: z.id, name: z.name, areaM2: z.areaM2, rateSi: z.rateSi })),
    uncoveredAreaM2: p.uncoveredAreaM2,
    defaultRateSi: p.defaultRateSi,
    unitSize: product.unitSize,
    pricePerUnit: product.pricePerUnit,
  });
}

const personRef = async (id: string | null, fallbackName?: string | null) => {
  if (!id) return fallbackName ? { id: '00000000-0000-0000-0000-000000000000', name: fallbackName } : null;
  const u = await User.findByPk(id, { attributes: ['id', 'name'] });
  return u ? { id: u.id, name: u.name } : fallbackName ? { id, name: fallbackName } : null;
};

/** What the list and the page both say of a version: whose, where, which. */
export function headerOf(p: Prescription) {
  return {
    id: p.id,
    lineageId: p.lineageId,
    versionNo: p.versionNo,
    status: p.status,
    name: p.name,
    growerId: p.growerId,
    growerName: p.grower?.name ?? '',
    farmName: p.field?.farm?.name ?? '',
    fieldId: p.fieldId,
    fieldName: p.field?.name ?? '',
    seasonId: p.cropSeasonId,
    seasonLabel: seasonLabelOf(p.season),
    crop: p.season!.crop,
    rateUnit: p.rateUnit,
    version: p.version,
    approvedAt: iso(p.approvedAt),
    updatedAt: p.updatedAt.toISOString(),
  };
}

export async function toDto(
  p: Prescription,
  unitSystem: UnitSystem,
  t?: Transaction,
): Promise<PrescriptionDto> {
  const zones = await prescriptionZones(p.id, { transaction: t });
  const boundary = await prescriptionBoundary(p.id, { transaction: t });
  const check = checkOf(p, zones, unitSystem);
  const acc = p.acceptance;
  return {
    ...headerOf(p),
    zoneMapId: p.zoneMapId,
    zoneMapName: p.zoneMap?.name ?? '',
    zoneMapVersionNo: p.zoneMap?.versionNo ?? 0,
    product: productOf(p),
    planter: planterOf(p),
    defaultRateSi: p.defaultRateSi,
    outOfFieldRateSi: p.outOfFieldRateSi,
    minRateSi: p.minRateSi,
    maxRateSi: p.maxRateSi,
    boundary: boundary.geometry,
    boundaryAreaM2: boundary.areaM2,
    zones: zones.map((z) => ({ ...z })),
    uncoveredAreaM2: p.uncoveredAreaM2,
    check,
    acceptance: acc
      ? {
          reason: acc.reason,
          acceptedBy: { id: acc.acceptedById, name: acc.acceptedByName },
          acceptedAt: acc.acceptedAt,
          zoneIds: acc.zoneIds,
        }
      : null,
    totals: totalsOf(p, zones),
    approvedBy: p.approvedAt ? await personRef(p.approvedBy, p.approvedByName) : null,
    supersededAt: iso(p.supersededAt),
    createdBy: await personRef(p.createdBy),
    createdAt: p.createdAt.toISOString(),
  };
}
