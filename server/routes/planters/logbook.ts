import { Router } from 'express';
import { QueryTypes } from 'sequelize';
import { idParamsSchema } from '../../../shared/schemas/common.schema';
import { actorOf, handle } from '../../middleware/handle';
import { requireSignIn } from '../../middleware/authenticate';
import { Planter } from '../../db/associations';
import { assertFound, scopedWhere } from '../../lib/scope';
import type { Actor } from '../../types';

type Sums = { areaM2: number; quantity: number; distanceM: number; hours: number };

/**
 * A planter's lifetime counters from its logbook (a ledger no one edits): per season and in total, with
 * every entry and its note (logs added, read again, deleted).
 */
export async function planterLogbook(actor: Actor, planterId: string) {
  const planter = assertFound(
    await Planter.findOne({ where: scopedWhere(actor, { id: planterId }) }),
    'Planter',
  );
  const db = Planter.sequelize!;
  const entries = await db.query<
    Sums & {
      id: string;
      seasonId: string;
      year: number;
      crop: string;
      logId: string;
      kind: string;
      note: string;
      createdAt: Date;
    }
  >(
    `SELECT b.id::text, b.crop_season_id AS "seasonId", s.year, s.crop, b.log_id AS "logId", b.kind,
            b.area_m2 AS "areaM2", b.quantity, b.distance_m AS "distanceM", b.hours, b.note, b.created_at AS "createdAt"
       FROM planter_logbook b JOIN crop_seasons s ON s.id = b.crop_season_id
      WHERE b.planter_id = :planterId ORDER BY b.created_at, b.id`,
    { replacements: { planterId: planter.id }, type: QueryTypes.SELECT },
  );
  const add = (a: Sums, e: Sums) => ({
    areaM2: a.areaM2 + e.areaM2,
    quantity: a.quantity + e.quantity,
    distanceM: a.distanceM + e.distanceM,
    hours: a.hours + e.hours,
  });
  const zero: Sums = { areaM2: 0, quantity: 0, distanceM: 0, hours: 0 };
  const byYear = new Map<number, Sums>();
  let total = zero;
  for (const e of entries) {
    byYear.set(e.year, add(byYear.get(e.year) ?? zero, e));
    total = add(total, e);
  }
  return {
    planterId: planter.id,
    planterName: planter.name,
    total,
    seasons: [...byYear].sort((a, b) => b[0] - a[0]).map(([year, sums]) => ({ year, ...sums })),
    entries: entries.map((e) => ({ ...e, createdAt: new Date(e.createdAt).toISOString() })),
  };
}

/** GET /api/planters/:id/logbook: read by everyone who may see the planter; nothing writes it by hand. */
export function planterLogbookRouter() {
  const router = Router();
  router.use(requireSignIn);
  router.get(
    '/:id/logbook',
    handle({ params: idParamsSchema }, ({ req, params }) => planterLogbook(actorOf(req), params.id)),
  );
  return router;
}
