import Papa from 'papaparse';
import { QueryTypes } from 'sequelize';
import { Prescription, User } from '../../db/associations';
import { ConflictError, ForbiddenError, NotFoundError } from '../../errors';
import type { Actor } from '../../types';
import { auditResultSchema, type Audit } from '../../../shared/schemas/as-applied.schema';
import { RATE_UNIT_DEFS, rateFromSi, type RateUnit } from '../../../shared/rates/rate-units';
import { m2ToAc, m2ToHa, type UnitSystem } from '../../../shared/units';
import { getLog, logScope } from './log.service';

const db = () => Prescription.sequelize!;

type AuditRow = {
  id: string;
  logId: string;
  growerId: string;
  status: 'open' | 'signed-off';
  bandFraction: number;
  result: unknown;
  signedOffBy: string | null;
  signedOffByName: string | null;
  signedOffAt: Date | null;
  version: number;
  updatedAt: Date;
};

async function auditRow(actor: Actor, logId: string): Promise<AuditRow> {
  const scope = logScope(actor);
  const [row] = await db().query<AuditRow>(
    `SELECT a.id, a.log_id AS "logId", a.grower_id AS "growerId", a.status, a.band_fraction AS "bandFraction",
            a.result, a.signed_off_by AS "signedOffBy", a.signed_off_by_name AS "signedOffByName",
            a.signed_off_at AS "signedOffAt", a.version, a.updated_at AS "updatedAt"
       FROM audits a JOIN as_applied_logs l ON l.id = a.log_id
      WHERE a.log_id = :logId AND ${scope.sql}`,
    { replacements: { logId, ...scope.replacements }, type: QueryTypes.SELECT },
  );
  const parsed = row ? auditResultSchema.safeParse(row.result) : null;
  if (!row || !parsed?.success) {
    await getLog(actor, logId); // 404 outside scope
    throw new NotFoundError('Audit (the log is still being read)');
  }
  return row;
}

export async function getAudit(actor: Actor, logId: string): Promise<Audit> {
  const row = await auditRow(actor, logId);
  const comments = await db().query<{
    id: string;
    authorId: string | null;
    authorName: string;
    authorRole: string;
    body: string;
    createdAt: Date;
  }>(
    `SELECT id, author_id AS "authorId", author_name AS "authorName", author_role AS "authorRole", body,
            created_at AS "createdAt" FROM audit_comments WHERE audit_id = :id ORDER BY created_at, id`,
    { replacements: { id: row.id }, type: QueryTypes.SELECT },
  );
  return {
    id: row.id,
    logId: row.logId,
    status: row.status,
    bandFraction: row.bandFraction,
    result: auditResultSchema.parse(row.result),
    signedOffBy: row.signedOffAt
      ? { id: row.signedOffBy ?? '00000000-0000-0000-0000-000000000000', name: row.signedOffByName ?? '' }
      : null,
    signedOffAt: row.signedOffAt ? new Date(row.signedOffAt).toISOString() : null,
    comments: comments.map((c) => ({
      id: c.id,
      author: {
        id: c.authorId ?? '00000000-0000-0000-0000-000000000000',
        name: c.authorName,
        role: c.authorRole,
      },
      body: c.body,
      createdAt: new Date(c.createdAt).toISOString(),
    })),
    version: row.version,
    updatedAt: new Date(row.updatedAt).toISOString(),
  };
}

/** Anyone who may see the audit may comment on it, also after sign-off (a comment changes no figure). */
export async function addComment(actor: Actor, logId: string, body: string) {
  const row = await auditRow(actor, logId);
  const me = await User.findByPk(actor.userId, { attributes: ['name', 'role'] });
  await db().query(
    `INSERT INTO audit_comments (audit_id, workspace_id, author_id, author_name, author_role, body)
     VALUES (:auditId, :ws, :userId, :name, :role, :body)`,
    {
      replacements: {
        auditId: row.id,
        ws: actor.workspaceId,
        userId: actor.userId,
        name: me?.name ?? '',
        role: me?.role ?? actor.role,
        body,
      },
    },
  );
  return getAudit(actor, logId);
}

/** The grower's consultant (or an admin) signs the audit off: from then on it is frozen. */
export async function signOff(
  actor: Actor,
  logId: string,
  version: number,
  notify: (logId: string, signed: boolean) => Promise<void>,
) {
  if (actor.role !== 'consultant' && actor.role !== 'admin')
    throw new ForbiddenError('Only the grower’s consultant signs an audit off');
  const row = await auditRow(actor, logId);
  if (row.status === 'signed-off') throw new ConflictError('The audit is signed off already', 'frozen');
  const me = await User.findByPk(actor.userId, { attributes: ['name'] });
  const updated = await db().query<{ id: string }>(
    `UPDATE audits SET status = 'signed-off', signed_off_by = :userId, signed_off_by_name = :name,
            signed_off_at = now(), version = version + 1, updated_at = now()
      WHERE id = :id AND version = :version AND status = 'open' RETURNING id`,
    {
      replacements: { id: row.id, version, userId: actor.userId, name: me?.name ?? '' },
      type: QueryTypes.SELECT,
    },
  );
  if (updated.length === 0) {
    throw new ConflictError(
      'Someone else changed this audit since you opened it: reload it and try again',
      'stale',
    );
  }
  await notify(logId, true).catch((err: Error) =>
    process.stderr.write(`[audit] sign-off mail: ${err.message}\n`),
  );
  return getAudit(actor, logId);
}

/** The per-zone table as CSV in the reader's units. */
export async function auditCsv(actor: Actor, logId: string, system: UnitSystem) {
  const audit = await getAudit(actor, logId);
  const [rx] = await db().query<{ rateUnit: RateUnit }>(
    'SELECT r.rate_unit AS "rateUnit" FROM as_applied_logs l JOIN prescriptions r ON r.id = l.prescription_id WHERE l.id = :logId',
    { replacements: { logId }, type: QueryTypes.SELECT },
  );
  const unit = rx?.rateUnit ?? 'seeds/ac';
  const d = RATE_UNIT_DEFS[unit].decimals;
  const rate = (si: number) => Number(rateFromSi(si, unit).toFixed(d));
  const area = (m2: number) => Number((system === 'imperial' ? m2ToAc(m2) : m2ToHa(m2)).toFixed(2));
  const areaKey = system === 'imperial' ? 'area_ac' : 'area_ha';
  const r = audit.result;
  const rows = [
    ...r.zones.map((z) => ({ zone: z.name, s: z.stats, t: z.statsTrue })),
    { zone: 'Whole field', s: r.field, t: r.fieldTrue },
  ].map(({ zone, s, t }) => ({
    zone,
    [areaKey]: area(s.areaM2),
    points: s.points,
    [`target_${unit}`]: rate(s.meanTargetSi),
    [`applied_${unit}`]: rate(s.meanAppliedSi),
    bias_pct: Number(s.biasPct.toFixed(2)),
    rmse: rate(s.rmseSi),
    cv_pct: Number(s.cvPct.toFixed(2)),
    in_band_pct: Number((s.inBandShare * 100).toFixed(1)),
    [`over_${areaKey.slice(5)}`]: area(s.areaOverM2),
    [`under_${areaKey.slice(5)}`]: area(s.areaUnderM2),
    units_delta: Number(s.unitsDelta.toFixed(2)),
    cost_delta: s.costDelta == null ? '' : Number(s.costDelta.toFixed(2)),
    [`true_applied_${unit}`]: t ? rate(t.meanAppliedSi) : '',
    true_bias_pct: t ? Number(t.biasPct.toFixed(2)) : '',
  }));
  return Papa.unparse(rows);
}
