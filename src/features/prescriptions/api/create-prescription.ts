import type { z } from 'zod';
import { prescriptionSchema, type createPrescriptionSchema } from '@shared/schemas/prescription.schema';
import { api } from '@/lib/api-client';
import { usePrescriptionMutation } from './keys';

export type CreatePrescriptionInput = z.input<typeof createPrescriptionSchema>;

/** POST /api/prescriptions: a draft with the zone map's zones, every zone at the default rate. */
export const createPrescription = async (input: CreatePrescriptionInput) =>
  prescriptionSchema.parse(await api.post('/api/prescriptions', input));

export const useCreatePrescription = () => usePrescriptionMutation(createPrescription);
