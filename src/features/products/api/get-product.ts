import { queryOptions } from '@tanstack/react-query';
import { productSchema } from '@shared/schemas/product.schema';
import { api } from '@/lib/api-client';
import { productKeys } from './keys';

/** GET /api/products/:id: one product, archived or not; 404 when it is another workspace's. */
export const getProduct = async (id: string) =>
  productSchema.parse(await api.get(`/api/products/${encodeURIComponent(id)}`));

export const productQueryOptions = (id: string) =>
  queryOptions({ queryKey: productKeys.detail(id), queryFn: () => getProduct(id) });
