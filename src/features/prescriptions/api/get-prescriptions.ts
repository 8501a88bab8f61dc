import { queryOptions, useQuery } from '@tanstack/react-query';
import { prescriptionListSchema, type PrescriptionStatus } from '@shared/schemas/prescription.schema';
import { api } from '@/lib/api-client';
import { prescriptionKeys } from './keys';

export type PrescriptionFilter = {
  growerId?: string;
  fieldId?: string;
  seasonId?: string;
  status?: PrescriptionStatus;
};

/** GET /api/prescriptions: the prescriptions the user may see, newest first. */
export const getPrescriptions = async (filter: PrescriptionFilter = {}) =>
  prescriptionListSchema.parse(await api.get('/api/prescriptions', filter)).items;

export const prescriptionsQueryOptions = (filter: PrescriptionFilter = {}) =>
  queryOptions({ queryKey: prescriptionKeys.list(filter), queryFn: () => getPrescriptions(filter) });

export const usePrescriptions = (filter: PrescriptionFilter = {}, enabled = true) =>
  useQuery({ ...prescriptionsQueryOptions(filter), enabled });
