import {
  productInputSchema,
  productListQuerySchema,
  productUpdateSchema,
} from '../../../shared/schemas/product.schema';
import { registerRouter } from '../register-router';
import * as products from './product.service';

/** Products of the workspace: everyone reads them; the agronomist (and admin) keeps the list. */
export const productRouter = () =>
  registerRouter({
    listQuery: productListQuerySchema,
    createSchema: productInputSchema,
    updateSchema: productUpdateSchema,
    writeRoles: ['admin', 'agronomist'],
    list: products.listProducts,
    get: products.getProduct,
    create: products.createProduct,
    update: products.updateProduct,
    setArchived: products.setProductArchived,
  });
