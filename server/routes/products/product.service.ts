import type { z } from 'zod';
import type { WhereOptions } from 'sequelize';
import { Product } from '../../db/associations';
import { archivedWhere, assertFound, assertVersion, iso } from '../../lib/scope';
import type { Actor } from '../../types';
import type {
  Product as ProductDto,
  productInputSchema,
  productListQuerySchema,
  productUpdateSchema,
} from '../../../shared/schemas/product.schema';

/** numeric comes back from pg as text. */
const money = (v: string | number | null) => (v == null ? null : Number(v));

export function productToDto(p: Product): ProductDto {
  return {
    id: p.id,
    kind: p.kind,
    name: p.name,
    crop: p.crop,
    rateKind: p.rateKind,
    unitName: p.unitName,
    unitSize: p.unitSize,
    pricePerUnit: money(p.pricePerUnit),
    currency: p.currency,
    notes: p.notes,
    archivedAt: iso(p.archivedAt),
    version: p.version,
    updatedAt: p.updatedAt.toISOString(),
  };
}

/** Products belong to the workspace, not to a grower: every role of the workspace reads them all. */
const inWorkspace = (actor: Actor, where: WhereOptions = {}): WhereOptions => ({
  ...where,
  workspaceId: actor.workspaceId,
});

export async function listProducts(actor: Actor, q: z.output<typeof productListQuerySchema>) {
  const rows = await Product.findAll({
    where: inWorkspace(actor, {
      ...archivedWhere(q.archived),
      ...(q.kind ? { kind: q.kind } : {}),
      ...(q.crop ? { crop: q.crop } : {}),
    }),
    order: [
      ['kind', 'DESC'],
      ['name', 'ASC'],
    ],
  });
  return { items: rows.map(productToDto) };
}

export async function findProduct(actor: Actor, id: string) {
  return assertFound(await Product.findOne({ where: inWorkspace(actor, { id }) }), 'Product');
}

export const getProduct = async (actor: Actor, id: string) => productToDto(await findProduct(actor, id));

/** What a create or an edit may set: an allowlist. */
function valuesOf(input: z.output<typeof productInputSchema> | z.output<typeof productUpdateSchema>) {
  return {
    kind: input.kind,
    name: input.name,
    crop: input.kind === 'seed' ? input.crop : null,
    rateKind: input.rateKind,
    unitName: input.unitName,
    unitSize: input.unitSize,
    pricePerUnit: input.pricePerUnit,
    currency: input.currency,
    notes: input.notes,
  };
}

export async function createProduct(actor: Actor, input: z.output<typeof productInputSchema>) {
  const p = await Product.create({ workspaceId: actor.workspaceId, ...valuesOf(input) });
  return getProduct(actor, p.id);
}

export async function updateProduct(actor: Actor, id: string, input: z.output<typeof productUpdateSchema>) {
  const p = await findProduct(actor, id);
  assertVersion(p.version, input.version);
  p.set(valuesOf(input));
  await p.save();
  return getProduct(actor, id);
}

export async function setProductArchived(actor: Actor, id: string, archived: boolean) {
  const p = await findProduct(actor, id);
  p.archivedAt = archived ? new Date() : null;
  await p.save();
  return getProduct(actor, id);
}
