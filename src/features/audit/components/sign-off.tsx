import { useState } from 'react';
import type { Audit } from '@shared/schemas/as-applied.schema';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/dialog';
import { Notice } from '@/components/ui/notice';
import { describeError } from '@/components/ui/query-state';
import { formatDateTime } from '@/lib/format';
import { useSignOffAudit } from '../api/audit-actions';

/** The banner of a signed-off audit: who signed it off, when, and that it no longer changes. */
export function SignedOffBanner({ audit }: { audit: Audit }) {
  if (audit.status !== 'signed-off') return null;
  return (
    <Notice
      tone="ok"
      title={`Signed off by ${audit.signedOffBy?.name ?? 'the consultant'} on ${formatDateTime(audit.signedOffAt)}`}
    >
      The audit is frozen: its cleaning and its figures no longer change. Comments stay open.
    </Notice>
  );
}

/** "Sign off", with a confirmation that says it freezes the audit. For the consultant and admins. */
export function SignOffButton({ audit }: { audit: Audit }) {
  const [open, setOpen] = useState(false);
  const signOff = useSignOffAudit(audit.logId);
  if (audit.status !== 'open') return null;
  return (
    <>
      <Button variant="primary" className="print:hidden" onClick={() => setOpen(true)}>
        Sign off
      </Button>
      <ConfirmDialog
        open={open}
        title="Sign off this audit?"
        confirmLabel="Sign off"
        busy={signOff.isPending}
        error={signOff.isError ? describeError(signOff.error) : null}
        onClose={() => {
          setOpen(false);
          signOff.reset();
        }}
        onConfirm={() =>
          signOff.mutate({ logId: audit.logId, version: audit.version }, { onSuccess: () => setOpen(false) })
        }
      >
        <p>
          Signing off freezes the audit: its cleaning, band and figures will not change any more. Comments
          stay open.
        </p>
        <p className="text-sm text-ink-soft">
          The grower’s farmers, its consultants and whoever uploaded the log are e-mailed.
        </p>
      </ConfirmDialog>
    </>
  );
}
