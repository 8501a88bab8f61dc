import {
  planterInputSchema,
  planterListQuerySchema,
  planterUpdateSchema,
} from '../../../shared/schemas/planter.schema';
import { registerRouter } from '../register-router';
import * as planters from './planter.service';

/** A farmer edits their own grower's machine profiles (scope keeps them to it); a consultant only reads. */
export const planterRouter = () =>
  registerRouter({
    listQuery: planterListQuerySchema,
    createSchema: planterInputSchema,
    updateSchema: planterUpdateSchema,
    writeRoles: ['admin', 'agronomist', 'farmer'],
    list: planters.listPlanters,
    get: planters.getPlanter,
    create: planters.createPlanter,
    update: planters.updatePlanter,
    setArchived: planters.setPlanterArchived,
  });
