import { randomUUID } from 'node:crypto';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { Planter, Prescription, Product, User } from '../../db/associations';
import type { StoredAcceptance } from '../../db/models/prescription.model';
import { assertVersion, scopedWhere } from '../../lib/scope';
import { ConflictError, DomainError, ValidationError } from '../../errors';
import type { Actor } from '../../types';
import { findZoneMap } from '../zone-maps/zone-map.service';
import { analyse } from '../zone-maps/zone-store';
import { CROP_LABELS } from '../../../shared/schemas/crops';
import type {
  PrescriptionSummary,
  acceptCheckSchema,
  createPrescriptionSchema,
  prescriptionListQuerySchema,
  updatePrescriptionSchema,
} from '../../../shared/schemas/prescription.schema';
import { RATE_UNIT_DEFS, formatRate, type RateUnit } from '../../../shared/rates/rate-units';
import {
  acceptanceHolds,
  checkOf,
  findPrescription,
  flaggedOf,
  headerOf,
  prescriptionInclude,
  productOf,
  toDto,
  unitSystemOf,
} from './prescription.dto';
import {
  copyZonesFromMap,
  copyZonesFromPrescription,
  prescriptionZones,
  setZoneRates,
} from './prescription-store';
import { productToDto } from '../products/product.service';
import { planterToDto } from '../planters/planter.service';

const db = () => Prescription.sequelize!;

export async function getPrescription(actor: Actor, id: string) {
  return toDto(await findPrescription(actor, id), await unitSystemOf(actor));
}

export async function listPrescriptions(
  actor: Actor,
  q: z.output<typeof prescriptionListQuerySchema>,
): Promise<{ items: PrescriptionSummary[] }> {
  const rows = await Prescription.findAll({
    where: scopedWhere(actor, {
      ...(q.growerId ? { growerId: q.growerId } : {}),
      ...(q.fieldId ? { fieldId: q.fieldId } : {}),
      ...(q.seasonId ? { cropSeasonId: q.seasonId } : {}),
      ...(q.status ? { status: q.status } : {}),
    }),
    include: prescriptionInclude.filter((i) => i.as !== 'planter' && i.as !== 'zoneMap'),
    order: [
      ['updatedAt', 'DESC'],
      ['versionNo', 'DESC'],
    ],
    limit: 500,
  });
  const ids = rows.map((r) => r.id);
  const stats = ids.length
    ? await db().query<{
        id: string;
        zoneCount: number;
        zonedArea: number;
        zonedSeed: number;
        boundaryArea: number;
      }>(
        `SELECT p.id, count(z.id)::int AS "zoneCount", COALESCE(sum(z.area_m2), 0) AS "zonedArea",
                COALESCE(sum(z.area_m2 * z.rate_si), 0) AS "zonedSeed", p.boundary_area_m2 AS "boundaryArea"
           FROM prescriptions p LEFT JOIN prescription_zones z ON z.prescription_id = p.id
          WHERE p.id IN (:ids) GROUP BY p.id`,
        { replacements: { ids }, type: QueryTypes.SELECT },
      )
    : [];
  const byId = new Map(stats.map((s) => [s.id, s]));
  return {
    items: rows.map((p) => {
      const s = byId.get(p.id)!;
      const area = s.zonedArea + p.uncoveredAreaM2;
      const product = productOf(p);
      return {
        ...headerOf(p),
        productId: p.productId,
        productName: product.name,
        zoneCount: s.zoneCount,
        meanRateSi: area > 0 ? (s.zonedSeed + p.uncoveredAreaM2 * p.defaultRateSi) / area : 0,
        areaM2: area,
      };
    }),
  };
}

/** The product must be the workspace's, live, of the season's crop when it is seed, and fit the rate unit. */
async function checkProduct(
  actor: Actor,
  productId: string,
  crop: string,
  rateUnit: RateUnit,
  t?: Transaction,
) {
  const product = await Product.findOne({
    where: { id: productId, workspaceId: actor.workspaceId },
    transaction: t,
  });
  if (!product)
    throw new ValidationError('Choose a product of this workspace', [
      { path: ['productId'], message: 'Unknown product' },
    ]);
  if (product.archivedAt) {
    throw new ValidationError('That product is archived', [
      { path: ['productId'], message: `${product.name} is archived: restore it or choose another` },
    ]);
  }
  if (product.kind === 'seed' && product.crop !== crop) {
    const label = (c: string | null) => (c ? (CROP_LABELS[c as keyof typeof CROP_LABELS] ?? c) : '');
    throw new ValidationError('The seed is not of the season’s crop', [
      {
        path: ['productId'],
        message: `${product.name} is ${label(product.crop).toLowerCase()} seed, but this season grows ${label(crop).toLowerCase()}`,
      },
    ]);
  }
  if (RATE_UNIT_DEFS[rateUnit].kind !== product.rateKind) {
    throw new ValidationError('The rate unit does not fit the product', [
      {
        path: ['rateUnit'],
        message: `${product.name} is rated by ${product.rateKind}: choose a ${product.rateKind} unit`,
      },
    ]);
  }
  return product;
}

async function checkPlanterOf(actor: Actor, planterId: string | null, growerId: string, t?: Transaction) {
  if (!planterId) return null;
  const planter = await Planter.findOne({
    where: { id: planterId, workspaceId: actor.workspaceId, growerId },
    transaction: t,
  });
  if (!planter) {
    throw new ValidationError('Choose one of this grower’s planters', [
      { path: ['planterId'], message: 'Not a planter of this grower' },
    ]);
  }
  return planter;
}

export async function createPrescription(actor: Actor, input: z.output<typeof createPrescriptionSchema>) {
  const map = await findZoneMap(actor, input.zoneMapId);
  if (map.archivedAt) {
    throw new ValidationError('That zone map is archived', [
      { path: ['zoneMapId'], message: 'Restore the zone map or choose another' },
    ]);
  }
  if (!map.field?.boundary) {
    throw new ValidationError('The field has no boundary', [
      { path: ['zoneMapId'], message: 'Set the field’s boundary first' },
    ]);
  }
  const analysis = await analyse(map.id, map.fieldId);
  const zoneCount = (
    await db().query<{ n: number }>('SELECT count(*)::int AS n FROM zones WHERE zone_map_id = :id', {
      replacements: { id: map.id },
      type: QueryTypes.SELECT,
    })
  )[0].n;
  if (zoneCount === 0) {
    throw new ValidationError('The zone map has no zones', [
      { path: ['zoneMapId'], message: 'Draw or import zones first' },
    ]);
  }
  const overlapM2 = analysis.overlaps.reduce((s, o) => s + o.areaM2, 0);
  if (overlapM2 > 1) {
    throw new ValidationError('Zones of that map overlap', [
      {
        path: ['zoneMapId'],
        message: `${analysis.overlaps.length} overlap(s) (${overlapM2.toFixed(0)} m²) would get two rates: resolve them on the zone map first`,
      },
    ]);
  }
  const crop = map.season!.crop;
  await checkProduct(actor, input.productId, crop, input.rateUnit);
  await checkPlanterOf(actor, input.planterId, map.growerId);
  const id = await db().transaction(async (t) => {
    const p = await Prescription.create(
      {
        workspaceId: actor.workspaceId,
        growerId: map.growerId,
        fieldId: map.fieldId,
        cropSeasonId: map.cropSeasonId,
        zoneMapId: map.id,
        productId: input.productId,
        planterId: input.planterId,
        lineageId: randomUUID(),
        versionNo: 1,
        name: input.name,
        rateUnit: input.rateUnit,
        defaultRateSi: input.defaultRateSi,
        outOfFieldRateSi: input.outOfFieldRateSi,
        minRateSi: input.minRateSi,
        maxRateSi: input.maxRateSi,
        createdBy: actor.userId,
        uncoveredAreaM2: 0,
      },
      { transaction: t },
    );
    await copyZonesFromMap(t, {
      prescriptionId: p.id,
      zoneMapId: map.id,
      fieldId: map.fieldId,
      workspaceId: actor.workspaceId,
      rateSi: input.defaultRateSi,
    });
    return p.id;
  });
  return getPrescription(actor, id);
}

function assertDraft(p: Prescription) {
  if (p.status !== 'draft') {
    throw new ConflictError(
      `Version ${p.versionNo} is ${p.status === 'approved' ? 'approved' : 'replaced'} and cannot change: make a new version to edit`,
      'frozen',
    );
  }
}

/** Locks the row for the rest of the transaction and re-reads it with everything the DTO needs. */
async function lockScoped(actor: Actor, id: string, t: Transaction) {
  await db().query('SELECT id FROM prescriptions WHERE id = :id FOR UPDATE', {
    replacements: { id },
    transaction: t,
  });
  return findPrescription(actor, id, t);
}

export async function updatePrescription(
  actor: Actor,
  id: string,
  input: z.output<typeof updatePrescriptionSchema>,
) {
  const unitSystem = await unitSystemOf(actor);
  await db().transaction(async (t) => {
    const p = await lockScoped(actor, id, t);
    assertDraft(p);
    assertVersion(p.version, input.version);
    await checkProduct(actor, input.productId, p.season!.crop, input.rateUnit, t);
    await checkPlanterOf(actor, input.planterId, p.growerId, t);

    const zones = await prescriptionZones(p.id, { transaction: t });
    const known = new Map(zones.map((z) => [z.id, z]));
    const problems: DomainError['details'] = [];
    input.rates.forEach((r, i) => {
      const zone = known.get(r.zoneId);
      if (!zone) {
        problems.push({ path: ['rates', i, 'zoneId'], message: 'Not a zone of this prescription' });
        return;
      }
      const unit = input.rateUnit;
      if (r.rateSi < input.minRateSi - 1e-12 || r.rateSi > input.maxRateSi + 1e-12) {
        const which =
          r.rateSi < input.minRateSi
            ? `below the lowest rate ${formatRate(input.minRateSi, unit)}`
            : `above the highest rate ${formatRate(input.maxRateSi, unit)}`;
        problems.push({
          path: ['rates', i, 'rateSi'],
          message: `${zone.name}: ${formatRate(r.rateSi, unit)} is ${which}`,
        });
      }
    });
    if (problems.length) throw new ValidationError('Some rates are outside the allowed range', problems);

    await setZoneRates(t, p.id, input.rates);
    p.set({
      name: input.name,
      productId: input.productId,
      planterId: input.planterId,
      rateUnit: input.rateUnit,
      defaultRateSi: input.defaultRateSi,
      outOfFieldRateSi: input.outOfFieldRateSi,
      minRateSi: input.minRateSi,
      maxRateSi: input.maxRateSi,
    });
    // Every save counts as a change (rates live in another table), so the version always moves on.
    p.changed('updatedAt', true);
    p.set('updatedAt', new Date());
    await p.save({ transaction: t });

    // An acceptance covers what was flagged when it was given; a changed rate or planter voids it.
    if (p.acceptance) {
      const fresh = await findPrescription(actor, id, t);
      const check = checkOf(fresh, await prescriptionZones(id, { transaction: t }), unitSystem);
      if (!acceptanceHolds(p.acceptance, check, fresh.planterId)) {
        await db().query('UPDATE prescriptions SET acceptance = NULL WHERE id = :id', {
          replacements: { id },
          transaction: t,
        });
      }
    }
  });
  return getPrescription(actor, id);
}

export async function acceptCheck(actor: Actor, id: string, input: z.output<typeof acceptCheckSchema>) {
  const unitSystem = await unitSystemOf(actor);
  await db().transaction(async (t) => {
    const p = await lockScoped(actor, id, t);
    assertDraft(p);
    assertVersion(p.version, input.version);
    const check = checkOf(p, await prescriptionZones(id, { transaction: t }), unitSystem);
    if (!check?.blocking) {
      throw new ValidationError('Nothing is flagged: there is nothing to accept', [
        { path: ['reason'], message: 'The planter check passes as it is' },
      ]);
    }
    const me = await User.findByPk(actor.userId, { attributes: ['name'], transaction: t });
    const flagged = flaggedOf(check);
    const acceptance: StoredAcceptance = {
      reason: input.reason,
      acceptedById: actor.userId,
      acceptedByName: me?.name ?? '',
      acceptedAt: new Date().toISOString(),
      zoneIds: flagged.map((f) => f.zoneId),
      rates: Object.fromEntries(flagged.map((f) => [f.zoneId, f.rateSi])),
      planterId: p.planterId,
    };
    p.acceptance = acceptance;
    await p.save({ transaction: t });
  });
  return getPrescription(actor, id);
}

export type ApprovalNotice = { prescriptionId: string; growerId: string; workspaceId: string };

export async function approvePrescription(
  actor: Actor,
  id: string,
  version: number,
  notify: (n: ApprovalNotice) => Promise<void>,
) {
  const unitSystem = await unitSystemOf(actor);
  await db().transaction(async (t) => {
    const p = await lockScoped(actor, id, t);
    assertDraft(p);
    assertVersion(p.version, version);
    const zones = await prescriptionZones(id, { transaction: t });
    const check = checkOf(p, zones, unitSystem);
    if (check?.blocking && !acceptanceHolds(p.acceptance, check, p.planterId)) {
      const flagged = check.zones.filter((z) => z.status === 'flagged').map((z) => z.name);
      throw new ConflictError(
        `The planter check flags ${flagged.length ? flagged.join(', ') : 'this planter'}: change the rates or accept them with a reason before approving`,
        'check_not_accepted',
        check.zones
          .filter((z) => z.status === 'flagged')
          .map((z) => ({ path: ['zones', z.zoneId], message: z.messages.join(' ') })),
      );
    }
    const me = await User.findByPk(actor.userId, { attributes: ['name'], transaction: t });
    const now = new Date();
    await Prescription.update(
      { status: 'superseded', supersededAt: now },
      { where: { lineageId: p.lineageId, status: 'approved', id: { [Op.ne]: p.id } }, transaction: t },
    );
    p.set({
      status: 'approved',
      approvedAt: now,
      approvedBy: actor.userId,
      approvedByName: me?.name ?? null,
      productSnapshot: productToDto(p.product!),
      planterSnapshot: p.planter ? planterToDto(p.planter) : null,
    });
    await p.save({ transaction: t });
  });
  const approved = await findPrescription(actor, id);
  await notify({ prescriptionId: id, growerId: approved.growerId, workspaceId: approved.workspaceId });
  return toDto(approved, unitSystem);
}

export async function newVersion(actor: Actor, id: string) {
  const newId = await db().transaction(async (t) => {
    const p = await lockScoped(actor, id, t);
    if (p.status === 'draft') {
      throw new ConflictError(`Version ${p.versionNo} is a draft already: edit it`, 'draft_exists', [
        { path: ['id'], message: p.id },
      ]);
    }
    const draft = await Prescription.findOne({
      where: { lineageId: p.lineageId, status: 'draft' },
      transaction: t,
    });
    if (draft) {
      throw new ConflictError(
        `Version ${draft.versionNo} is already a draft: edit that one`,
        'draft_exists',
        [{ path: ['id'], message: draft.id }],
      );
    }
    const maxNo =
      (await Prescription.max<number, Prescription>('versionNo', {
        where: { lineageId: p.lineageId },
        transaction: t,
      })) ?? 0;
    const next = await Prescription.create(
      {
        workspaceId: p.workspaceId,
        growerId: p.growerId,
        fieldId: p.fieldId,
        cropSeasonId: p.cropSeasonId,
        zoneMapId: p.zoneMapId,
        productId: p.productId,
        planterId: p.planterId,
        lineageId: p.lineageId,
        versionNo: maxNo + 1,
        name: p.name,
        rateUnit: p.rateUnit,
        defaultRateSi: p.defaultRateSi,
        outOfFieldRateSi: p.outOfFieldRateSi,
        minRateSi: p.minRateSi,
        maxRateSi: p.maxRateSi,
        createdBy: actor.userId,
        uncoveredAreaM2: p.uncoveredAreaM2,
      },
      { transaction: t },
    );
    await copyZonesFromPrescription(t, p.id, next.id);
    return next.id;
  });
  return getPrescription(actor, newId);
}

export async function deleteDraft(actor: Actor, id: string, version: number) {
  await db().transaction(async (t) => {
    const p = await lockScoped(actor, id, t);
    assertDraft(p);
    assertVersion(p.version, version);
    await p.destroy({ transaction: t });
  });
}

/** The farmers of a grower who should hear of an approval (active accounts only). */
export async function farmersOf(workspaceId: string, growerId: string) {
  return User.findAll({
    where: { workspaceId, growerId, role: 'farmer', status: 'active' },
    attributes: ['id', 'email', 'name'],
  });
}
