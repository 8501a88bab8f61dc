import { queryOptions, useQuery } from '@tanstack/react-query';
import { prescriptionListSchema, type PrescriptionStatus } from '@shared/schemas/prescription.schema';
import { api } from '@/lib/api-client';

export type PrescriptionListParams = {
  growerId?: string;
  fieldId?: string;
  seasonId?: string;
  status?: PrescriptionStatus;
};

/**
 * Under the prescriptions list prefix, so whatever invalidates prescription lists (an approval) refreshes
 * these too; the extra 'summaries' word keeps them apart from the prescriptions pages' own entries.
 */
export const prescriptionSummaryKey = (p: PrescriptionListParams) =>
  ['prescriptions', 'list', 'summaries', p] as const;

/** GET /api/prescriptions: summaries in the user's scope, newest first. */
export const getPrescriptionSummaries = async (p: PrescriptionListParams = {}) =>
  prescriptionListSchema.parse(await api.get('/api/prescriptions', p)).items;

export const prescriptionSummariesQueryOptions = (p: PrescriptionListParams = {}) =>
  queryOptions({ queryKey: prescriptionSummaryKey(p), queryFn: () => getPrescriptionSummaries(p) });

export const usePrescriptionSummaries = (p: PrescriptionListParams = {}) =>
  useQuery(prescriptionSummariesQueryOptions(p));

/** Approved prescriptions: what is ready to export to a planter's display. */
export const readyToExportQueryOptions = () => prescriptionSummariesQueryOptions({ status: 'approved' });
export const useReadyToExport = () => useQuery(readyToExportQueryOptions());
