import type { Sequelize } from 'sequelize';
import { Workspace } from './models/workspace.model';
import { User } from './models/user.model';
import { UserToken } from './models/user-token.model';
import { ConsultantGrower } from './models/consultant-grower.model';
import { Grower } from './models/grower.model';
import { Farm } from './models/farm.model';
import { Field } from './models/field.model';
import { CropSeason } from './models/crop-season.model';
import { Planter } from './models/planter.model';
import { initZoneMapModels } from './models/zone-map.model';
import { initImportModels } from './models/upload.model';
import { initPrescriptionModels } from './models/prescription.model';
import { Product } from './models/product.model';
import { Prescription } from './models/prescription.model';

let initialised: Sequelize | null = null;

/** Initialises every model on one Sequelize instance and wires their associations (once per process). */
export function initModels(sequelize: Sequelize) {
  if (initialised === sequelize) return;
  initialised = sequelize;
  for (const m of [Workspace, User, UserToken, ConsultantGrower, Grower, Farm, Field, CropSeason, Planter]) {
    m.initModel(sequelize);
  }
  User.belongsTo(Workspace, { as: 'workspace', foreignKey: 'workspaceId' });
  Farm.belongsTo(Grower, { as: 'grower', foreignKey: 'growerId' });
  Field.belongsTo(Farm, { as: 'farm', foreignKey: 'farmId' });
  Field.belongsTo(Grower, { as: 'grower', foreignKey: 'growerId' });
  CropSeason.belongsTo(Field, { as: 'field', foreignKey: 'fieldId' });
  CropSeason.belongsTo(Grower, { as: 'grower', foreignKey: 'growerId' });
  Planter.belongsTo(Grower, { as: 'grower', foreignKey: 'growerId' });
  initZoneMapModels(sequelize);
  initImportModels(sequelize);
  initPrescriptionModels(sequelize);
}

export {
  Workspace,
  User,
  UserToken,
  ConsultantGrower,
  Grower,
  Farm,
  Field,
  CropSeason,
  Planter,
  Product,
  Prescription,
};
