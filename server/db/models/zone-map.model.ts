import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import { CropSeason } from './crop-season.model';
import { Field } from './field.model';
import { Grower } from './grower.model';
import { Zone } from './zone.model';

export const ZONE_MAP_SOURCES = ['drawn', 'imported', 'from-data'] as const;
export type ZoneMapSource = (typeof ZONE_MAP_SOURCES)[number];

/** A set of management zones for one field in one crop season; `versionNo` counts them per (field, season). */
export class ZoneMap extends Model<InferAttributes<ZoneMap>, InferCreationAttributes<ZoneMap>> {
  declare id: CreationOptional<string>;
  declare workspaceId: string;
  declare growerId: string;
  declare fieldId: string;
  declare cropSeasonId: string;
  declare name: string;
  declare versionNo: number;
  declare source: ZoneMapSource;
  declare sourceNote: string | null;
  declare archivedAt: CreationOptional<Date | null>;
  declare createdBy: string | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare field?: NonAttribute<Field>;
  declare season?: NonAttribute<CropSeason>;
  declare grower?: NonAttribute<Grower>;

  static initModel(sequelize: Sequelize) {
    ZoneMap.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workspaceId: { type: DataTypes.UUID, allowNull: false },
        growerId: { type: DataTypes.UUID, allowNull: false },
        fieldId: { type: DataTypes.UUID, allowNull: false },
        cropSeasonId: { type: DataTypes.UUID, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        versionNo: { type: DataTypes.INTEGER, allowNull: false },
        source: { type: DataTypes.TEXT, allowNull: false },
        sourceNote: { type: DataTypes.TEXT, allowNull: true },
        archivedAt: DataTypes.DATE,
        createdBy: { type: DataTypes.UUID, allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'zone_maps', version: true },
    );
  }
}

/** Initialises ZoneMap and Zone and wires their associations (called once from db/associations.ts). */
export function initZoneMapModels(sequelize: Sequelize) {
  ZoneMap.initModel(sequelize);
  Zone.initModel(sequelize);
  ZoneMap.belongsTo(Field, { as: 'field', foreignKey: 'fieldId' });
  ZoneMap.belongsTo(CropSeason, { as: 'season', foreignKey: 'cropSeasonId' });
  ZoneMap.belongsTo(Grower, { as: 'grower', foreignKey: 'growerId' });
  ZoneMap.hasMany(Zone, { as: 'zones', foreignKey: 'zoneMapId' });
}
