import { QueryTypes } from 'sequelize';
import type { MigrationContext } from '../umzug';
import { DEMO_WORKSPACE } from './20261202-0001-demo';
import type { Actor } from '../../types';
import { createProduct } from '../../routes/products/product.service';
import {
  acceptCheck,
  approvePrescription,
  createPrescription,
  updatePrescription,
} from '../../routes/prescriptions/prescription.service';
import { ratesByRule } from '../../../shared/rates/rate-rule';
import { rateToSi, quantityToSi } from '../../../shared/rates/rate-units';
import { DEFAULT_SEEDS_PER_UNIT } from '../../../shared/rates/seed-units';
import type { ProductInput } from '../../../shared/schemas/product.schema';

/**
 * Demo products (invented names) and, for every demo field, an approved prescription made the way an
 * agronomist would: rates by rule from the zone map's productivity index, the planter check, and where the
 * check flags a zone, an acceptance with the reason. Rates are plausible, not advice.
 */
const PRODUCTS: ProductInput[] = [
  {
    kind: 'seed',
    name: 'Tamarack 108 (demo hybrid)',
    crop: 'corn',
    rateKind: 'count',
    unitName: 'unit',
    unitSize: DEFAULT_SEEDS_PER_UNIT.corn,
    pricePerUnit: 286,
    currency: 'USD',
    notes: 'Invented hybrid for the demo. Seed treated with a fungicide and insecticide: follow the label.',
  },
  {
    kind: 'seed',
    name: 'Heron 2.9 (demo variety)',
    crop: 'soybean',
    rateKind: 'count',
    unitName: 'unit',
    unitSize: DEFAULT_SEEDS_PER_UNIT.soybean,
    pricePerUnit: 58,
    currency: 'USD',
    notes: 'Invented variety for the demo.',
  },
  {
    kind: 'other',
    name: 'In-furrow starter 6-24-6 (demo)',
    crop: null,
    rateKind: 'volume',
    unitName: 'tote',
    unitSize: quantityToSi(250, 'gal'),
    pricePerUnit: 1_450,
    currency: 'USD',
    notes: 'Liquid starter placed with the seed: keep to the rate the label allows in furrow.',
  },
];

/** Base, bounds and rounding step per crop, in seeds per acre. */
const RULES = {
  corn: { base: 33_000, min: 26_000, max: 38_000, step: 500, name: 'Corn 2027 rates' },
  soybean: { base: 140_000, min: 110_000, max: 175_000, step: 5_000, name: 'Soybean 2027 rates' },
} as const;

export async function up({ context: sequelize }: MigrationContext) {
  const [ws] = await sequelize.query<{ id: string }>('SELECT id FROM workspaces WHERE name = :name', {
    replacements: { name: DEMO_WORKSPACE },
    type: QueryTypes.SELECT,
  });
  if (!ws) return;
  const [agronomist] = await sequelize.query<{ id: string }>(
    `SELECT id FROM users WHERE workspace_id = :ws AND role = 'agronomist' ORDER BY created_at LIMIT 1`,
    { replacements: { ws: ws.id }, type: QueryTypes.SELECT },
  );
  if (!agronomist) return;
  const actor: Actor = { userId: agronomist.id, workspaceId: ws.id, role: 'agronomist', growerScope: null };

  const existing = await sequelize.query<{ id: string; crop: string | null; kind: string }>(
    'SELECT id, crop, kind FROM products WHERE workspace_id = :ws',
    { replacements: { ws: ws.id }, type: QueryTypes.SELECT },
  );
  const productByCrop = new Map(existing.filter((p) => p.kind === 'seed').map((p) => [p.crop, p.id]));
  if (existing.length === 0) {
    for (const input of PRODUCTS) {
      const p = await createProduct(actor, {
        ...input,
        currency: input.currency ?? 'USD',
        notes: input.notes ?? null,
      });
      if (p.kind === 'seed') productByCrop.set(p.crop, p.id);
    }
  }

  const maps = await sequelize.query<{
    zoneMapId: string;
    crop: 'corn' | 'soybean';
    planterId: string | null;
  }>(
    `SELECT DISTINCT ON (z.field_id) z.id AS "zoneMapId", s.crop,
            (SELECT p.id FROM planters p WHERE p.grower_id = z.grower_id AND p.archived_at IS NULL
              ORDER BY p.created_at LIMIT 1) AS "planterId"
       FROM zone_maps z JOIN crop_seasons s ON s.id = z.crop_season_id
      WHERE z.workspace_id = :ws AND z.archived_at IS NULL
        AND NOT EXISTS (SELECT 1 FROM prescriptions r WHERE r.field_id = z.field_id)
      ORDER BY z.field_id, z.version_no DESC`,
    { replacements: { ws: ws.id }, type: QueryTypes.SELECT },
  );
  for (const m of maps) {
    const rule = RULES[m.crop];
    const productId = productByCrop.get(m.crop);
    if (!rule || !productId) continue;
    const si = (v: number) => rateToSi(v, 'seeds/ac');
    let rx = await createPrescription(actor, {
      zoneMapId: m.zoneMapId,
      productId,
      planterId: m.planterId,
      name: rule.name,
      rateUnit: 'seeds/ac',
      defaultRateSi: si(rule.base),
      outOfFieldRateSi: 0,
      minRateSi: si(rule.min),
      maxRateSi: si(rule.max),
    });
    const rates = ratesByRule({
      base: rule.base,
      min: rule.min,
      max: rule.max,
      step: rule.step,
      zones: rx.zones.map((z) => ({ zoneId: z.id, productivityIndex: z.productivityIndex })),
    });
    rx = await updatePrescription(actor, rx.id, {
      version: rx.version,
      name: rx.name,
      productId,
      planterId: m.planterId,
      rateUnit: 'seeds/ac',
      defaultRateSi: rx.defaultRateSi,
      outOfFieldRateSi: 0,
      minRateSi: rx.minRateSi,
      maxRateSi: rx.maxRateSi,
      rates: rates.map((r) => ({ zoneId: r.zoneId, rateSi: si(r.rate) })),
    });
    if (rx.check?.blocking) {
      rx = await acceptCheck(actor, rx.id, {
        version: rx.version,
        reason:
          rx.check.holesPerDisc == null
            ? 'The grower’s planter has no disc for this crop: a neighbour plants this field with a planter not yet profiled here; rates checked against its disc by phone.'
            : 'Agreed with the grower: slow down in the flagged zones so the disc keeps up; watch the population readout there.',
      });
    }
    await approvePrescription(actor, rx.id, rx.version, async () => {});
  }
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query(
    `DELETE FROM prescriptions WHERE workspace_id IN (SELECT id FROM workspaces WHERE name = :name);
     DELETE FROM products WHERE workspace_id IN (SELECT id FROM workspaces WHERE name = :name);`,
    { replacements: { name: DEMO_WORKSPACE } },
  );
}
