import { QueryTypes } from 'sequelize';
import { Prescription } from '../../db/associations';
import type { Mailer } from '../../mail/mailer';

/**
 * Tells the grower's people (its farmers, its consultants and whoever uploaded the log) that an audit is
 * ready or signed off. A mail failure never undoes anything.
 */
export function auditNotifier(mailer: Mailer, appUrl: string) {
  return async (logId: string, signed: boolean) => {
    const db = Prescription.sequelize!;
    const [log] = await db.query<{
      growerId: string;
      workspaceId: string;
      fieldName: string;
      createdBy: string | null;
      finding: string | null;
    }>(
      `SELECT l.grower_id AS "growerId", l.workspace_id AS "workspaceId", f.name AS "fieldName", l.created_by AS "createdBy",
              a.result #>> '{findings,0,text}' AS finding
         FROM as_applied_logs l JOIN fields f ON f.id = l.field_id LEFT JOIN audits a ON a.log_id = l.id WHERE l.id = :logId`,
      { replacements: { logId }, type: QueryTypes.SELECT },
    );
    if (!log) return;
    const people = await db.query<{ email: string; name: string }>(
      `SELECT DISTINCT u.email, u.name FROM users u
        WHERE u.workspace_id = :ws AND u.status = 'active'
          AND ((u.role = 'farmer' AND u.grower_id = :growerId)
            OR (u.role = 'consultant' AND EXISTS (SELECT 1 FROM consultant_growers c WHERE c.user_id = u.id AND c.grower_id = :growerId))
            OR u.id = :createdBy)`,
      {
        replacements: { ws: log.workspaceId, growerId: log.growerId, createdBy: log.createdBy },
        type: QueryTypes.SELECT,
      },
    );
    const link = `${appUrl}/logs/${logId}/audit`;
    for (const p of people) {
      await mailer.send({
        to: p.email,
        subject: signed
          ? `Planting audit signed off: ${log.fieldName}`
          : `Planting audit ready: ${log.fieldName}`,
        text: [
          `Hello ${p.name},`,
          '',
          signed
            ? `The planting audit of ${log.fieldName} was signed off; it will not change any more.`
            : `The as-applied log of ${log.fieldName} has been read and checked against its prescription.`,
          log.finding ? `First finding: ${log.finding}` : '',
          '',
          `Open it: ${link}`,
          '',
          'The audit is advice from the log as recorded; check unexpected findings in the field before acting on them.',
        ]
          .filter((l, i, all) => l !== '' || all[i - 1] !== '')
          .join('\n'),
      });
    }
  };
}
