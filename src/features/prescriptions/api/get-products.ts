import { queryOptions, useQuery } from '@tanstack/react-query';
import { productListSchema, type Product } from '@shared/schemas/product.schema';
import type { Crop } from '@shared/schemas/crops';
import { api } from '@/lib/api-client';
import { productKeys } from './keys';

export type ProductFilter = { kind?: Product['kind']; crop?: Crop };

/** GET /api/products: the workspace's products that are not archived. */
export const getProducts = async (filter: ProductFilter = {}) =>
  productListSchema.parse(await api.get('/api/products', filter)).items;

export const productsQueryOptions = (filter: ProductFilter = {}) =>
  queryOptions({ queryKey: productKeys.list(filter), queryFn: () => getProducts(filter) });

export const useProducts = (filter: ProductFilter = {}) => useQuery(productsQueryOptions(filter));
