import {
  fieldInputSchema,
  fieldListQuerySchema,
  fieldUpdateSchema,
} from '../../../shared/schemas/field.schema';
import { registerRouter } from '../register-router';
import * as fields from './field.service';

export const fieldRouter = () =>
  registerRouter({
    listQuery: fieldListQuerySchema,
    createSchema: fieldInputSchema,
    updateSchema: fieldUpdateSchema,
    writeRoles: ['admin', 'agronomist'],
    list: fields.listFields,
    get: fields.getField,
    create: fields.createField,
    update: fields.updateField,
    setArchived: fields.setFieldArchived,
  });
