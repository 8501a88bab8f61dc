import { PRESCRIPTION_STATUS_LABELS, type PrescriptionStatus } from '@shared/schemas/prescription.schema';
import { Badge, type Tone } from '@/components/ui/badge';

const TONES: Record<PrescriptionStatus, Tone> = { draft: 'accent', approved: 'ok', superseded: 'neutral' };

/** Draft, Approved or Replaced: the word carries the meaning, the colour repeats it. */
export function StatusBadge({ status }: { status: PrescriptionStatus }) {
  return <Badge tone={TONES[status]}>{PRESCRIPTION_STATUS_LABELS[status]}</Badge>;
}
