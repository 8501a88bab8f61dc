import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Crop } from '@shared/schemas/crops';
import { productListSchema, type PRODUCT_KINDS } from '@shared/schemas/product.schema';
import { api } from '@/lib/api-client';
import { productKeys, type ArchivedFilter } from './keys';

export type ProductListParams = {
  archived?: ArchivedFilter;
  kind?: (typeof PRODUCT_KINDS)[number];
  crop?: Crop;
};

/** GET /api/products: the workspace's products. Filters: `?kind=`, `?crop=`, `?archived=`. */
export const getProducts = async (params: ProductListParams = {}) =>
  productListSchema.parse(await api.get('/api/products', params)).items;

export const productsQueryOptions = (params: ProductListParams = {}) =>
  queryOptions({ queryKey: productKeys.list(params), queryFn: () => getProducts(params) });

export const useProducts = (params: ProductListParams = {}) => useQuery(productsQueryOptions(params));
