import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Prescription } from '@shared/schemas/prescription.schema';
import { isStaleVersion } from '@/components/form/use-save-errors';
import { resourceKeys } from '@/lib/query-keys';

export const prescriptionKeys = resourceKeys('prescriptions');
export const productKeys = resourceKeys('products');

/**
 * A mutation answering a whole prescription (a new one, a saved draft, an approved one): the answer
 * replaces the cached detail and every prescription list reloads (a status or a version changed). A 409
 * stale reloads the prescription the caller was working on, and the caller says so.
 */
export function usePrescriptionMutation<V>(
  mutationFn: (variables: V) => Promise<Prescription>,
  prescriptionId?: string,
) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: async (p) => {
      qc.setQueryData(prescriptionKeys.detail(p.id), p);
      // Approving replaces the lineage's previous approved version: its detail changes too.
      await qc.invalidateQueries({ queryKey: prescriptionKeys.all, refetchType: 'active' });
    },
    onError: async (error) => {
      if (prescriptionId && isStaleVersion(error))
        await qc.invalidateQueries({ queryKey: prescriptionKeys.detail(prescriptionId) });
    },
  });
}
