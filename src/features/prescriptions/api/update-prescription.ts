import { prescriptionSchema, type UpdatePrescriptionBody } from '@shared/schemas/prescription.schema';
import { api } from '@/lib/api-client';
import { usePrescriptionMutation } from './keys';

/** PUT /api/prescriptions/:id: the whole editable state of a draft, with the version it was read at. */
export const updatePrescription = async ({ id, input }: { id: string; input: UpdatePrescriptionBody }) =>
  prescriptionSchema.parse(await api.put(`/api/prescriptions/${encodeURIComponent(id)}`, input));

export const useUpdatePrescription = (id: string) => usePrescriptionMutation(updatePrescription, id);
