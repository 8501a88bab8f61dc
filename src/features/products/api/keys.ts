import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Product } from '@shared/schemas/product.schema';
import { resourceKeys } from '@/lib/query-keys';

export const productKeys = resourceKeys('products');

/** Which archived products a list shows: none (default), all, or only the archived ones. */
export type ArchivedFilter = 'false' | 'true' | 'only';

/**
 * A product mutation: the answer replaces the cached product, and every product list reloads (a
 * prescription's totals read the product's unit size and price, so their pages refetch on their own).
 */
export function useProductMutation<V>(mutationFn: (variables: V) => Promise<Product>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: async (saved) => {
      qc.setQueryData(productKeys.detail(saved.id), saved);
      await qc.invalidateQueries({ queryKey: productKeys.lists() });
    },
  });
}
