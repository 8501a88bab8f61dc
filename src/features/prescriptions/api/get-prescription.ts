import { queryOptions, useQuery } from '@tanstack/react-query';
import { prescriptionSchema } from '@shared/schemas/prescription.schema';
import { api } from '@/lib/api-client';
import { prescriptionKeys } from './keys';

/** GET /api/prescriptions/:id: zones with their rates, the planter check and the totals. */
export const getPrescription = async (id: string) =>
  prescriptionSchema.parse(await api.get(`/api/prescriptions/${encodeURIComponent(id)}`));

export const prescriptionQueryOptions = (id: string) =>
  queryOptions({ queryKey: prescriptionKeys.detail(id), queryFn: () => getPrescription(id) });

export const usePrescription = (id: string) => useQuery(prescriptionQueryOptions(id));
