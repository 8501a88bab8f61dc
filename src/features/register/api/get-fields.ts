import { queryOptions, useQuery } from '@tanstack/react-query';
import { fieldListSchema } from '@shared/schemas/field.schema';
import { api } from '@/lib/api-client';
import { fieldKeys, type ArchivedFilter } from './keys';

export type FieldListParams = { archived?: ArchivedFilter; growerId?: string; farmId?: string };

/** GET /api/fields: the fields the user may see. Filters: `?archived=`, `?growerId=`, `?farmId=`. */
export const getFields = async (params: FieldListParams = {}) =>
  fieldListSchema.parse(await api.get('/api/fields', params)).items;

export const fieldsQueryOptions = (params: FieldListParams = {}) =>
  queryOptions({ queryKey: fieldKeys.list(params), queryFn: () => getFields(params) });

export const useFields = (params: FieldListParams = {}, enabled = true) =>
  useQuery({ ...fieldsQueryOptions(params), enabled });
