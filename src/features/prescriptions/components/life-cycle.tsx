import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import type { Prescription } from '@shared/schemas/prescription.schema';
import { ProblemList } from '@/components/form/problem-list';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/dialog';
import { Notice } from '@/components/ui/notice';
import { describeError } from '@/components/ui/query-state';
import { isApiError } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { useApprovePrescription, useDeletePrescription, useNewPrescriptionVersion } from '../api/life-cycle';
import { Cautions } from './cautions';
import { StatusBadge } from './status-badge';

const UUID = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/i;

/** The open draft a 409 `draft_exists` names (in its details), if it names one. */
function draftIdOf(error: unknown): string | null {
  if (!isApiError(error) || error.code !== 'draft_exists') return null;
  for (const d of error.details) {
    const hit = [...d.path.map(String), d.message].find((s) => UUID.test(s));
    if (hit) return hit.match(UUID)![0];
  }
  return error.message.match(UUID)?.[0] ?? null;
}

/** Why approval is not possible now, or null. */
export function approvalBlock(p: Prescription, dirty: boolean, hasProblems: boolean): string | null {
  if (hasProblems) return 'Some rates need fixing first (marked in the table).';
  if (dirty) return 'Save your changes first: approval takes the saved rates.';
  if (p.check?.blocking && !p.acceptance)
    return 'The planter check flags zones: change their rates, or accept the check with a reason.';
  return null;
}

/**
 * Where the prescription stands: its state, version, who made and who approved it, and what can be done
 * next by those who may: approve a draft, start a new version of an approved one, delete a draft.
 */
export function LifeCycle({
  prescription: p,
  canWrite,
  block,
}: {
  prescription: Prescription;
  canWrite: boolean;
  /** Why Approve is held back (unsaved changes, a blocking check), or null. */
  block: string | null;
}) {
  const navigate = useNavigate();
  const approve = useApprovePrescription(p.id);
  const copy = useNewPrescriptionVersion();
  const remove = useDeletePrescription();
  const [asking, setAsking] = useState<'approve' | 'delete' | null>(null);
  const existingDraft = copy.isError ? draftIdOf(copy.error) : null;

  return (
    <div className="space-y-3 rounded-card border border-ink-line bg-paper-raised px-4 py-3">
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        <span className="flex items-center gap-2">
          <StatusBadge status={p.status} />
          <span className="font-mono text-sm text-ink">Version {p.versionNo}</span>
        </span>
        <span className="text-sm text-ink-soft">
          {p.createdBy ? `Made by ${p.createdBy.name}, ` : 'Made '}
          {formatDateTime(p.createdAt)}
        </span>
        {p.approvedBy || p.approvedAt ? (
          <span className="text-sm text-ink-soft" data-approved>
            Approved by {p.approvedBy?.name ?? 'someone no longer here'}, {formatDateTime(p.approvedAt)}
          </span>
        ) : null}
        {p.supersededAt ? (
          <span className="text-sm text-ink-soft">Replaced {formatDateTime(p.supersededAt)}</span>
        ) : null}
        {canWrite ? (
          <span className="ml-auto flex flex-wrap items-center gap-2">
            {p.status === 'draft' ? (
              <>
                <Button variant="ghost" onClick={() => setAsking('delete')}>
                  Delete draft
                </Button>
                <Button variant="primary" disabled={!!block} onClick={() => setAsking('approve')}>
                  Approve
                </Button>
              </>
            ) : null}
            {p.status === 'approved' ? (
              <Button
                busy={copy.isPending}
                onClick={() =>
                  copy.mutate({ id: p.id }, { onSuccess: (next) => navigate(`/prescriptions/${next.id}`) })
                }
              >
                Edit as new version
              </Button>
            ) : null}
          </span>
        ) : null}
      </div>
      {canWrite && p.status === 'draft' && block ? (
        <p className="text-sm text-ink-soft" id="approve-held">
          Approve is held back: {block}
        </p>
      ) : null}
      {canWrite && p.status === 'draft' ? <Cautions which={['advice']} /> : null}
      {approve.isError ? (
        <Notice tone="danger" title="Not approved">
          <ProblemList error={approve.error} />
        </Notice>
      ) : null}
      {copy.isError ? (
        existingDraft ? (
          <Notice tone="caution" title="A draft of this prescription is already open">
            Only one draft at a time.{' '}
            <Link className="text-clay-700 underline" to={`/prescriptions/${existingDraft}`}>
              Open the draft
            </Link>
          </Notice>
        ) : (
          <Notice tone="danger" title="No new version">
            <ProblemList error={copy.error} />
          </Notice>
        )
      ) : null}
      <ConfirmDialog
        open={asking === 'approve'}
        title={`Approve version ${p.versionNo}?`}
        confirmLabel="Approve"
        busy={approve.isPending}
        error={approve.isError ? describeError(approve.error) : null}
        onClose={() => setAsking(null)}
        onConfirm={() =>
          approve.mutate({ id: p.id, version: p.version }, { onSuccess: () => setAsking(null) })
        }
      >
        <p>
          Once approved the rates are frozen and the grower&apos;s farmers are e-mailed that it is ready to
          export. Changes later make a new version.
        </p>
        <Cautions which={['advice']} />
      </ConfirmDialog>
      <ConfirmDialog
        open={asking === 'delete'}
        title="Delete this draft?"
        confirmLabel="Delete the draft"
        tone="danger"
        busy={remove.isPending}
        error={remove.isError ? describeError(remove.error) : null}
        onClose={() => setAsking(null)}
        onConfirm={() =>
          remove.mutate({ id: p.id, version: p.version }, { onSuccess: () => navigate('/prescriptions') })
        }
      >
        <p>The draft and its rates are removed. Approved versions of the same prescription stay.</p>
      </ConfirmDialog>
    </div>
  );
}
