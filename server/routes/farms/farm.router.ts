import { farmInputSchema, farmListQuerySchema, farmUpdateSchema } from '../../../shared/schemas/farm.schema';
import { registerRouter } from '../register-router';
import * as farms from './farm.service';

export const farmRouter = () =>
  registerRouter({
    listQuery: farmListQuerySchema,
    createSchema: farmInputSchema,
    updateSchema: farmUpdateSchema,
    writeRoles: ['admin', 'agronomist'],
    list: farms.listFarms,
    get: farms.getFarm,
    create: farms.createFarm,
    update: farms.updateFarm,
    setArchived: farms.setFarmArchived,
  });
