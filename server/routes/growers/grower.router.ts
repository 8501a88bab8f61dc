import { growerInputSchema, growerUpdateSchema } from '../../../shared/schemas/grower.schema';
import { listQuerySchema } from '../../../shared/schemas/common.schema';
import { registerRouter } from '../register-router';
import * as growers from './grower.service';

export const growerRouter = () =>
  registerRouter({
    listQuery: listQuerySchema,
    createSchema: growerInputSchema,
    updateSchema: growerUpdateSchema,
    writeRoles: ['admin', 'agronomist'],
    list: (actor, q) => growers.listGrowers(actor, q.archived),
    get: growers.getGrower,
    create: growers.createGrower,
    update: growers.updateGrower,
    setArchived: growers.setGrowerArchived,
  });
