import type { z } from 'zod';
import { productSchema, type productInputSchema } from '@shared/schemas/product.schema';
import { api } from '@/lib/api-client';
import { useProductMutation } from './keys';

export type ProductBody = z.output<typeof productInputSchema>;

/** POST /api/products (admin, agronomist): answers 201 and the new product. */
export const createProduct = async (input: ProductBody) =>
  productSchema.parse(await api.post('/api/products', input));

/** PUT /api/products/:id with the `version` it was read at; a stale one answers 409 `stale`. */
export const updateProduct = async ({
  id,
  input,
}: {
  id: string;
  input: ProductBody & { version: number };
}) => productSchema.parse(await api.put(`/api/products/${encodeURIComponent(id)}`, input));

export type ProductArchiveAction = 'archive' | 'restore';

/** POST /api/products/:id/archive or /restore: answers the product. */
export const setProductArchived = async ({ id, action }: { id: string; action: ProductArchiveAction }) =>
  productSchema.parse(await api.post(`/api/products/${encodeURIComponent(id)}/${action}`));

export const useCreateProduct = () => useProductMutation(createProduct);
export const useUpdateProduct = () => useProductMutation(updateProduct);
export const useSetProductArchived = () => useProductMutation(setProductArchived);
