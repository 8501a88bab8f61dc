import {
  seasonInputSchema,
  seasonListQuerySchema,
  seasonUpdateSchema,
} from '../../../shared/schemas/season.schema';
import { registerRouter } from '../register-router';
import * as seasons from './season.service';

export const seasonRouter = () =>
  registerRouter({
    listQuery: seasonListQuerySchema,
    createSchema: seasonInputSchema,
    updateSchema: seasonUpdateSchema,
    writeRoles: ['admin', 'agronomist'],
    list: seasons.listSeasons,
    get: seasons.getSeason,
    create: seasons.createSeason,
    update: seasons.updateSeason,
    setArchived: seasons.setSeasonArchived,
  });
