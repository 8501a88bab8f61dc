import type { Mailer } from '../../mail/mailer';
import { findPrescription, productOf } from './prescription.dto';
import { farmersOf, type ApprovalNotice } from './prescription.service';

/**
 * Tells the grower's farmers that a prescription is approved and ready to export. A mail failure is logged
 * and never undoes the approval (the farmer's home lists it either way).
 */
export function approvalNotifier(mailer: Mailer, appUrl: string) {
  return async (n: ApprovalNotice) => {
    try {
      const full = await findPrescription(
        { userId: '', workspaceId: n.workspaceId, role: 'admin', growerScope: null },
        n.prescriptionId,
      );
      const product = productOf(full);
      const link = `${appUrl}/prescriptions/${full.id}`;
      const farmers = await farmersOf(n.workspaceId, n.growerId);
      for (const f of farmers) {
        await mailer.send({
          to: f.email,
          subject: `Ready to export: ${full.field?.name ?? 'field'}, ${product.name}, version ${full.versionNo}`,
          text: [
            `Hello ${f.name},`,
            '',
            `The prescription "${full.name}" for ${full.field?.name ?? 'your field'} (${product.name}) was approved and is ready to export for your planter's display.`,
            '',
            `Open it: ${link}`,
            '',
            'These rates are advice: check them against the field before planting, and plant only what local regulations allow.',
            product.kind === 'seed'
              ? 'Treated seed is a pesticide: handle, store and plant it as its label says.'
              : '',
          ]
            .filter((l, i, all) => l !== '' || all[i - 1] !== '')
            .join('\n'),
        });
      }
    } catch (err) {
      console.error('approval e-mail failed', err);
    }
  };
}
