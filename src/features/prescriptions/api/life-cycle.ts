import { useMutation, useQueryClient } from '@tanstack/react-query';
import { prescriptionSchema } from '@shared/schemas/prescription.schema';
import { api } from '@/lib/api-client';
import { prescriptionKeys, usePrescriptionMutation } from './keys';

const path = (id: string, action = '') => `/api/prescriptions/${encodeURIComponent(id)}${action}`;

/** POST /api/prescriptions/:id/accept-check: who accepts the flagged zones, and why. */
export const acceptCheck = async ({ id, version, reason }: { id: string; version: number; reason: string }) =>
  prescriptionSchema.parse(await api.post(path(id, '/accept-check'), { version, reason }));
export const useAcceptCheck = (id: string) => usePrescriptionMutation(acceptCheck, id);

/** POST /api/prescriptions/:id/approve: frozen from now on; the lineage's previous approved one is replaced. */
export const approvePrescription = async ({ id, version }: { id: string; version: number }) =>
  prescriptionSchema.parse(await api.post(path(id, '/approve'), { version }));
export const useApprovePrescription = (id: string) => usePrescriptionMutation(approvePrescription, id);

/** POST /api/prescriptions/:id/new-version: a draft copy of an approved version (409 draft_exists if one is open). */
export const newPrescriptionVersion = async ({ id }: { id: string }) =>
  prescriptionSchema.parse(await api.post(path(id, '/new-version')));
export const useNewPrescriptionVersion = () => usePrescriptionMutation(newPrescriptionVersion);

/** DELETE /api/prescriptions/:id?version=: drafts only. */
export const deletePrescription = async ({ id, version }: { id: string; version: number }) => {
  await api.delete(path(id), { version });
};
export function useDeletePrescription() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: deletePrescription,
    // The open page leaves for the list; the deleted one's detail stays cached only until then.
    onSuccess: () => qc.invalidateQueries({ queryKey: prescriptionKeys.lists() }),
  });
}
